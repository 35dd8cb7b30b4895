import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { DAY_MS, analyseMetalHistory, type Episode, type MetalTest } from "../metals/episodes";
import { ageBucketLabel, exchangerMetalAt, heaterAgeBucketAt, heatersAt, utcDateNumber, wholeYearsBetween, type PoolProfile } from "../metals/route-book";
import { clopperPearsonInterval, poissonRateInterval, wilsonInterval } from "./intervals";
import {
  MS_PER_YEAR,
  compareGroups,
  groupComparison,
  groupComparisonFinder,
  groupObservations,
  riskyGroups,
  riskyGroupFinder,
  riskyGroupsByMetal,
  type GroupObservation,
  type GroupingKey,
} from "./groups";
import type { Metal } from "../metals/reading";

const T0 = Date.UTC(2023, 0, 1);
const day = (n: number) => T0 + n * DAY_MS;

function opening(poolId: string, at: number): Episode {
  return {
    poolId, metal: "iron", openedAt: at, openedByTestId: "x", closedAt: null, closedByTestId: null,
    censored: true, endAt: at, durationDays: 0, peak: 0.3, testCount: 1, chronic: false, recurrence: false,
  };
}

describe("heater age bucket at the date of a test", () => {
  const pool: PoolProfile = {
    poolId: "p",
    equipment: [
      { id: "old", kind: "heater", exchangerMetal: "copper", installedAt: Date.UTC(2010, 5, 15), removedAt: Date.UTC(2021, 2, 1) },
      { id: "new", kind: "heater", exchangerMetal: "titanium", installedAt: Date.UTC(2021, 2, 1), removedAt: null },
      { id: "pump", kind: "pump", installedAt: null },
    ],
  };
  it("ages the heater present on each date", () => {
    expect(heaterAgeBucketAt(pool, Date.UTC(2010, 0, 1))).toBe("none"); // before the first heater
    expect(heaterAgeBucketAt(pool, Date.UTC(2015, 5, 14))).toBe("0-4"); // 4 years, one day short of 5
    expect(heaterAgeBucketAt(pool, Date.UTC(2015, 5, 15))).toBe("5-9");
    expect(heaterAgeBucketAt(pool, Date.UTC(2020, 5, 15))).toBe("10-14");
    expect(heaterAgeBucketAt(pool, Date.UTC(2021, 2, 1))).toBe("0-4"); // replaced that day
    expect(heaterAgeBucketAt({ poolId: "q", equipment: [{ id: "h", kind: "heater", installedAt: Date.UTC(2000, 0, 1) }] }, Date.UTC(2024, 0, 1))).toBe("15+");
    expect(heaterAgeBucketAt({ poolId: "q", equipment: [{ id: "h", kind: "heat-pump", installedAt: null }] }, Date.UTC(2024, 0, 1))).toBe("unknown");
  });

  it("counts whole years on UTC calendar dates as the platform's Date does, leap days and years before 1970 included", () => {
    const fromDates = (from: number, to: number) => {
      const a = new Date(from);
      const b = new Date(to);
      const years = b.getUTCFullYear() - a.getUTCFullYear();
      const before = b.getUTCMonth() < a.getUTCMonth() || (b.getUTCMonth() === a.getUTCMonth() && b.getUTCDate() < a.getUTCDate());
      return before ? years - 1 : years;
    };
    // Leap-day birthdays: 2020-02-29 to 2021-02-28 is 0 whole years, to 2021-03-01 is 1.
    expect(wholeYearsBetween(Date.UTC(2020, 1, 29), Date.UTC(2021, 1, 28, 23))).toBe(0);
    expect(wholeYearsBetween(Date.UTC(2020, 1, 29), Date.UTC(2021, 2, 1))).toBe(1);
    expect(utcDateNumber(Date.UTC(1969, 11, 31, 23, 59))).toBe(19691231);
    const instant = fc.integer({ min: Date.UTC(1900, 0, 1), max: Date.UTC(2200, 0, 1) });
    fc.assert(
      fc.property(instant, instant, (from, to) => {
        const d = new Date(from);
        expect(utcDateNumber(from)).toBe(d.getUTCFullYear() * 10_000 + (d.getUTCMonth() + 1) * 100 + d.getUTCDate());
        expect(wholeYearsBetween(from, to)).toBe(fromDates(from, to));
      }),
      { numRuns: 5000 },
    );
    expect([0, 4, 5, 9, 10, 14, 15, 40].map((age) => ageBucketLabel(age))).toEqual(["0-4", "0-4", "5-9", "5-9", "10-14", "10-14", "15+", "15+"]);
    expect([0, 2, 3, 7].map((age) => ageBucketLabel(age, [3]))).toEqual(["0-2", "0-2", "3+", "3+"]);
    expect(ageBucketLabel(12, [])).toBe("0+");
  });

  it("reads the heaters present as a list of them would, for any equipment and date", () => {
    // The answers as read from heatersAt's list (oldest first, undated last): the definition the loops follow.
    const ageFromList = (pool: PoolProfile, at: number) => {
      const heaters = heatersAt(pool, at);
      if (heaters.length === 0) return "none";
      if (heaters.some((h) => h.installedAt === null)) return "unknown";
      return ageBucketLabel(wholeYearsBetween(heaters[0]!.installedAt!, at));
    };
    const metalFromList = (pool: PoolProfile, at: number) => {
      const heaters = heatersAt(pool, at);
      if (heaters.length === 0) return "no-heater";
      const metals = new Set(heaters.map((h) => h.exchangerMetal ?? "none-unknown"));
      return (["copper", "cupronickel", "titanium", "none-unknown"] as const).find((m) => metals.has(m)) ?? "none-unknown";
    };
    const item = fc.record({
      kind: fc.constantFrom("heater", "heat-pump", "pump", "ioniser") as fc.Arbitrary<"heater" | "heat-pump" | "pump" | "ioniser">,
      installed: fc.option(fc.integer({ min: -8000, max: 3000 })),
      removedAfter: fc.option(fc.nat(6000)),
      metal: fc.constantFrom("copper", "cupronickel", "titanium", "none-unknown", null) as fc.Arbitrary<"copper" | "cupronickel" | "titanium" | "none-unknown" | null>,
    });
    fc.assert(
      fc.property(fc.array(item, { maxLength: 4 }), fc.integer({ min: -8000, max: 6000 }), (items, d) => {
        const pool: PoolProfile = {
          poolId: "p",
          equipment: items.map((e, i) => ({
            id: `e${i}`,
            kind: e.kind,
            exchangerMetal: e.metal,
            installedAt: e.installed === null ? null : day(e.installed),
            removedAt: e.removedAfter === null ? null : day((e.installed ?? -8000) + e.removedAfter),
          })),
        };
        expect(heaterAgeBucketAt(pool, day(d))).toBe(ageFromList(pool, day(d)));
        expect(exchangerMetalAt(pool, day(d))).toBe(metalFromList(pool, day(d)));
      }),
      { numRuns: 2000 },
    );
  });

  it("splits observed time by the bucket at each test", () => {
    // Tests on 2020-06-01, 2020-06-15 (the old heater turns 10), 2020-07-01.
    const tests = [Date.UTC(2020, 5, 1), Date.UTC(2020, 5, 15), Date.UTC(2020, 6, 1)].map((takenAt) => ({ poolId: "p", takenAt }));
    const obs = groupObservations([pool], tests, [opening("p", Date.UTC(2020, 5, 15))], "heater-age");
    const byGroup = Object.fromEntries(obs.map((o) => [o.group, o]));
    expect(byGroup["5-9"]!.years).toBeCloseTo((14 * DAY_MS) / MS_PER_YEAR, 12);
    expect(byGroup["10-14"]!.years).toBeCloseTo((16 * DAY_MS) / MS_PER_YEAR, 12);
    expect(byGroup["10-14"]!.openings).toBe(1);
    expect(byGroup["5-9"]!.openings).toBe(0);
    const metals = groupObservations([pool], tests, [], "exchanger-metal");
    expect(metals.map((o) => o.group)).toEqual(["copper"]);
  });
});

