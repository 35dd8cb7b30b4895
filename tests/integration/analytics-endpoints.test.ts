import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDatabase, db } from "~/.server/db/client";
import { equipment, products, treatments } from "~/.server/db/schema";
import * as alertsApi from "~/routes/api.analytics.alerts";
import * as evidenceApi from "~/routes/api.analytics.pools.$poolId.evidence";
import * as groupsApi from "~/routes/api.analytics.groups";
import * as outcomesApi from "~/routes/api.analytics.outcomes";
import * as recurringApi from "~/routes/api.analytics.recurring";
import * as seriesApi from "~/routes/api.analytics.pools.$poolId.series";
import * as sourcesApi from "~/routes/api.analytics.sources";
import * as summaryApi from "~/routes/api.analytics.summary";
import * as trendApi from "~/routes/api.analytics.trend";
import * as recurringPage from "~/routes/recurring";
import * as poolPage from "~/routes/pools.$poolId";
import { addTest, type FixtureMember, requestAs } from "../fixtures/company";
import { routeBookPerFile } from "../fixtures/route-book";
import { callRoute, type RouteFunction } from "../fixtures/route-call";

// The fixed route book (company time zone UTC; default levels, common practice
// (no published source): iron elevated >= 0.2, clear < 0.1; copper 0.3 / 0.1).
//
//   pool  route  source              tests (2025)
//   P1    R1     S1 shared well      01-01 Fe 0.05 | 03-01 Fe 0.40 pH 7.4 | 03-08 Fe 0.15 | 03-15 Fe 0.05
//                                    06-01 Fe 0.30 | 12-31 Fe 0.05 + corrosive balance
//   P2    R1     S1                  01-01 Fe 0.05 | 03-08 Fe 0.35 pH 7.9 | 03-13 Fe 0.10 | 03-22 Fe 0.05
//                                    12-31 balanced (no metal)
//   P3    R2     S1                  01-01 Fe 0.05 | 03-20 Fe 0.25 | 12-31 Fe 0.15 + balanced
//   P4    R2     S2 municipal        01-01 Cu <0.05 | 12-31 Cu 0.05 + scale-forming
//   P5    R1     S2                  01-01 pH only | 02-01 Cu 0.50 | 02-15 Cu 0.05 | 12-31 pH only
//
// Episodes: P1 iron 03-01..03-15 (14 d) and 06-01..12-31 (213 d, chronic, a
// recurrence: 92 days after the first opening); P2 iron 03-08..03-22 (14 d);
// P3 iron 03-20.. still open at 12-31 (286 d, censored, chronic); P5 copper
// 02-01..02-15 (14 d). A copper heater was installed at P1 on 2015-06-01.
//
// A pool of another company reads iron 0.90 in March: it must never appear.

const book = routeBookPerFile({
  routes: { r1: "Route one", r2: { name: "Route two", weekdays: "2" } },
  sources: { S1: { name: "Well one", kind: "shared_well" }, s2: "Town main" },
  pools: {
    P1: { route: "r1", street: "1 Alder Way", source: "S1" },
    P2: { route: "r1", street: "2 Alder Way", source: "S1" },
    P3: { route: "r2", street: "3 Birch Way", source: "S1" },
    P4: { route: "r2", street: "4 Birch Way", source: "s2" },
    P5: { route: "r1", street: "5 Alder Way", source: "s2" },
  },
  members: { owner: "owner", manager: "manager", analyst: "analyst", technician: { role: "technician", routes: ["r1"] } },
});
const { owner, manager, analyst, technician } = book.member;
const P = book.pool;
const elsewhere = routeBookPerFile({
  routes: { elsewhere: "Elsewhere" },
  sources: { theirs: { name: "Their well", kind: "shared_well" } },
  pools: { X1: { route: "elsewhere", source: "theirs" } },
  members: { owner: "owner" },
});
const otherOwner = elsewhere.member.owner;
let seqA = 0;
let padB = 0;

const corrosive = { ph: 7.8, temperatureC: 20, calciumHardness: 140, totalAlkalinity: 20 };
const balanced = { ph: 7.5, temperatureC: 28.9, calciumHardness: 300, totalAlkalinity: 100 };
const scaleForming = { ph: 8.0, temperatureC: 28.9, calciumHardness: 400, totalAlkalinity: 150 };

