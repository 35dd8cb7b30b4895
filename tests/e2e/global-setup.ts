import { execFileSync, type ChildProcess } from "node:child_process";
import { resetTestDatabase, TEST_DATABASE_URL } from "../fixtures/database";
import { startBuiltServer } from "../fixtures/server";

let server: ChildProcess | undefined;

export default async function setup() {
  await resetTestDatabase();
  execFileSync("npx", ["tsx", "drizzle/seed/run.ts"], {
    env: { ...process.env, DATABASE_URL: TEST_DATABASE_URL },
    stdio: "inherit",
  });
  server = await startBuiltServer(TEST_DATABASE_URL);
  return async () => {
    server?.kill("SIGTERM");
  };
}