describe("group comparison", () => {
  it("a well whose three pools all had episodes against a clean municipal supply", () => {
    // 3 well pools, 2 openings each, 1 year each; 3 city pools, no openings, 1 year each.
    // Well: rate 6 / 3 = 2 per pool-year; share 3/3; rest has 0 events -> ratio infinite.
    // Conditional exact lower bound: p = Clopper-Pearson lower for 6/6 = 0.025^(1/6),
    // ratio = p / (1 - p) x (3 / 3) = 1.597 > 1 -> risky with 3 pools.
    const obs: GroupObservation[] = [
      ...["w1", "w2", "w3"].map((poolId) => ({ group: "well", poolId, years: 1, openings: 2 })),
      ...["c1", "c2", "c3"].map((poolId) => ({ group: "city", poolId, years: 1, openings: 0 })),
    ];
    const [city, well] = compareGroups(obs);
    const p = clopperPearsonInterval(6, 6).lower;
    expect(p).toBeCloseTo(0.025 ** (1 / 6), 10);
    expect(well).toMatchObject({ group: "well", pools: 3, poolsWithEpisode: 3, openings: 6, risky: true, tooSmallToJudge: false });
    expect(well!.rate).toEqual(poissonRateInterval(6, 3));
    expect(well!.shareWithEpisode).toEqual(wilsonInterval(3, 3));
    expect(well!.rateRatio.lower).toBeCloseTo(p / (1 - p), 10);
    expect(well!.rateRatio.estimate).toBe(Infinity);
    expect(city).toMatchObject({ risky: false, openings: 0 });
    expect(city!.rateRatio.estimate).toBe(0);
  });

  it("two pools are too small to judge even with a high ratio; minimum is a setting", () => {
    const obs: GroupObservation[] = [
      { group: "well", poolId: "w1", years: 1, openings: 5 },
      { group: "well", poolId: "w2", years: 1, openings: 5 },
      ...Array.from({ length: 10 }, (_, i) => ({ group: "city", poolId: `c${i}`, years: 1, openings: 0 })),
    ];
    const well = compareGroups(obs).find((g) => g.group === "well")!;
    expect(well.tooSmallToJudge).toBe(true);
    expect(well.risky).toBe(false);
    expect(well.rateRatio.lower).toBeGreaterThan(1);
    expect(compareGroups(obs, { minPools: 2 }).find((g) => g.group === "well")!.risky).toBe(true);
  });

  it("end to end from tests: openings and observed time add up", () => {
    const pools: PoolProfile[] = [
      { poolId: "a", fillSourceId: "well", routeId: "mon" },
      { poolId: "b", fillSourceId: "well", routeId: "tue" },
      { poolId: "c", fillSourceId: null, routeId: "tue" },
    ];
    const tests: MetalTest[] = [
      { id: "1", poolId: "a", takenAt: day(0), iron: { value: 0.4, belowDetection: false } },
      { id: "2", poolId: "a", takenAt: day(30), iron: { value: 0.05, belowDetection: false } },
      { id: "3", poolId: "a", takenAt: day(100), iron: { value: 0.3, belowDetection: false } },
      { id: "4", poolId: "b", takenAt: day(0) },
      { id: "5", poolId: "b", takenAt: day(365) },
      { id: "6", poolId: "c", takenAt: day(10) },
    ];
    const history = analyseMetalHistory(tests);
    const bySource = groupComparison(pools, tests, history.episodes, "fill-source");
    // well: a observed 100 days with 2 openings, b 365 days with none; c has one test -> 0 years, "unknown".
    expect(bySource.map((g) => [g.group, g.pools, g.openings, g.poolsWithEpisode])).toEqual([
      ["unknown", 1, 0, 0],
      ["well", 2, 2, 1],
    ]);
    expect(bySource[1]!.poolYears).toBeCloseTo((465 * DAY_MS) / MS_PER_YEAR, 12);
    expect(groupComparison(pools, tests, history.episodes, "fill-source", { metal: "copper" })[1]!.openings).toBe(0);
  });

  it("every key partitions the observed time and the openings", () => {
    const equipment = fc.array(
      fc.record({
        id: fc.string(),
        kind: fc.constantFrom("heater" as const, "heat-pump" as const, "pump" as const),
        exchangerMetal: fc.constantFrom("copper" as const, "cupronickel" as const, "titanium" as const, null),
        installedAt: fc.option(fc.integer({ min: -4000, max: 600 }).map(day), { nil: null }),
        removedAt: fc.option(fc.integer({ min: 0, max: 900 }).map(day), { nil: null }),
      }),
      { maxLength: 3 },
    );
    const scenario = fc.record({
      pools: fc.array(fc.record({ route: fc.constantFrom("r1", "r2", null), equipment }), { minLength: 1, maxLength: 6 }),
      tests: fc.array(fc.record({ pool: fc.nat(5), d: fc.integer({ min: 0, max: 800 }), iron: fc.integer({ min: 0, max: 40 }) }), { maxLength: 80 }),
    });
    fc.assert(
      fc.property(scenario, fc.constantFrom("heater-age" as const, "exchanger-metal" as const, "route" as const), (s, key) => {
        const pools: PoolProfile[] = s.pools.map((p, i) => ({ poolId: `p${i}`, routeId: p.route, equipment: p.equipment }));
        const tests: MetalTest[] = s.tests
          .filter((t) => t.pool < pools.length)
          .map((t, i) => ({ id: `t${i}`, poolId: `p${t.pool}`, takenAt: day(t.d) + i, iron: { value: t.iron / 100, belowDetection: false } }));
        const history = analyseMetalHistory(tests);
        const stats = groupComparison(pools, tests, history.episodes, key);
        const observedYears = history.pools.reduce((sum, p) => sum + (p.lastTestAt - p.firstTestAt) / MS_PER_YEAR, 0);
        expect(stats.reduce((sum, g) => sum + g.poolYears, 0)).toBeCloseTo(observedYears, 9);
        expect(stats.reduce((sum, g) => sum + g.openings, 0)).toBe(history.episodes.length);
        for (const g of stats) {
          if (g.poolYears > 0) {
            expect(g.rate.lower).toBeLessThanOrEqual(g.rate.estimate + 1e-12);
            expect(g.rate.upper).toBeGreaterThanOrEqual(g.rate.estimate);
          }
        }
      }),
    );
  });
});

