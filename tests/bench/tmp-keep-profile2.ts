import { performance } from "node:perf_hooks";
let last = 0; const t: Record<string, number[]> = {};
(globalThis as any).__t = (k: string) => { const n = performance.now(); (t[k] ??= []).push(n - last); last = n; };
(globalThis as any).__start = () => { last = performance.now(); };
const { db, pool, closeDatabase } = await import("../../app/.server/db/client");
const { lockPoolsForKeeping, poolTests, replaceKeptRows, liveVersions } = await import("../../app/.server/analytics/kept/keep-pools");
const [[busiest]] = (await pool().query("SELECT pool_id AS id FROM water_tests WHERE company_id = 1 AND iron IS NOT NULL GROUP BY pool_id ORDER BY COUNT(*) DESC LIMIT 1")) as any;
for (let i = 0; i < 15; i++) {
  await db().transaction(async (tx) => {
    await lockPoolsForKeeping(tx, [busiest.id]);
    const versions = await liveVersions(tx, 1);
    const tests = await poolTests(tx, 1, [busiest.id]);
    (globalThis as any).__start();
    await replaceKeptRows(tx, 1, versions[0]!, [busiest.id], tests);
    throw new Error("rollback");
  }).catch(() => undefined);
}
const med = (a: number[]) => a.sort((x, y) => x - y)[Math.floor(a.length / 2)]!.toFixed(1);
console.log(Object.entries(t).map(([k, v]) => `${k}: ${med(v)}`).join("\n"));
await closeDatabase();
