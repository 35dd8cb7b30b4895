/**
 * Time of each analytics endpoint against the bare SQL that reads the same
 * rows, on a seeded route book (median of several runs).
 *
 *   DATABASE_URL=mysql://…/patina_scratch_x npx tsx drizzle/seed/run.ts --pools 2000 --years 5
 *   DATABASE_URL=mysql://…/patina_scratch_x npx tsx tests/bench/analytics-endpoints.ts [runs] [figures.json]
 *
 * The endpoint is called through its loader with a real session (guard, zod,
 * queries, analysis and JSON included); the bare SQL is the main row set the
 * endpoint reads, run through the same connection pool and fully fetched.
 * With a file name, the figures are also written there as JSON, for
 * side-by-side.ts to print several route books next to each other.
 */
import { writeFileSync } from "node:fs";
import { performance } from "node:perf_hooks";
import { RouterContextProvider } from "react-router";
import { keepPoolsInStep, lockPoolsForKeeping } from "../../app/.server/analytics/kept/keep-pools";
import { closeDatabase, db, pool } from "../../app/.server/db/client";
import { serverEnv } from "../../app/.server/env";
import { apiMemberMiddleware } from "../../app/.server/guard";
import * as alerts from "~/routes/api.analytics.alerts";
import * as evidence from "~/routes/api.analytics.pools.$poolId.evidence";
import * as groups from "~/routes/api.analytics.groups";
import * as outcomes from "~/routes/api.analytics.outcomes";
import * as recurring from "~/routes/api.analytics.recurring";
import * as series from "~/routes/api.analytics.pools.$poolId.series";
import * as sources from "~/routes/api.analytics.sources";
import * as summary from "~/routes/api.analytics.summary";
import * as trend from "~/routes/api.analytics.trend";
import { DEMO_EMAIL_DOMAIN, DEMO_USERS } from "../../drizzle/seed/names";
import { signIn } from "../fixtures/company";

const runs = Number(process.argv[2] ?? 5);
const figuresFile = process.argv[3];
const owner = DEMO_USERS.find((u) => u.role === "owner")!;
const cookie = await signIn(`${owner.email}@${DEMO_EMAIL_DOMAIN}`, owner.password);
const [[company]] = (await pool().query("SELECT id FROM companies ORDER BY id LIMIT 1")) as unknown as [[{ id: number }]];
const [[busiest]] = (await pool().query(
  "SELECT pool_id AS id FROM water_tests WHERE company_id = ? AND iron IS NOT NULL GROUP BY pool_id ORDER BY COUNT(*) DESC LIMIT 1",
  [company.id],
)) as unknown as [[{ id: number }]];
const [[size]] = (await pool().query(
  "SELECT (SELECT COUNT(*) FROM pools WHERE company_id = ?) AS pools, (SELECT COUNT(*) FROM water_tests WHERE company_id = ?) AS tests",
  [company.id, company.id],
)) as unknown as [[{ pools: number; tests: number }]];

const METAL_ROWS = `SELECT t.id, t.pool_id, t.sampled_at, t.copper, t.copper_below_detection, t.iron, t.iron_below_detection,
  t.manganese, t.manganese_below_detection FROM water_tests t JOIN pools p ON p.id = t.pool_id
  WHERE p.company_id = ? AND t.company_id = ? AND (t.copper IS NOT NULL OR t.iron IS NOT NULL OR t.manganese IS NOT NULL)
  ORDER BY t.pool_id, t.sampled_at`;
const SPANS = `SELECT t.pool_id, MIN(t.sampled_at), MAX(t.sampled_at), COUNT(*) FROM water_tests t JOIN pools p ON p.id = t.pool_id
  WHERE p.company_id = ? AND t.company_id = ? GROUP BY t.pool_id`;

/** The kept rows an answer from the kept results reads (a metal read alone: its own rows and the all-metals rows that stand for them). */
const KEPT_ROWS = (readAs: string): Array<[string, unknown[]]> => [
  [`SELECT e.* FROM kept_episodes e JOIN kept_versions v ON v.id = e.version_id
    WHERE v.company_id = ? AND v.state = 'ready' AND e.company_id = ?
      AND ${readAs === "all" ? "e.read_as = 'all'" : `(e.read_as = '${readAs}' OR (e.read_as = 'all' AND e.alone AND e.metal = '${readAs}'))`}
    ORDER BY e.pool_id, e.seq`, [c, c]],
  [`SELECT s.* FROM kept_pool_spans s JOIN kept_versions v ON v.id = s.version_id
    WHERE v.company_id = ? AND v.state = 'ready' AND s.read_as IN ('${readAs}', 'any') AND s.company_id = ? ORDER BY s.pool_id`, [c, c]],
];

