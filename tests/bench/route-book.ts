/**
 * Whether DATABASE_URL already holds the seeded route book a benchmark asks
 * for (one company, that many pools, tests over that many years), so a second
 * run reuses it instead of seeding again for minutes. When it does, its kept
 * results are made current (built if missing). Exit 0: ready; 3: seed it.
 *
 *   DATABASE_URL=mysql://…/patina_scratch_bench_2000p_5y npx tsx tests/bench/route-book.ts 2000 5
 */
import { keepCompanyCurrent } from "../../app/.server/analytics/kept/versions";
import { closeDatabase, pool } from "../../app/.server/db/client";

const pools = Number(process.argv[2]);
const years = Number(process.argv[3]);

async function seededCompany(): Promise<number | null> {
  try {
    const [rows] = (await pool().query(
      `SELECT c.id, (SELECT COUNT(*) FROM pools p WHERE p.company_id = c.id) AS pools,
        (SELECT TIMESTAMPDIFF(DAY, MIN(t.sampled_at), MAX(t.sampled_at)) FROM water_tests t WHERE t.company_id = c.id) AS days
       FROM companies c`,
    )) as unknown as [Array<{ id: number; pools: number; days: number | null }>];
    // The seed writes every pool's years of tests; a book cut short by an interrupted seed has fewer days.
    if (rows.length !== 1 || Number(rows[0]!.pools) !== pools || Number(rows[0]!.days ?? 0) < (years - 1) * 365) return null;
    return rows[0]!.id;
  } catch {
    return null; // no such database, or not migrated
  }
}

try {
  const companyId = await seededCompany();
  if (companyId === null) process.exitCode = 3;
  else {
    const started = performance.now();
    const versionId = await keepCompanyCurrent(companyId);
    console.log(`[bench] reusing the seeded route book: ${pools} pools; kept version ${versionId} current in ${((performance.now() - started) / 1000).toFixed(1)} s`);
  }
} finally {
  await closeDatabase();
}