describe("risky groups alone", () => {
  const observations = fc.array(
    fc.record({
      group: fc.constantFrom("a", "b", "c", "d", "e"),
      poolId: fc.constantFrom("1", "2", "3", "4", "5", "6", "7", "8"),
      years: fc.double({ min: 0, max: 5, noNaN: true }),
      openings: fc.nat(6),
    }),
    { maxLength: 40 },
  );

  it("are the groups the full comparison flags risky, with the same figures", () => {
    fc.assert(
      fc.property(observations, fc.constantFrom(1, 2, 3), (obs: GroupObservation[], minPools) => {
        expect(riskyGroups(obs, { minPools })).toEqual(compareGroups(obs, { minPools }).filter((g) => g.risky));
      }),
      { numRuns: 500 },
    );
  });

  it("include a group whose rest has no openings at all", () => {
    const obs: GroupObservation[] = ["1", "2", "3"].map((poolId) => ({ group: "well", poolId, years: 1, openings: 4 }));
    obs.push({ group: "town", poolId: "9", years: 10, openings: 0 }, { group: "town", poolId: "8", years: 10, openings: 0 });
    expect(riskyGroups(obs).map((g) => g.group)).toEqual(
      compareGroups(obs)
        .filter((g) => g.risky)
        .map((g) => g.group),
    );
    expect(riskyGroups(obs).map((g) => g.group)).toEqual(["well"]);
  });
});