beforeAll(async () => {
  const { companyId } = book;
  const at = (day: string) => `2025-${day}T10:00:00Z`;

  await addTest(companyId, P.P1, at("01-01"), { iron: 0.05 });
  await addTest(companyId, P.P1, at("03-01"), { iron: 0.4, ph: 7.4 });
  await addTest(companyId, P.P1, at("03-08"), { iron: 0.15 });
  await addTest(companyId, P.P1, at("03-15"), { iron: 0.05 });
  await addTest(companyId, P.P1, at("06-01"), { iron: 0.3 });
  await addTest(companyId, P.P1, at("12-31"), { iron: 0.05, ...corrosive });

  await addTest(companyId, P.P2, at("01-01"), { iron: 0.05 });
  await addTest(companyId, P.P2, at("03-08"), { iron: 0.35, ph: 7.9 });
  await addTest(companyId, P.P2, at("03-13"), { iron: 0.1 });
  await addTest(companyId, P.P2, at("03-22"), { iron: 0.05 });
  await addTest(companyId, P.P2, at("12-31"), balanced);

  await addTest(companyId, P.P3, at("01-01"), { iron: 0.05 });
  await addTest(companyId, P.P3, at("03-20"), { iron: 0.25 });
  await addTest(companyId, P.P3, at("12-31"), { iron: 0.15, ...balanced });

  await addTest(companyId, P.P4, at("01-01"), { copper: 0.05, copperBelowDetection: true });
  await addTest(companyId, P.P4, at("12-31"), { copper: 0.05, ...scaleForming });

  await addTest(companyId, P.P5, at("01-01"), { ph: 7.5 });
  await addTest(companyId, P.P5, at("02-01"), { copper: 0.5 });
  await addTest(companyId, P.P5, at("02-15"), { copper: 0.05 });
  await addTest(companyId, P.P5, at("12-31"), { ph: 7.5 });

  await db().insert(equipment).values({
    companyId,
    poolId: P.P1,
    kind: "heater",
    exchangerMetal: "copper",
    installedOn: "2015-06-01",
  });

  const [a] = await db().insert(products).values({ companyId, name: "Seq A", category: "sequestrant", unitCost: 0.5 }).$returningId();
  const [b] = await db().insert(products).values({ companyId, name: "Pad B", category: "collector_pad", unitCost: 25 }).$returningId();
  seqA = a!.id;
  padB = b!.id;
  await db()
    .insert(treatments)
    .values([
      { companyId, poolId: P.P1, productId: seqA, appliedAt: new Date(at("03-01")), amount: 20, unit: "fl oz", cost: 10 },
      { companyId, poolId: P.P2, productId: seqA, appliedAt: new Date(at("03-08")), amount: 20, unit: "fl oz", cost: 10 },
      { companyId, poolId: P.P2, productId: padB, appliedAt: new Date(at("03-08")), amount: 1, unit: "each", cost: 25 },
    ]);

  await addTest(elsewhere.companyId, elsewhere.pool.X1, at("03-05"), { iron: 0.9, ...corrosive });
  await addTest(elsewhere.companyId, elsewhere.pool.X1, at("03-25"), { iron: 0.95 });
});

afterAll(closeDatabase);

// The answers are read deep and checked field by field; typing every JSON shape here would only repeat the routes.
// eslint-disable-next-line @typescript-eslint/no-explicit-any
type Body = Record<string, any>;
const get = async (fn: RouteFunction, member: FixtureMember | null, path: string, params: Record<string, string> = {}) => {
  const outcome = await callRoute(fn, requestAs(member, path), params);
  return { status: outcome.status, body: outcome.body as Body };
};
/** The body of an answer that must be a 200. */
const getOk = async (...args: Parameters<typeof get>) => {
  const { status, body } = await get(...args);
  expect(status).toBe(200);
  return body;
};

const YEAR = 365.25;
// Every pool is observed from 01-01 to 12-31: 364 days.
const POOL_YEARS = 364 / YEAR;

