import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDatabase, db } from "~/.server/db/client";
import * as groupsApi from "~/routes/api.analytics.groups";
import * as outcomesApi from "~/routes/api.analytics.outcomes";
import * as alertsApi from "~/routes/api.analytics.alerts";
import * as summaryApi from "~/routes/api.analytics.summary";
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