describe("groups worked out cell by cell without observation objects", () => {
  const world = fc.record({
    pools: fc.array(
      fc.record({
        source: fc.constantFrom("s1", "s2", "s3", undefined),
        route: fc.constantFrom("r1", "r2"),
        heater: fc.option(fc.record({ installed: fc.integer({ min: -6000, max: 2000 }), removedAfter: fc.option(fc.nat(3000)), metal: fc.constantFrom("copper", "titanium", null) })),
        instants: fc.array(fc.nat(4000), { maxLength: 5 }),
      }),
      { minLength: 1, maxLength: 30 },
    ),
    episodes: fc.array(fc.record({ pool: fc.nat(40), metal: fc.constantFrom<Metal>("copper", "iron", "manganese"), d: fc.nat(4000) }), { maxLength: 60 }),
    minPools: fc.constantFrom(1, 2, 3),
    key: fc.constantFrom<GroupingKey>("fill-source", "route", "heater-age", "exchanger-metal"),
  });

  it("flags the same groups with the same figures, to the last digit, as the observations", () => {
    fc.assert(
      fc.property(world, (w) => {
        const pools: PoolProfile[] = w.pools.map((p, i) => ({
          poolId: `p${i}`,
          fillSourceId: p.source,
          routeId: p.route,
          equipment: p.heater
            ? [
                {
                  id: `h${i}`,
                  kind: "heater",
                  exchangerMetal: p.heater.metal,
                  installedAt: day(p.heater.installed),
                  removedAt: p.heater.removedAfter === null ? null : day(p.heater.installed + p.heater.removedAfter),
                },
              ]
            : [],
        }));
        // Some pools have no observed time and some episodes name pools that do not exist.
        const observed = w.pools.map((p, i) => ({ poolId: `p${i}`, instants: p.instants.map((d) => day(d) + i) }));
        const episodes = w.episodes.map((e) => ({ ...opening(`p${e.pool}`, day(e.d)), metal: e.metal }));
        const tests = observed.flatMap((o) => o.instants.map((takenAt) => ({ poolId: o.poolId, takenAt })));
        const metals = [null, "copper", "iron"] as const;
        const fast = riskyGroupsByMetal(pools, observed, episodes, w.key, metals, { minPools: w.minPools });
        // One finder asked for every dimension in turn, as the summary asks it: fixed dimensions share their cells.
        const finder = riskyGroupFinder(pools, episodes, metals, { minPools: w.minPools });
        const everyKey = (["fill-source", "heater-age", "route", "exchanger-metal", "surface"] as const).map((key) => [key, finder(key, observed)] as const);
        const compareAll = groupComparisonFinder(pools, episodes, metals, { minPools: w.minPools }, "every");
        for (const metal of metals) {
          const observations = groupObservations(pools, tests, episodes, w.key, { metal: metal ?? undefined, rules: { minPools: w.minPools } });
          expect(fast.get(metal)).toEqual(riskyGroups(observations, { minPools: w.minPools }));
          for (const [key, found] of everyKey) {
            const ofKey = groupObservations(pools, tests, episodes, key, { metal: metal ?? undefined, rules: { minPools: w.minPools } });
            expect(found.get(metal)).toEqual(riskyGroups(ofKey, { minPools: w.minPools }));
            // Every group, and what they were compared over, as the groups answer gives them.
            expect(compareAll(key, observed).get(metal)).toEqual({
              groups: compareGroups(ofKey, { minPools: w.minPools }),
              pools: new Set(ofKey.map((o) => o.poolId)).size,
              poolYears: ofKey.reduce((sum, o) => sum + o.years, 0),
              openings: ofKey.reduce((sum, o) => sum + o.openings, 0),
            });
          }
        }
      }),
      { numRuns: 1000 },
    );
  });
});