describe("guard and errors", () => {
  it("answers 401 without a session and 403 for a role outside the area, in the API's error shape", async () => {
    const anonymous = await get(groupsApi.loader, null, "/api/analytics/groups");
    expect(anonymous.status).toBe(401);
    expect(anonymous.body.error.code).toBe("unauthenticated");
    const tech = await get(groupsApi.loader, technician, "/api/analytics/groups");
    expect(tech.status).toBe(403);
    expect(tech.body.error.code).toBe("forbidden");
    // Outcomes are for owners and managers only.
    expect((await get(outcomesApi.loader, analyst, "/api/analytics/outcomes")).status).toBe(403);
    expect((await get(recurringApi.loader, technician, "/api/analytics/recurring")).status).toBe(403);
  });

  it("names the field, the value and the problem of a bad parameter", async () => {
    const metal = await get(groupsApi.loader, owner, "/api/analytics/groups?metal=gold");
    expect(metal.status).toBe(400);
    expect(metal.body.error).toMatchObject({ code: "invalid_parameter", field: "metal" });
    expect(metal.body.error.message).toContain('"gold"');
    const grouping = await get(groupsApi.loader, owner, "/api/analytics/groups?grouping=colour");
    expect(grouping.body.error.field).toBe("grouping");
    const from = await get(summaryApi.loader, owner, "/api/analytics/summary?from=2025-13-01");
    expect(from.status).toBe(400);
    expect(from.body.error.field).toBe("from");
    const order = await get(summaryApi.loader, owner, "/api/analytics/summary?from=2025-06-01&to=2025-01-01");
    expect(order.body.error.field).toBe("from");
    // Clear 0.5 above the company's elevated 0.2: refused, naming ironClear.
    const levels = await get(recurringApi.loader, owner, "/api/analytics/recurring?ironClear=0.5");
    expect(levels.status).toBe(400);
    expect(levels.body.error.field).toBe("ironClear");
    const pool = await get(seriesApi.loader, owner, "/api/analytics/pools/abc/series", { poolId: "abc" });
    expect(pool.status).toBe(400);
    expect(pool.body.error.field).toBe("poolId");
  });
});

describe("GET /api/analytics/groups", () => {
  it("by fill source for iron: openings per pool-year with exact intervals, small groups marked", async () => {
    const body = await getOk(groupsApi.loader, owner, "/api/analytics/groups?grouping=fill-source&metal=iron");
    expect(body.pools).toBe(5); // the other company's pool is not counted
    expect(body.openings).toBe(4); // P1 x2, P2, P3
    const well = body.groups.find((g: Body) => g.label === "Well one");
    const main = body.groups.find((g: Body) => g.label === "Town main");
    // Well one: 3 pools x 364 days = 2.98973 pool-years, 4 openings.
    expect(well.pools).toBe(3);
    expect(well.openings).toBe(4);
    expect(well.poolYears).toBeCloseTo(3 * POOL_YEARS, 6);
    expect(well.ratePerPoolYear.estimate).toBeCloseTo(4 / (3 * POOL_YEARS), 6);
    // Exact (Garwood) Poisson 95% limits for 4 events: 1.0899 and 10.2416
    // (chi-square 2.1797/2 with 8 df, 20.4832/2 with 10 df; Ulm 1990 / Garwood 1936 tables).
    expect(well.ratePerPoolYear.lower).toBeCloseTo(1.08987 / (3 * POOL_YEARS), 3);
    expect(well.ratePerPoolYear.upper).toBeCloseTo(10.2416 / (3 * POOL_YEARS), 3);
    // Wilson 3 of 3 (Newcombe 1998): lower (1 + z2/6 - z*sqrt(z2/36)) / (1 + z2/3) = 0.4385.
    expect(well.shareWithEpisode.estimate).toBe(1);
    expect(well.shareWithEpisode.lower).toBeCloseTo(0.4385, 3);
    // Rate ratio: the rest has no iron openings, so the estimate is unbounded (null)
    // and the conditional exact lower bound is p/(1-p) x (rest years / group years)
    // with p = 0.025^(1/4) = 0.39764 (Clopper-Pearson 4 of 4): 0.66013 x 2/3 = 0.44009.
    expect(well.rateRatio.estimate).toBeNull();
    expect(well.rateRatio.lower).toBeCloseTo(0.44009, 4);
    expect(well.rateRatio.upper).toBeNull();
    expect(well.risky).toBe(false); // lower bound 0.44 is not above 1
    expect(well.tooSmallToJudge).toBe(false);
    expect(main.pools).toBe(2);
    expect(main.openings).toBe(0);
    expect(main.tooSmallToJudge).toBe(true); // 2 pools < 3
  });

  it("by heater age splits P1's year at its heater's tenth birthday", async () => {
    const { body } = await get(groupsApi.loader, manager, "/api/analytics/groups?grouping=heater-age&metal=iron");
    const byGroup = Object.fromEntries(body.groups.map((g: Body) => [g.group, g]));
    // P1: heater installed 2015-06-01, 9 years old on 01-01 (5-9) and 10 on 06-01.
    // The birthday falls at midnight, the tests at 10:00:
    // 5-9: 01-01 10:00 .. 06-01 00:00 = 151 days - 10 h, with the 03-01 opening;
    // 10-14: 06-01 00:00 .. 12-31 10:00 = 213 days + 10 h, with the 06-01 opening.
    expect(byGroup["5-9"].poolYears).toBeCloseTo((151 - 10 / 24) / YEAR, 6);
    expect(byGroup["5-9"].openings).toBe(1);
    expect(byGroup["10-14"].poolYears).toBeCloseTo((213 + 10 / 24) / YEAR, 6);
    expect(byGroup["10-14"].openings).toBe(1);
    expect(byGroup["10-14"].label).toBe("10–14 years");
    // No heater: P2..P5, 4 x 364 days, openings P2 and P3.
    expect(byGroup.none.poolYears).toBeCloseTo((4 * 364) / YEAR, 6);
    expect(byGroup.none.openings).toBe(2);
  });

  it("a route filter narrows the route book", async () => {
    // Route two holds P3 and P4: P3's iron opening only.
    const routes = await get(groupsApi.loader, owner, "/api/analytics/groups?grouping=route");
    const two = routes.body.groups.find((g: Body) => g.label === "Route two");
    const { body } = await get(groupsApi.loader, owner, `/api/analytics/groups?grouping=route&route=${two.group}`);
    expect(body.pools).toBe(2);
    expect(body.openings).toBe(1);
  });
});

