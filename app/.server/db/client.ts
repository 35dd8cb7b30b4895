import { drizzle, type MySql2Database } from "drizzle-orm/mysql2";
import mysql from "mysql2/promise";
import { serverEnv } from "../env";
import { processSingleton, releaseProcessSingleton } from "../process-singleton";
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

const POOL = "database pool";
const DATABASE = "database";

export function pool(): mysql.Pool {
  return processSingleton(POOL, () => {
    // An open pool keeps the server process alive after SIGTERM.
    for (const signal of ["SIGTERM", "SIGINT"] as const) {
      process.once(signal, () => void closeDatabase().finally(() => process.exit(0)));
    }
    return createPool(serverEnv().DATABASE_URL);
  });
}

export function db(): Database {
  return processSingleton(DATABASE, () => createDatabase(pool()));
}

export async function closeDatabase() {
  releaseProcessSingleton(DATABASE);
  await releaseProcessSingleton<mysql.Pool>(POOL)?.end();
}
