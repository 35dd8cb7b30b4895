import { drizzle, type MySql2Database } from "drizzle-orm/mysql2";
import mysql from "mysql2/promise";
import { serverEnv } from "../env";
import { processSingleton, releaseProcessSingleton } from "../process-singleton";
import { RequestAbandoned, requestContext, stopIfAbandoned, type RequestContext } from "../request-context";
import { isDatabaseUnavailable, isStatementTimeout } from "./faults";
import * as schema from "./schema";

export type Database = MySql2Database<typeof schema>;

export function createPool(url: string) {
  return mysql.createPool({
    uri: url,
    connectionLimit: 10,
    // Behind a load balancer a node can vanish: a connection that errors or ends
    // leaves the pool (mysql2 does that), idle ones are closed after a minute and
    // probed by TCP keep-alive, and a connect to a dead address gives up quickly.
    maxIdle: 10,
    idleTimeout: 60_000,
    enableKeepAlive: true,
    keepAliveInitialDelay: 10_000,
    connectTimeout: 5_000,
    timezone: "Z",
    dateStrings: false,
    supportBigNumbers: true,
    decimalNumbers: true,
  });
}

export function createDatabase(pool: mysql.Pool): Database {
  return drizzle(pool, { schema, mode: "default" });
}

type QueryMethod = "query" | "execute";
type QueryOptions = { sql: string; timeout?: number; [option: string]: unknown };

const READ_STATEMENT = /^\s*(\/\*.*?\*\/\s*)*(SELECT|WITH)\b/is;

/**
 * A read with MariaDB's statement limit in front (`SET STATEMENT
 * max_statement_time=N FOR SELECT …`), and the driver's own timeout a little
 * later as a backstop for a database that stopped answering altogether.
 */
export function withStatementLimit(statement: string | QueryOptions, statementMs: number): string | QueryOptions {
  const options: QueryOptions = typeof statement === "string" ? { sql: statement } : { ...statement };
  if (!READ_STATEMENT.test(options.sql)) return statement;
  options.sql = `SET STATEMENT max_statement_time=${(statementMs / 1000).toFixed(3)} FOR ${options.sql}`;
  options.timeout ??= statementMs + 5_000;
  return options;
}

function noteFailure(context: RequestContext | undefined, error: unknown) {
  if (!context) return;
  if (isDatabaseUnavailable(error)) context.databaseFailure ??= error;
  else if (isStatementTimeout(error)) context.statementTimeout ??= error;
}

/**
 * A statement of a heavy request: refused if its client has gone, run on a
 * connection of its own so that, when the client goes away mid-statement, the
 * statement is killed (`KILL QUERY`) and the connection is closed rather than
 * reused.
 */
async function runHeavy(raw: mysql.Pool, method: QueryMethod, args: unknown[], context: RequestContext, statementMs: number) {
  stopIfAbandoned(context.signal);
  const connection = await raw.getConnection();
  let killed = false;
  const kill = () => {
    killed = true;
    raw.query("KILL QUERY ?", [connection.threadId]).catch(() => undefined);
  };
  context.signal.addEventListener("abort", kill, { once: true });
  try {
    const [statement, ...rest] = args as [string | QueryOptions, ...unknown[]];
    const run = connection[method] as (...a: unknown[]) => Promise<unknown>;
    return await run.call(connection, withStatementLimit(statement, statementMs), ...rest);
  } catch (error) {
    if (context.signal.aborted) throw new RequestAbandoned();
    throw error;
  } finally {
    context.signal.removeEventListener("abort", kill);
    if (killed) connection.destroy();
    else connection.release();
  }
}

/**
 * The process's pool, wrapped so that every statement knows its request:
 * statements of a heavy request (one holding an analytics slot) get the
 * statement limit and stop with their client, and any statement that finds
 * the database gone marks its request, which is then answered 503.
 */
export function guardPool(raw: mysql.Pool, statementMs: () => number): mysql.Pool {
  const run = async (method: QueryMethod, args: unknown[]) => {
    const context = requestContext();
    try {
      if (context?.heavy) return await runHeavy(raw, method, args, context, statementMs());
      return await (raw[method] as (...a: unknown[]) => Promise<unknown>).apply(raw, args);
    } catch (error) {
      noteFailure(context, error);
      throw error;
    }
  };
  return new Proxy(raw, {
    get(target, property) {
      if (property === "query" || property === "execute") return (...args: unknown[]) => run(property, args);
      if (property === "getConnection") {
        return () =>
          target.getConnection().catch((error: unknown) => {
            noteFailure(requestContext(), error);
            throw error;
          });
      }
      const value = Reflect.get(target, property, target);
      return typeof value === "function" ? value.bind(target) : value;
    },
  });
}

const POOL = "database pool";
const DATABASE = "database";

export function pool(): mysql.Pool {
  return processSingleton(POOL, () => {
    // An open pool keeps the server process alive after SIGTERM.
    for (const signal of ["SIGTERM", "SIGINT"] as const) {
      process.once(signal, () => void closeDatabase().finally(() => process.exit(0)));
    }
    return guardPool(createPool(serverEnv().DATABASE_URL), () => serverEnv().PATINA_ANALYTICS_STATEMENT_MS);
  });
}

export function db(): Database {
  return processSingleton(DATABASE, () => createDatabase(pool()));
}

export async function closeDatabase() {
  releaseProcessSingleton(DATABASE);
  await releaseProcessSingleton<mysql.Pool>(POOL)?.end();
}

/**
 * Fresh table statistics after a large write (the seed, a big import), so
 * MariaDB's join order fits the new sizes at once.
 */
export async function analyzeTables(target: Pick<mysql.Pool, "query"> = pool()) {
  await target.query("ANALYZE TABLE pools, water_tests, treatments, equipment, fill_sources, source_tests");
}