describe("GET /api/analytics/recurring", () => {
  it("lists recurring and chronic pools with their episodes", async () => {
    const body = await getOk(recurringApi.loader, analyst, "/api/analytics/recurring");
    // P1: two iron openings 92 days apart (recurring) and a 213-day episode (chronic).
    // P3: one iron episode open 286 days (chronic). P2 and P5: one 14-day episode each.
    expect(body.recurringPools).toBe(1);
    expect(body.chronicPools).toBe(2);
    expect(body.pools.map((p: Body) => p.poolId)).toEqual([P.P1, P.P3]);
    const p1 = body.pools[0];
    expect(p1.metals).toEqual([{ metal: "iron", openings: 2, recurrent: true, chronic: true, firstRecurrenceAt: "2025-06-01T10:00:00.000Z" }]);
    expect(p1.episodes.map((e: Body) => [e.openedAt.slice(0, 10), e.closedAt?.slice(0, 10), Math.round(e.durationDays)])).toEqual([
      ["2025-03-01", "2025-03-15", 14],
      ["2025-06-01", "2025-12-31", 213],
    ]);
    const p3 = body.pools[1].episodes[0];
    expect(p3).toMatchObject({ censored: true, closedAt: null, chronic: true, peak: 0.25 });
    expect(p3.durationDays).toBeCloseTo(286, 6);
  });

  it("recomputes with the levels given in the query", async () => {
    // Iron elevated at 0.36: only P1's 0.40 opens (0.35, 0.30, 0.25 do not); 14 days, no recurrence.
    const { body } = await get(recurringApi.loader, owner, "/api/analytics/recurring?ironElevated=0.36");
    expect(body.recurringPools).toBe(0);
    expect(body.chronicPools).toBe(0);
    expect(body.pools).toEqual([]);
    // Chronic after 300 days: P3's 286 days and P1's 213 days no longer count.
    const longer = await get(recurringApi.loader, owner, "/api/analytics/recurring?chronicAfterDays=300");
    expect(longer.body.chronicPools).toBe(0);
    expect(longer.body.recurringPools).toBe(1);
  });

  it("sends readings of every pool that could have an episode at the levels asked or stricter, as per-pool columns", async () => {
    // Candidates: any reading at or above the elevated level (iron 0.2, copper 0.3):
    // P1 (0.40), P2 (0.35), P3 (0.25), P5 (copper 0.50); P4 never exceeds 0.05.
    const { body } = await get(recurringApi.loader, owner, "/api/analytics/recurring?include=readings");
    expect(body.pools.map((p: Body) => p.poolId).sort()).toEqual([P.P1, P.P2, P.P3, P.P5].sort());
    expect(body.lowestElevated.iron).toBe(0.2);
    expect(body.firstListed).toBeNull();
    const day = 86_400_000;
    const byPool = new Map(body.readings.map((r: Body) => [r.poolId, r]));
    // P1: 01-01 -> 03-01 is 31 + 28 = 59 days; 03-01 -> 03-08 -> 03-15 are 7 days each;
    // 03-15 -> 06-01 is 17 (to 04-01) + 30 + 31 = 78 days; 06-01 -> 12-31 is 30 + 31 + 31 + 30 + 31 + 30 (to 12-01) + 30 = 213 days.
    // Iron in thousandths of mg/L; copper and manganese are never measured, so never reach 0.3 / 0.05: left out.
    expect(byPool.get(P.P1)).toEqual({
      poolId: P.P1,
      start: Date.parse("2025-01-01T10:00:00Z"),
      gapsMs: [59 * day, 7 * day, 7 * day, 78 * day, 213 * day],
      iron: [50, 400, 150, 50, 300, 50],
    });
    // P5: only its two copper tests carry a metal (the pH-only visits are not metal readings); 02-01 -> 02-15 = 14 days.
    expect(byPool.get(P.P5)).toEqual({ poolId: P.P5, start: Date.parse("2025-02-01T10:00:00Z"), gapsMs: [14 * day], copper: [500, 50] });
    // Metal readings: P1 6 + P2 4 + P3 3 + P5 2 = 15 rows, each once.
    expect(body.readings.reduce((n: number, r: Body) => n + r.gapsMs.length + 1, 0)).toBe(15);
    // Treatments: Seq A at P1 on 03-01, Seq A then Pad B at P2 on 03-08 (same minute: gap 0), times in whole minutes.
    expect(body.products).toEqual([
      { productName: "Seq A", category: "sequestrant" },
      { productName: "Pad B", category: "metal-collector-pad" },
    ]);
    expect(body.treatments).toEqual([
      { poolId: P.P1, startMinute: Date.parse("2025-03-01T10:00:00Z") / 60_000, gapsMinutes: [], product: [0] },
      { poolId: P.P2, startMinute: Date.parse("2025-03-08T10:00:00Z") / 60_000, gapsMinutes: [0], product: [0, 1] },
    ]);
    // Iron elevated at 0.3: P3's 0.25 no longer reaches it; P1 6 + P2 4 + P5 2 = 12 readings.
    const stricter = await get(recurringApi.loader, owner, "/api/analytics/recurring?include=readings&ironElevated=0.3");
    expect(stricter.body.pools.map((p: Body) => p.poolId).sort()).toEqual([P.P1, P.P2, P.P5].sort());
    expect(stricter.body.readings.reduce((n: number, r: Body) => n + r.gapsMs.length + 1, 0)).toBe(12);
  });

  it("leaves out a metal a pool never reaches at the lowest elevated level asked, keeping every reading's time", async () => {
    // Iron elevated 0.36 (and clear 0.1): only P1 (0.40) reaches it; copper 0.3 is still reached by P5 (0.50).
    // P2 (0.35) and P3 (0.25) are no longer candidates.
    const { body } = await get(recurringApi.loader, owner, "/api/analytics/recurring?include=readings&ironElevated=0.36");
    expect(body.readings.map((r: Body) => r.poolId).sort()).toEqual([P.P1, P.P5].sort());
    // Copper elevated 0.6: P5's 0.50 does not reach it, no pool reaches copper; iron 0.2 keeps P1, P2, P3.
    const copperHigh = await get(recurringApi.loader, owner, "/api/analytics/recurring?include=readings&copperElevated=0.6");
    expect(copperHigh.body.readings.map((r: Body) => r.poolId).sort()).toEqual([P.P1, P.P2, P.P3].sort());
    expect(copperHigh.body.readings.every((r: Body) => !("copper" in r))).toBe(true);
  });

  it("gives the page's first paint only the first pools listed at the company's levels, with the counts of the whole list", async () => {
    // Listed at the default levels: P1 (recurring, chronic) and P3 (chronic); P2 and P5 have one 14-day episode each.
    const body = await getOk(recurringPage.loader, analyst, "/recurring");
    expect(body.data.firstListed).toEqual({ recurringPools: 1, chronicPools: 2, listedPools: 2 });
    expect(body.data.readings.map((r: Body) => r.poolId)).toEqual([P.P1, P.P3]);
    // P3: 01-01 -> 03-20 is 31 + 28 + 19 = 78 days; 03-20 -> 12-31 is 12 (to 04-01) + 244 (April to November) + 30 = 286 days.
    expect(body.data.readings[1]).toEqual({
      poolId: P.P3,
      start: Date.parse("2025-01-01T10:00:00Z"),
      gapsMs: [78 * 86_400_000, 286 * 86_400_000],
      iron: [50, 250, 150],
    });
    // Only P1's treatment: P2 is not listed.
    expect(body.data.treatments.map((t: Body) => t.poolId)).toEqual([P.P1]);
  });
});

