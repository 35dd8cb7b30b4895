import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDatabase, db } from "~/.server/db/client";
import * as groupsApi from "~/routes/api.analytics.groups";
import * as outcomesApi from "~/routes/api.analytics.outcomes";
import * as alertsApi from "~/routes/api.analytics.alerts";
import * as summaryApi from "~/routes/api.analytics.summary";
import * as outlookApi from "~/routes/api.analytics.ahead";
import { eq } from "drizzle-orm";
import { pools, routeTechnicians, user } from "~/.server/db/schema";
import { seedDemo, type SeedSummary } from "../../drizzle/seed/insert";
import { PRODUCTS, type ProductKey } from "../../drizzle/seed/products";
import { buildRouteBook } from "../../drizzle/seed/routebook";
import { plantedCauses, resolveOptions } from "../../drizzle/seed/scenario";
import { signIn, requestAs, type FixtureMember } from "../fixtures/company";
import { callRoute, type RouteFunction } from "../fixtures/route-call";

// The demo scenario plants its causes (an iron-bearing shared well, ageing
// copper and cupronickel heat exchangers, a stronger sequestrant-plus-pad
// treatment); the analytics must find them without being told where they are.

let summary: SeedSummary;
let owner: FixtureMember;
let planted: ReturnType<typeof plantedCauses>;

beforeAll(async () => {
  summary = await seedDemo(db());
  planted = plantedCauses(buildRouteBook(resolveOptions(summary.options)));
  const demoOwner = summary.users.find((u) => u.role === "owner")!;
  owner = { userId: "", email: demoOwner.email, role: "owner", cookie: await signIn(demoOwner.email, demoOwner.password) };
}, 300_000);

afterAll(closeDatabase);

// The answers are read deep and checked field by field; typing every JSON shape here would only repeat the routes.
// eslint-disable-next-line @typescript-eslint/no-explicit-any
type Body = Record<string, any>;
const get = async (fn: RouteFunction, path: string) => (await callRoute(fn, requestAs(owner, path))).body as Body;

const name = (key: ProductKey) => PRODUCTS.find((p) => p.key === key)!.name;

describe("the demo's planted causes surface", () => {
  it("flags the iron-bearing shared well as risky for iron, and no other source", async () => {
    const body = await get(groupsApi.loader, "/api/analytics/groups?grouping=fill-source&metal=iron");
    const well = body.groups.find((g: Body) => g.label === planted.ironWell!.source);
    expect(well.pools).toBe(planted.ironWell!.pools.length);
    expect(well.risky).toBe(true);
    expect(well.rateRatio.lower).toBeGreaterThan(1);
    expect(body.groups.filter((g: Body) => g.risky).map((g: Body) => g.label)).toEqual([planted.ironWell!.source]);
  });

  it("flags heaters 10 years and older as risky for copper, younger ones and no heater not", async () => {
    const body = await get(groupsApi.loader, "/api/analytics/groups?grouping=heater-age&metal=copper");
    const risky = Object.fromEntries(body.groups.map((g: Body) => [g.group, g.risky]));
    expect(risky).toMatchObject({ "10-14": true, "15+": true, "0-4": false, "5-9": false, none: false });
  });

  it("flags copper and cupronickel exchangers, not titanium", async () => {
    const body = await get(groupsApi.loader, "/api/analytics/groups?grouping=exchanger-metal&metal=copper");
    const risky = Object.fromEntries(body.groups.map((g: Body) => [g.group, g.risky]));
    expect(risky).toMatchObject({ copper: true, cupronickel: true, titanium: false, "no-heater": false });
  });

  it("shows heavy-duty sequestrant with a collector pad clearing iron sooner than the maintenance sequestrant alone", async () => {
    const body = await get(outcomesApi.loader, "/api/analytics/outcomes?arm=combination&metal=iron");
    const arm = (label: string) => body.arms.find((a: Body) => a.label === label);
    const better = arm(`${name("sequestrantHeavy")} + ${name("collectorPad")}`);
    const weaker = arm(name("sequestrantMaintenance"));
    expect(better.tooFewToCompare).toBe(false);
    expect(weaker.tooFewToCompare).toBe(false);
    expect(better.timeToClear.medianDays).not.toBeNull();
    // The median's 95% limits bracket it (the upper one may be unbounded: null).
    expect(better.timeToClear.medianLower).toBeLessThanOrEqual(better.timeToClear.medianDays);
    if (better.timeToClear.medianUpper !== null) expect(better.timeToClear.medianUpper).toBeGreaterThanOrEqual(better.timeToClear.medianDays);
    // The maintenance sequestrant alone never gets half its courses clear within 30 days (median null)
    // or, if it does, later than the pair.
    if (weaker.timeToClear.medianDays !== null) expect(better.timeToClear.medianDays).toBeLessThan(weaker.timeToClear.medianDays);
    expect(better.reduction.median).toBeGreaterThan(weaker.reduction.median);
  });

  it("raises shared-source alerts only on the iron well", async () => {
    const body = await get(alertsApi.loader, "/api/analytics/alerts");
    expect(body.alerts.length).toBeGreaterThan(0);
    expect(new Set(body.alerts.map((a: Body) => `${a.sourceName}/${a.metal}`))).toEqual(new Set([`${planted.ironWell!.source}/iron`]));
  });

  it("summarises the route book", async () => {
    const body = await get(summaryApi.loader, "/api/analytics/summary");
    expect(body.counts.poolsTested).toBe(summary.options.pools);
    expect(body.recurringPools).toBeGreaterThan(0);
    const shares = body.balance.corrosive.share + body.balance.balanced.share + body.balance.scaleForming.share;
    expect(shares).toBeCloseTo(1, 10);
  });
});