/** The kept rows the monthly trend reads: the company's month histogram and its pool-months above the level. */
const MONTH_ROWS: Array<[string, unknown[]]> = [
  [`SELECT m.metal, m.month, m.value, m.below_detection, m.n FROM kept_month_values m JOIN kept_versions v ON v.id = m.version_id
    WHERE v.company_id = ? AND v.state = 'ready' AND m.n > 0`, [company.id]],
  [`SELECT m.elevated_metals, m.month, COUNT(*) FROM kept_pool_months m JOIN kept_versions v ON v.id = m.version_id
    WHERE v.company_id = ? AND v.state = 'ready' AND m.elevated_metals > 0 GROUP BY m.elevated_metals, m.month`, [company.id]],
];

type Case = {
  name: string;
  path: string;
  params?: Record<string, string>;
  loader: (args: never) => unknown;
  bare: Array<[string, unknown[]]>;
  /** The bare read of the kept rows, for the answers that come from them. */
  kept?: Array<[string, unknown[]]>;
};
const c = company.id;
const cases: Case[] = [
  { name: "summary", path: "/api/analytics/summary", loader: summary.loader, bare: [[METAL_ROWS, [c, c]], [SPANS, [c, c]]], kept: KEPT_ROWS("all") },
  { name: "trend", path: "/api/analytics/trend", loader: trend.loader, bare: [[METAL_ROWS, [c, c]]], kept: MONTH_ROWS },
  { name: "groups (fill source, iron)", path: "/api/analytics/groups?grouping=fill-source&metal=iron", loader: groups.loader, bare: [[METAL_ROWS, [c, c]], [SPANS, [c, c]]], kept: KEPT_ROWS("iron") },
  { name: "groups (heater age, copper)", path: "/api/analytics/groups?grouping=heater-age&metal=copper", loader: groups.loader, bare: [[METAL_ROWS, [c, c]], [SPANS, [c, c]]], kept: KEPT_ROWS("copper") },
  { name: "recurring", path: "/api/analytics/recurring", loader: recurring.loader, bare: [[METAL_ROWS, [c, c]]], kept: KEPT_ROWS("all") },
  { name: "recurring (readings)", path: "/api/analytics/recurring?include=readings", loader: recurring.loader, bare: [[METAL_ROWS, [c, c]]] },
  { name: "alerts", path: "/api/analytics/alerts", loader: alerts.loader, bare: [[METAL_ROWS, [c, c]]], kept: KEPT_ROWS("all") },
  { name: "sources", path: "/api/analytics/sources", loader: sources.loader, bare: [[METAL_ROWS, [c, c]]] },
  {
    name: "outcomes (iron, combination)",
    path: "/api/analytics/outcomes?metal=iron&arm=combination",
    loader: outcomes.loader,
    bare: [
      ["SELECT tr.id, tr.pool_id, tr.product_id, tr.applied_at, tr.cost FROM treatments tr JOIN pools p ON p.id = tr.pool_id WHERE p.company_id = ? ORDER BY tr.pool_id, tr.applied_at", [c]],
      ["SELECT t.id, t.pool_id, t.sampled_at, t.ph, t.copper, t.iron, t.manganese FROM water_tests t JOIN pools p ON p.id = t.pool_id WHERE p.company_id = ? AND t.pool_id IN (SELECT DISTINCT pool_id FROM treatments WHERE company_id = ?) ORDER BY t.pool_id, t.sampled_at", [c, c]],
    ],
  },
  {
    name: "pool series (iron)",
    path: `/api/analytics/pools/${busiest.id}/series?analyte=iron`,
    params: { poolId: String(busiest.id) },
    loader: series.loader,
    bare: [["SELECT id, sampled_at, iron, iron_below_detection FROM water_tests WHERE pool_id = ? AND iron IS NOT NULL ORDER BY sampled_at", [busiest.id]]],
  },
  {
    name: "pool evidence",
    path: `/api/analytics/pools/${busiest.id}/evidence`,
    params: { poolId: String(busiest.id) },
    loader: evidence.loader,
    bare: [["SELECT * FROM water_tests WHERE pool_id = ? ORDER BY sampled_at", [busiest.id]]],
  },
];