describe("GET /api/analytics/pools/:poolId/series", () => {
  it("gives the analyte over time with the pool's episodes and treatments", async () => {
    const { body } = await get(seriesApi.loader, owner, `/api/analytics/pools/${P.P1}/series?analyte=iron`, { poolId: String(P.P1) });
    expect(body.points.map((p: Body) => p.value)).toEqual([0.05, 0.4, 0.15, 0.05, 0.3, 0.05]);
    expect(body.levels).toEqual({ elevated: 0.2, clear: 0.1 });
    expect(body.episodes).toHaveLength(2);
    expect(body.treatments).toHaveLength(1);
    expect(body.unit).toBe("mg/L");
  });

  it("computes the saturation index per test", async () => {
    const { body } = await get(seriesApi.loader, owner, `/api/analytics/pools/${P.P1}/series?analyte=saturationIndex`, { poolId: String(P.P1) });
    // 10 NYCRR 6-1.30 worked example: 68 degF, hardness 140, alkalinity 20, pH 7.8 -> -0.8 (tolerance 0.05).
    expect(body.points).toHaveLength(1);
    expect(body.points[0].value).toBeCloseTo(-0.8, 1);
  });

  it("answers 404 for a pool on another route or of another company", async () => {
    expect((await get(seriesApi.loader, technician, `/api/analytics/pools/${P.P3}/series`, { poolId: String(P.P3) })).status).toBe(404);
    expect((await get(seriesApi.loader, otherOwner, `/api/analytics/pools/${P.P1}/series`, { poolId: String(P.P1) })).status).toBe(404);
    expect((await get(seriesApi.loader, technician, `/api/analytics/pools/${P.P1}/series`, { poolId: String(P.P1) })).status).toBe(200);
  });
});