describe("the metal outlook on the demo", () => {
  it("beats simply ranking by the latest reading in the rolling-origin backtest, and says it uses the model", async () => {
    const body = await get(outlookApi.loader, "/api/analytics/ahead");
    const bt = body.backtest;
    expect(body.method).toBe("model");
    expect(bt.modelWins).toBe(true);
    expect(bt.origins).toBe(52);
    expect(bt.model.share).toBeGreaterThan(bt.latestReading.share);
    expect(bt.brier).toBeLessThan(bt.baseRateBrier);
    expect(bt.skill).toBeGreaterThan(0);
    // The calibration table accounts for every forecast and every opening once.
    expect(bt.calibration.reduce((n: number, b: Body) => n + b.count, 0)).toBe(bt.forecasts);
    expect(bt.calibration.reduce((n: number, b: Body) => n + b.events, 0)).toBe(bt.openings);
    expect(bt.baseRate).toBeCloseTo(bt.openings / bt.forecasts, 12);
  });

  it("leads with the planted causes: the iron well's pools for iron and old copper-bearing exchangers for copper", async () => {
    const body = await get(outlookApi.loader, "/api/analytics/ahead?limit=10");
    const codes = new Map((await db().select({ id: pools.id, code: pools.accountCode }).from(pools).where(eq(pools.companyId, summary.companyId))).map((p) => [p.id, p.code]));
    const ironWell = new Set(planted.ironWell!.pools);
    const oldExchangers = new Set(planted.copperExchangers.map((h) => h.accountCode));
    const wells = new Set([...planted.manganeseWells, ...planted.ironPrivateWells].map((w) => w.pool));
    const cause = (e: Body) => {
      const code = codes.get(e.poolId)!;
      if (e.metal === "iron" && ironWell.has(code)) return "iron well";
      if (e.metal === "copper" && oldExchangers.has(code)) return "old exchanger";
      if (wells.has(code)) return "private well";
      return "none";
    };
    const causes = body.entries.map(cause);
    expect(body.entries).toHaveLength(10);
    expect(causes).not.toContain("none");
    expect(causes).toContain("iron well");
    expect(causes).toContain("old exchanger");
    // Each entry explains itself with one to three reasons in words.
    for (const e of body.entries) {
      expect(e.reasons.length).toBeGreaterThanOrEqual(1);
      expect(e.reasons.length).toBeLessThanOrEqual(3);
    }
    const ironEntry = body.entries.find((e: Body) => cause(e) === "iron well");
    expect(ironEntry.reasons.map((r: Body) => r.key)).toEqual(expect.arrayContaining(["fillWater"]));
  });

  it("shows a technician only the pools of their routes, with the company's model", async () => {
    const tech = summary.users.find((u) => u.role === "technician")!;
    const member = { userId: "", email: tech.email, role: "technician" as const, cookie: await signIn(tech.email, tech.password) };
    const [techUser] = await db().select({ id: user.id }).from(user).where(eq(user.email, tech.email));
    const routeIds = new Set((await db().select({ routeId: routeTechnicians.routeId }).from(routeTechnicians).where(eq(routeTechnicians.userId, techUser!.id))).map((r) => r.routeId));
    const routeOf = new Map((await db().select({ id: pools.id, routeId: pools.routeId }).from(pools).where(eq(pools.companyId, summary.companyId))).map((p) => [p.id, p.routeId]));
    const techBody = (await callRoute(outlookApi.loader, requestAs(member, "/api/analytics/ahead"))).body as Body;
    const ownerBody = await get(outlookApi.loader, "/api/analytics/ahead");
    expect(techBody.entries.length).toBeGreaterThan(0);
    expect(techBody.entries.length).toBeLessThan(ownerBody.entries.length);
    expect(techBody.entries.every((e: Body) => routeIds.has(routeOf.get(e.poolId)!))).toBe(true);
    expect(techBody.backtest.brier).toBe(ownerBody.backtest.brier);
  });

  it("refuses a bad metal or limit with a 400 naming the field", async () => {
    const metal = await callRoute(outlookApi.loader, requestAs(owner, "/api/analytics/ahead?metal=gold"));
    expect(metal.status).toBe(400);
    expect((metal.body as Body).error.field).toBe("metal");
    const limit = await callRoute(outlookApi.loader, requestAs(owner, "/api/analytics/ahead?limit=0"));
    expect(limit.status).toBe(400);
    expect((limit.body as Body).error.field).toBe("limit");
  });

  it("answers 401 without a session", async () => {
    const outcome = await callRoute(outlookApi.loader, requestAs(null, "/api/analytics/ahead"));
    expect(outcome.status).toBe(401);
  });
});
