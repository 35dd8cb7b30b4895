// Applies the committed migrations to DATABASE_URL (or the local database).
import { migrate } from "drizzle-orm/mysql2/migrator";
import { fileURLToPath } from "node:url";
import { createDatabase, createPool } from "../app/.server/db/client";
import { serverEnv } from "../app/.server/env";

export const migrationsFolder = fileURLToPath(new URL("./migrations", import.meta.url));

export async function migrateDatabase(url: string) {
  const pool = createPool(url);
  try {
    await migrate(createDatabase(pool), { migrationsFolder });
  } finally {
    await pool.end();
  }
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  const url = serverEnv().DATABASE_URL;
  const started = Date.now();
  await migrateDatabase(url);
  console.log(`[migrate] ${new URL(url).pathname.slice(1)} is up to date (${Date.now() - started} ms)`);
}