describe("GET /api/analytics/alerts", () => {
  it("flags the well where three pools opened iron within 21 days", async () => {
    const { body } = await get(alertsApi.loader, manager, "/api/analytics/alerts");
    // Well one: openings P1 03-01, P2 03-08, P3 03-20 (19 days): 3 pools >= max(3, ceil(0.25 x 3)).
    // P1's 06-01 opening stands alone. Town main: one copper opening only.
    expect(body.alerts).toHaveLength(1);
    expect(body.alerts[0]).toMatchObject({
      fillSourceId: book.source.S1,
      sourceName: "Well one",
      metal: "iron",
      firstOpeningAt: "2025-03-01T10:00:00.000Z",
      lastOpeningAt: "2025-03-20T10:00:00.000Z",
      poolCount: 3,
      activePools: 3,
      poolsRequired: 3,
      poolsOutsideScope: 0,
    });
  });

  it("tells a technician which of their pools share the flagged source, and only counts the others", async () => {
    const { body } = await get(alertsApi.loader, technician, "/api/analytics/alerts");
    expect(body.alerts).toHaveLength(1);
    expect(body.alerts[0].pools.map((p: Body) => p.poolId).sort()).toEqual([P.P1, P.P2].sort());
    expect(body.alerts[0].poolsOutsideScope).toBe(1); // P3 is on route two
    expect(JSON.stringify(body)).not.toContain("3 Birch Way");
  });

  it("shows another company nothing of this one", async () => {
    const { body } = await get(alertsApi.loader, otherOwner, "/api/analytics/alerts");
    // Their well has one pool: one pool is below the 3-pool rule.
    expect(body.alerts).toEqual([]);
  });
});

describe("GET /api/analytics/sources", () => {
  it("gives a technician the sources of their pools, their pools' metal state and the flag", async () => {
    const { body } = await get(sourcesApi.loader, technician, "/api/analytics/sources");
    expect(body.sources.map((s: Body) => s.name)).toEqual(["Well one", "Town main"]); // flagged first
    const well = body.sources[0];
    expect(well.flagged).toBe(true);
    expect(well.activePools).toBe(3);
    expect(well.pools.map((p: Body) => p.street)).toEqual(["1 Alder Way", "2 Alder Way"]);
    // P1's last iron reading (12-31, 0.05) is clear; P2's 03-22 reading closed its episode.
    expect(well.pools[0].metals.iron.state).toBe("clear");
    expect(body.flaggedPoolsInScope).toBe(2);
    const main = body.sources[1];
    expect(main.pools.map((p: Body) => p.street)).toEqual(["5 Alder Way"]);
    expect(main.pools[0].metals.copper.state).toBe("clear");
    expect(main.pools[0].metals.iron.state).toBe("not-tested");
  });

  it("shows the owner P3's open iron episode", async () => {
    const { body } = await get(sourcesApi.loader, owner, "/api/analytics/sources");
    const well = body.sources.find((s: Body) => s.name === "Well one");
    const p3 = well.pools.find((p: Body) => p.poolId === P.P3);
    expect(p3.metals.iron.state).toBe("open"); // 0.25 on 03-20, then 0.15 (not below 0.1)
  });
});

