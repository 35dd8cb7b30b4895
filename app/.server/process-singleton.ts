/**
 * One value per server process (the database pool, the auth instance, the
 * mail sender, the SMTP transport), kept on globalThis so that the dev
 * server's module reloads reuse it instead of opening another.
 */
const STORE = Symbol.for("patina.process-singletons");

function store(): Map<string, unknown> {
  const holder = globalThis as typeof globalThis & { [STORE]?: Map<string, unknown> };
  holder[STORE] ??= new Map();
  return holder[STORE];
}

/** The process's value under `key`, made by `create` the first time it is asked for. */
export function processSingleton<T>(key: string, create: () => T): T {
  const values = store();
  if (!values.has(key)) values.set(key, create());
  return values.get(key) as T;
}

/** The value under `key` if it has been made, without making it. */
export function existingProcessSingleton<T>(key: string): T | undefined {
  return store().get(key) as T | undefined;
}

/** Forgets the value under `key` (the next ask makes a new one) and hands it back to be closed. */
export function releaseProcessSingleton<T>(key: string): T | undefined {
  const values = store();
  const value = values.get(key) as T | undefined;
  values.delete(key);
  return value;
}
