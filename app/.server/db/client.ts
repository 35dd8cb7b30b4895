import { drizzle, type MySql2Database } from "drizzle-orm/mysql2";
import mysql from "mysql2/promise";
import { serverEnv } from "../env";
import * as schema from "./schema";

export type Database = MySql2Database<typeof schema>;

export function createPool(url: string) {
  return mysql.createPool({
    uri: url,
    connectionLimit: 10,
    timezone: "Z",
    dateStrings: false,
    supportBigNumbers: true,
    decimalNumbers: true,
  });
}

export function createDatabase(pool: mysql.Pool): Database {
  return drizzle(pool, { schema, mode: "default" });
}

// One pool per process; kept on globalThis so the dev server's module reloads
// do not open a new pool on every edit.
const holder = globalThis as typeof globalThis & { __patinaPool?: mysql.Pool; __patinaDb?: Database };

export function pool(): mysql.Pool {
  if (!holder.__patinaPool) {
    holder.__patinaPool = createPool(serverEnv().DATABASE_URL);
    // An open pool keeps the server process alive after SIGTERM.
    for (const signal of ["SIGTERM", "SIGINT"] as const) {
      process.once(signal, () => void closeDatabase().finally(() => process.exit(0)));
    }
  }
  return holder.__patinaPool;
}

export function db(): Database {
  holder.__patinaDb ??= createDatabase(pool());
  return holder.__patinaDb;
}

export async function closeDatabase() {
  const open = holder.__patinaPool;
  holder.__patinaPool = undefined;
  holder.__patinaDb = undefined;
  await open?.end();
}