describe("GET /api/analytics/summary", () => {
  it("counts the route book, open episodes and the balance of each pool's latest test", async () => {
    const { body } = await get(summaryApi.loader, owner, "/api/analytics/summary");
    // Tests: P1 6 + P2 5 + P3 3 + P4 2 + P5 4 = 20; with a metal: 6 + 4 + 3 + 2 + 2 = 17.
    expect(body.counts).toEqual({ activePools: 5, routes: 2, fillSources: 2, tests: 20, metalTests: 17, poolsTested: 5 });
    expect(body.openEpisodes).toEqual({ copper: 0, iron: 1, manganese: 0 }); // P3
    expect(body.recurringPools).toBe(1);
    expect(body.chronicPools).toBe(2);
    // No group is risky here: the largest, Well one on iron, reaches a ratio lower bound of only 0.44 (see the groups test).
    expect(body.riskyGroups).toEqual([]);
    // Saturation index, 10 NYCRR 6-1.30 factor table (balanced within +/-0.3, common practice):
    // P1 68 degF, CH 140, TA 20, pH 7.8 -> -0.8 corrosive (the code's worked example);
    // P2, P3 84 degF (TF 0.7), CH 300 (2.1), TA 100 (2.0), pH 7.5 -> +0.2 balanced;
    // P4 84 degF, CH 400 (2.2), TA 150 (2.2), pH 8.0 -> +1.0 scale-forming. P5 has no balance test.
    expect(body.balance.corrosive).toEqual({ pools: 1, share: 0.25 });
    expect(body.balance.balanced).toEqual({ pools: 2, share: 0.5 });
    expect(body.balance.scaleForming).toEqual({ pools: 1, share: 0.25 });
    expect(body.balance.poolsWithoutBalanceTest).toBe(1);
  });

  it("limits the figures to the date window", async () => {
    // Only March: P1 03-01, 03-08, 03-15; P2 03-08, 03-13, 03-22; P3 03-20 = 7 tests.
    const { body } = await get(summaryApi.loader, owner, "/api/analytics/summary?from=2025-03-01&to=2025-03-31");
    expect(body.counts.tests).toBe(7);
    // Within March, P3's episode opens 03-20 and stays open; P1's and P2's close.
    expect(body.openEpisodes.iron).toBe(1);
  });
});

describe("GET /api/analytics/trend", () => {
  it("gives the monthly median and spread of each metal", async () => {
    const { body } = await get(trendApi.loader, owner, "/api/analytics/trend");
    const march = body.months.find((m: Body) => m.metal === "iron" && m.month === "2025-03");
    // March iron: 0.40, 0.15, 0.05 (P1), 0.35, 0.10, 0.05 (P2), 0.25 (P3); the other company's 0.90 and 0.95 left out.
    // Sorted 0.05 0.05 0.10 0.15 0.25 0.35 0.40: median 0.15; quartiles (linear, positions 1.5 and 4.5):
    // 0.05 + 0.5 x 0.05 = 0.075 and 0.25 + 0.5 x 0.10 = 0.30.
    expect(march.readings).toBe(7);
    expect(march.median).toBeCloseTo(0.15, 6);
    expect(march.p25).toBeCloseTo(0.075, 6);
    expect(march.p75).toBeCloseTo(0.3, 6);
    expect(march.max).toBeCloseTo(0.4, 6);
    // January copper: P4's "<0.05" only, counted as half the limit: 0.025.
    const january = body.months.find((m: Body) => m.metal === "copper" && m.month === "2025-01");
    expect(january.median).toBeCloseTo(0.025, 6);
  });

  it("gives the share of each month's readings at or above the elevated level, and on how many pools", async () => {
    const { body } = await get(trendApi.loader, owner, "/api/analytics/trend");
    const march = body.months.find((m: Body) => m.metal === "iron" && m.month === "2025-03");
    // Iron elevated at 0.2 (the default): 0.40 (P1), 0.35 (P2), 0.25 (P3) of the 7 March readings: 3 of 7 on 3 pools.
    expect(march).toMatchObject({ readings: 7, elevated: 3, poolsElevated: 3 });
    expect(march.elevatedShare).toBeCloseTo(3 / 7, 9);
    // A "<0.05" reading is below detection, never elevated.
    const january = body.months.find((m: Body) => m.metal === "copper" && m.month === "2025-01");
    expect(january).toMatchObject({ elevated: 0, elevatedShare: 0, poolsElevated: 0 });
    // A lower elevated level in the request counts more: iron at 0.1 adds P1's 0.15 and P2's 0.10 (5 of 7, still 3 pools).
    const lowered = (await get(trendApi.loader, owner, "/api/analytics/trend?metal=iron&ironElevated=0.1&ironClear=0.05")).body;
    expect(lowered.months.find((m: Body) => m.month === "2025-03")).toMatchObject({ readings: 7, elevated: 5, poolsElevated: 3 });
  });
});

