import { defineConfig } from "drizzle-kit";
import { localDatabaseUrl } from "./app/.server/db/local-url";

export default defineConfig({
  dialect: "mysql",
  schema: "./app/.server/db/schema/index.ts",
  out: "./drizzle/migrations",
  dbCredentials: {
    url: process.env.DATABASE_URL ?? localDatabaseUrl("patina"),
  },
});
