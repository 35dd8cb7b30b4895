import { execFileSync } from "node:child_process";
import { resetTestDatabase } from "../fixtures/database";
import { testObjectStore } from "../fixtures/object-store";
import { FAULT_DATABASE_URL, faultDatabase } from "../fixtures/scratch-mariadb";

export default async function setup() {
  await faultDatabase("start");
  await resetTestDatabase(FAULT_DATABASE_URL);
  execFileSync("npx", ["tsx", "drizzle/seed/run.ts"], {
    env: { ...process.env, DATABASE_URL: FAULT_DATABASE_URL },
    stdio: "inherit",
  });
  // The built servers of the fault tests keep uploads there (tests/fixtures/server.ts).
  const stopObjectStore = await testObjectStore();
  return async () => {
    await faultDatabase("stop");
    await stopObjectStore();
  };
}