describe("GET /api/analytics/outcomes", () => {
  it("follows each product's courses on iron: reduction, time to clear, recurrence, cost", async () => {
    const body = await getOk(outcomesApi.loader, manager, "/api/analytics/outcomes?metal=iron&arm=product");
    // Courses: P1 Seq A on 03-01; P2 Seq A + Pad B on 03-08 (same day: one course).
    expect(body.courses).toBe(2);
    expect(body.eligibleCourses).toBe(2);
    const seq = body.arms.find((a: Body) => a.label === "Seq A");
    const pad = body.arms.find((a: Body) => a.label === "Pad B");
    expect(seq.courses).toBe(2);
    expect(seq.pools).toBe(2);
    expect(seq.tooFewToCompare).toBe(true); // 2 pools < 5
    // First follow-up 3 to 10 days later: P1 03-08 0.15 from 0.40 = 62.5 %; P2 03-13 0.10 from 0.35 = 71.43 %.
    // Median of the two: (62.5 + 71.4286) / 2 = 66.96 %.
    expect(seq.reduction.count).toBe(2);
    expect(seq.reduction.median).toBeCloseTo((62.5 + (0.25 / 0.35) * 100) / 2, 6);
    // Both clear 14 days after (03-15 and 03-22): Kaplan-Meier falls from 1 to 0 at day 14, median 14.
    expect(seq.timeToClear.medianDays).toBe(14);
    // At day 14 the estimate is 0, so both bands are 0 and the median's limits are day 14 too.
    expect([seq.timeToClear.medianLower, seq.timeToClear.medianUpper]).toEqual([14, 14]);
    expect(seq.timeToClear.curve.map((p: Body) => [p.day, p.stillElevated])).toEqual([
      [0, 1],
      [14, 0],
    ]);
    // After clearing: P1 is elevated again on 06-01, 78 days after 03-15 (within 90): recurred.
    // P2 has no later iron reading: not followed long enough.
    expect(seq.recurrence).toMatchObject({ recurred: 1, followed: 1 });
    // Cost: P1 course 10, P2 course 10 + 25 = 35; 45 over 2 cleared pools = 22.50.
    expect(seq.totalCost).toBe(45);
    expect(seq.costPerClearedPool).toBe(22.5);
    expect(pad.courses).toBe(1);
    expect(pad.costPerClearedPool).toBe(35);
    // pH at treatment: P1 7.4 inside 7.2-7.6, P2 7.9 outside.
    expect(seq.byPh.inside.courses).toBe(1);
    expect(seq.byPh.outside.courses).toBe(1);
    expect(seq.byPh.inside.reduction.median).toBeCloseTo(62.5, 6);
  });

  it("puts a course under exactly one combination", async () => {
    const { body } = await get(outcomesApi.loader, owner, "/api/analytics/outcomes?metal=iron&arm=combination");
    expect(body.arms.map((a: Body) => [a.label, a.courses]).sort()).toEqual(
      [
        ["Seq A", 1],
        ["Pad B + Seq A", 1],
      ].sort(),
    );
  });

  it("finds no eligible course where the baseline was clear", async () => {
    // On copper none of the treated tests carried copper: no baseline.
    const { body } = await get(outcomesApi.loader, owner, "/api/analytics/outcomes?metal=copper");
    expect(body.eligibleCourses).toBe(0);
    expect(body.ineligible).toEqual({ "no-baseline": 2 });
    expect(body.arms).toEqual([]);
  });
});

describe("GET /api/analytics/pools/:poolId/evidence", () => {
  it("lists evidence for each episode, with its reason", async () => {
    const body = await getOk(evidenceApi.loader, technician, `/api/analytics/pools/${P.P1}/evidence`, { poolId: String(P.P1) });
    expect(body.episodes).toHaveLength(2);
    const [later, earlier] = body.episodes; // newest first
    // Both: iron on a shared well. The 03-01 onset also falls inside Well one's alert (03-01..03-20).
    expect(later.evidence.map((e: Body) => e.kind)).toEqual(["iron-with-well-water"]);
    expect(earlier.evidence.map((e: Body) => e.kind).sort()).toEqual(["iron-with-well-water", "shared-source-alert"]);
    expect(earlier.evidence.find((e: Body) => e.kind === "shared-source-alert").reason).toContain("3 pools");
  });

  it("is shown on the pool page with the same episodes", async () => {
    const body = await getOk(poolPage.loader, technician, `/pools/${P.P1}`, { poolId: String(P.P1) });
    expect(body.metalEvidence.episodes).toHaveLength(2);
    expect(body.metalEvidence.episodes[0].evidence.map((e: Body) => e.kind)).toEqual(["iron-with-well-water"]);
  });

  it("answers 404 for a technician's pool on another route", async () => {
    expect((await get(evidenceApi.loader, technician, `/api/analytics/pools/${P.P3}/evidence`, { poolId: String(P.P3) })).status).toBe(404);
  });
});
