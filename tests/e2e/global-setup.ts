import { execFileSync, type ChildProcess } from "node:child_process";
import { resetTestDatabase, TEST_DATABASE_URL } from "../fixtures/database";
import { testObjectStore } from "../fixtures/object-store";
import { BROWSER_TEST_SMTP_URL, startBuiltServer, stopBuiltServer } from "../fixtures/server";

let server: ChildProcess | undefined;

export default async function setup() {
  await resetTestDatabase();
  execFileSync("npx", ["tsx", "drizzle/seed/run.ts"], {
    env: { ...process.env, DATABASE_URL: TEST_DATABASE_URL },
    stdio: "inherit",
  });
  // The global setup does not get the project's env, so the mail URL is passed on by hand.
  const stopObjectStore = await testObjectStore();
  try {
    server = await startBuiltServer(TEST_DATABASE_URL, { env: { PATINA_SMTP_URL: BROWSER_TEST_SMTP_URL } });
  } catch (error) {
    await stopObjectStore();
    throw error;
  }
  return async () => {
    await stopBuiltServer(server);
    await stopObjectStore();
  };
}