const median = (values: number[]) => {
  const sorted = [...values].sort((a, b) => a - b);
  const mid = Math.floor(sorted.length / 2);
  return sorted.length % 2 ? sorted[mid]! : (sorted[mid - 1]! + sorted[mid]!) / 2;
};

async function timeIt(work: () => Promise<unknown>): Promise<number> {
  const started = performance.now();
  await work();
  return performance.now() - started;
}

const percentile = (values: number[], p: number) => {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.min(sorted.length - 1, Math.ceil(p * sorted.length) - 1)]!;
};

type Timing = { p50: number; p95: number };
async function timings(work: () => Promise<unknown>): Promise<Timing> {
  await work();
  const times: number[] = [];
  for (let i = 0; i < runs; i++) times.push(await timeIt(work));
  return { p50: median(times), p95: percentile(times, 0.95) };
}
const ms = (t: Timing | null) => (t ? `${t.p50.toFixed(0)} / ${t.p95.toFixed(0)}` : "-");

console.log(`route book: ${size.pools} pools, ${size.tests} water tests; median / 95th percentile (ms) of ${runs} runs after one warm-up\n`);
console.log(
  `${"endpoint".padEnd(30)} ${"kept".padStart(12)} ${"recomputed".padStart(12)} ${"kept rows".padStart(12)} ${"test rows".padStart(12)} ${"source".padStart(11)} ${"kB".padStart(6)}`,
);
type EndpointFigures = { name: string; kept: Timing | null; recomputed: Timing; keptRows: Timing | null; testRows: Timing; source: string; kB: number };
const figures = { pools: Number(size.pools), tests: Number(size.tests), runs, endpoints: [] as EndpointFigures[], keepBusiestPoolMs: 0 };
for (const test of cases) {
  const call = async () => {
    const request = new Request(`http://localhost:3000${test.path}`, { headers: { Cookie: cookie } });
    const args = { request, params: test.params ?? {}, context: new RouterContextProvider(), url: new URL(request.url), pattern: test.path };
    // The member API's own middleware builds the context, as on the server.
    const response = (await apiMemberMiddleware(args, async () => (await (test.loader as (a: typeof args) => unknown)(args)) as Response)) as Response;
    if (!response.ok) throw new Error(`${test.name}: ${response.status} ${await response.text()}`);
    return response.text();
  };
  const read = (statements: Array<[string, unknown[]]>) => async () => {
    for (const [text, values] of statements) await pool().query(text, values);
  };
  serverEnv().PATINA_KEPT_ANALYTICS = "on";
  const answer = await call();
  const source = (JSON.parse(answer) as { source?: string }).source ?? "recomputed";
  const kept = source === "kept" ? await timings(call) : null;
  serverEnv().PATINA_KEPT_ANALYTICS = "off";
  const recomputed = await timings(call);
  serverEnv().PATINA_KEPT_ANALYTICS = "on";
  const keptRows = test.kept ? await timings(read(test.kept)) : null;
  const testRows = await timings(read(test.bare));
  figures.endpoints.push({ name: test.name, kept, recomputed, keptRows, testRows, source, kB: Math.round(answer.length / 1024) });
  console.log(
    `${test.name.padEnd(30)} ${ms(kept).padStart(12)} ${ms(recomputed).padStart(12)} ${ms(keptRows).padStart(12)} ${ms(testRows).padStart(12)} ${source.padStart(11)} ${(answer.length / 1024).toFixed(0).padStart(6)}`,
  );
}

// What keeping a pool's results adds to a visit save: the lock, the pool's tests read again, its rows replaced.
const keepTimes: number[] = [];
for (let i = 0; i <= runs * 4; i++) {
  const started = performance.now();
  await db()
    .transaction(async (tx) => {
      await lockPoolsForKeeping(tx, [busiest.id]);
      await keepPoolsInStep(tx, company.id, [busiest.id]);
      throw new Error("rolled back");
    })
    .catch(() => undefined);
  if (i > 0) keepTimes.push(performance.now() - started);
}
figures.keepBusiestPoolMs = median(keepTimes);
console.log(`\nkeeping the busiest pool in step with a visit (lock, read, replace; rolled back): median ${median(keepTimes).toFixed(1)} ms`);
if (figuresFile) writeFileSync(figuresFile, JSON.stringify(figures));
await closeDatabase();
