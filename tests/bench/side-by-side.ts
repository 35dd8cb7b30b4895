/**
 * The analytics endpoints' figures of several route books next to each other,
 * from the files analytics-endpoints.ts writes, with the goals of each size:
 * a median from the kept results at or under 100 ms at 2,000 pools and 500 ms
 * at 10,000 pools, and within twice the bare read of the kept rows.
 *
 *   npx tsx tests/bench/side-by-side.ts figures-2000.json figures-10000.json
 */
import { readFileSync } from "node:fs";

type Timing = { p50: number; p95: number };
type Endpoint = { name: string; kept: Timing | null; recomputed: Timing; keptRows: Timing | null; testRows: Timing; source: string; kB: number };
type Figures = { pools: number; tests: number; runs: number; endpoints: Endpoint[]; keepBusiestPoolMs: number };

const books = process.argv.slice(2).map((file) => JSON.parse(readFileSync(file, "utf8")) as Figures);
if (books.length === 0) {
  console.error("Name the figure files written by analytics-endpoints.ts.");
  process.exit(2);
}

const goalMs = (pools: number) => (pools <= 2_000 ? 100 : 500);
const ms = (t: Timing | null) => (t ? `${t.p50.toFixed(0)} / ${t.p95.toFixed(0)}` : "-");
function verdict(e: Endpoint | undefined, pools: number): string {
  if (!e?.kept) return "recomputed";
  const underGoal = e.kept.p50 <= goalMs(pools);
  const nearRows = e.keptRows === null || e.kept.p50 <= 2 * e.keptRows.p50;
  return underGoal && nearRows ? "met" : [underGoal ? "" : `> ${goalMs(pools)} ms`, nearRows ? "" : "> 2x rows"].filter(Boolean).join(", ");
}

const width = 62;
console.log(
  `${"".padEnd(30)} ${books.map((b) => `${b.pools.toLocaleString("en")} pools, ${b.tests.toLocaleString("en")} tests`.padEnd(width)).join(" ")}`,
);
console.log(
  `${"endpoint (median / p95 ms)".padEnd(30)} ${books.map(() => `${"kept".padStart(11)} ${"recomputed".padStart(13)} ${"kept rows".padStart(11)} ${"goal".padStart(24)}`).join(" ")}`,
);
for (const { name } of books[0]!.endpoints) {
  const cells = books.map((b) => {
    const e = b.endpoints.find((x) => x.name === name);
    return `${ms(e?.kept ?? null).padStart(11)} ${ms(e?.recomputed ?? null).padStart(13)} ${ms(e?.keptRows ?? null).padStart(11)} ${verdict(e, b.pools).padStart(24)}`;
  });
  console.log(`${name.padEnd(30)} ${cells.join(" ")}`);
}
console.log(
  `${"keeping the busiest pool".padEnd(30)} ${books.map((b) => `${b.keepBusiestPoolMs.toFixed(1)} ms (median, added to a visit save)`.padEnd(width)).join(" ")}`,
);
