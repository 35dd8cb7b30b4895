// Kept analytics by hand:
//   npx tsx .dev/analytics-cli.ts rebuild [--company N]   build every company's kept results again, timed
//   npx tsx .dev/analytics-cli.ts verify [--company N]    compare them with a full recomputation from the tests
// DATABASE_URL picks the database (default: the local development database).
import { parseArgs } from "node:util";
import { keepCompanyCurrent } from "../app/.server/analytics/kept/versions";
import { verifyKeptResults } from "../app/.server/analytics/kept/verify";
import { closeDatabase, pool } from "../app/.server/db/client";

const { values, positionals } = parseArgs({ allowPositionals: true, options: { company: { type: "string" } } });
const command = positionals[0];
if (command !== "rebuild" && command !== "verify") {
  console.error("Say what to do: rebuild or verify (with --company N for one company).");
  process.exit(2);
}
if (values.company !== undefined && !/^[1-9]\d*$/.test(values.company)) {
  console.error(`--company: "${values.company}" is not a company number (a positive whole number).`);
  process.exit(2);
}

async function companyIds(): Promise<number[]> {
  if (values.company) return [Number(values.company)];
  const [rows] = (await pool().query("SELECT id FROM companies ORDER BY id")) as unknown as [Array<{ id: number }>];
  return rows.map((r) => r.id);
}

const megabytes = (bytes: number) => `${Math.round(bytes / 1_048_576)} MB`;

try {
  let failed = false;
  for (const companyId of await companyIds()) {
    if (command === "rebuild") {
      const started = performance.now();
      let peak = process.memoryUsage().rss;
      const versionId = await keepCompanyCurrent(companyId, {
        rebuild: true,
        onProgress: () => (peak = Math.max(peak, process.memoryUsage().rss)),
      });
      const seconds = ((performance.now() - started) / 1000).toFixed(1);
      if (versionId === null) {
        console.log(`[kept] company ${companyId}: another instance is building it; nothing done`);
        failed = true;
      } else console.log(`[kept] company ${companyId}: version ${versionId} built in ${seconds} s (peak memory ${megabytes(peak)})`);
    } else {
      const check = await verifyKeptResults(companyId);
      if (check.versionId === null) {
        console.log(`[kept] company ${companyId}: no kept results yet (they are built on the first analytics request, or by "rebuild")`);
        continue;
      }
      console.log(
        `[kept] company ${companyId}, version ${check.versionId}: ${check.pools} pools, ${check.tests} tests, ${check.episodes} kept episodes, ${check.spans} kept spans, ${check.months} kept pool-months, ${check.courses} kept courses: ${check.differences.length} differences`,
      );
      for (const d of check.differences.slice(0, 20)) console.log(`  ${d.table} ${d.key}: kept ${d.kept ?? "(none)"}; recomputed ${d.recomputed ?? "(none)"}`);
      if (check.differences.length > 0) failed = true;
    }
  }
  process.exitCode = failed ? 1 : 0;
} finally {
  await closeDatabase();
}
