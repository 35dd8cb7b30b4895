/**
 * The metal outlook's cost on a seeded route book: reading the company's
 * history, then building the weekly rows, the 52-week rolling-origin backtest
 * and today's fit (wall and CPU time), and a cached call through the API loader.
 *
 *   DATABASE_URL=mysql://…/patina_scratch_x npx tsx tests/bench/outlook.ts
 */
import { performance } from "node:perf_hooks";
import { RouterContextProvider } from "react-router";
import { metalOutlook } from "@analysis/ahead/outlook";
import { closeDatabase, pool } from "../../app/.server/db/client";
import { readOutlookHistory } from "../../app/.server/analytics/queries/metal-outlook";
import { companySettings } from "../../app/.server/settings/queries/company-settings";
import { apiMemberMiddleware } from "../../app/.server/guard";
import * as ahead from "~/routes/api.analytics.ahead";
import { DEMO_EMAIL_DOMAIN, DEMO_USERS } from "../../drizzle/seed/names";
import { signIn } from "../fixtures/company";

const [[company]] = (await pool().query("SELECT id FROM companies ORDER BY id LIMIT 1")) as unknown as [[{ id: number }]];
const [[last]] = (await pool().query("SELECT MAX(sampled_at) AS at, COUNT(*) AS tests, (SELECT COUNT(*) FROM pools WHERE company_id = ?) AS pools FROM water_tests WHERE company_id = ?", [company.id, company.id])) as unknown as [
  [{ at: Date; tests: number; pools: number }],
];
const settings = (await companySettings(company.id))!;
const params = { thresholds: settings.thresholds, balanceBand: settings.balanceBand };

let started = performance.now();
const history = await readOutlookHistory(company.id, params, last.at);
const readMs = performance.now() - started;

const cpu = process.cpuUsage();
started = performance.now();
const outlook = await metalOutlook(history);
const fitMs = performance.now() - started;
const used = process.cpuUsage(cpu);

const owner = DEMO_USERS.find((u) => u.role === "owner")!;
const cookie = await signIn(`${owner.email}@${DEMO_EMAIL_DOMAIN}`, owner.password);
const call = async () => {
  const request = new Request("http://localhost:3000/api/analytics/ahead", { headers: { Cookie: cookie } });
  const args = { request, params: {}, context: new RouterContextProvider(), url: new URL(request.url), pattern: "/api/analytics/ahead" };
  const response = (await apiMemberMiddleware(args, async () => (await ahead.loader(args as never)) as Response)) as Response;
  return response.text();
};
started = performance.now();
await call();
const firstCallMs = performance.now() - started;
started = performance.now();
await call();
const cachedCallMs = performance.now() - started;

const bt = outlook.backtest;
console.log(`route book: ${last.pools} pools, ${last.tests} water tests`);
console.log(`read history           ${readMs.toFixed(0).padStart(8)} ms`);
console.log(`rows, backtest and fit ${fitMs.toFixed(0).padStart(8)} ms wall, ${((used.user + used.system) / 1000).toFixed(0)} ms CPU`);
console.log(`API, first call        ${firstCallMs.toFixed(0).padStart(8)} ms (reads and fits again)`);
console.log(`API, cached call       ${cachedCallMs.toFixed(0).padStart(8)} ms`);
console.log(
  bt
    ? `backtest: ${bt.origins} origins, ${bt.forecasts} forecasts, ${bt.openings} openings; Brier ${bt.brier.toFixed(5)} (base rate ${bt.baseRateBrier.toFixed(5)}); top 10%: model ${(bt.model.share * 100).toFixed(1)}%, latest reading ${(bt.latestReading.share * 100).toFixed(1)}%; shown: ${outlook.method}`
    : "backtest: not enough history",
);
await closeDatabase();
