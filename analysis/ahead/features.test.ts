import { describe, expect, it } from "vitest";
import { DAY_MS, type MetalTest } from "../metals/episodes";
import { DEFAULT_METAL_THRESHOLDS } from "../metals/reading";
import { FEATURES, featureRow, prepareHistory, type AheadHistory } from "./features";
import { metalOutlook, weeklyInstants } from "./outlook";
import { reasonText, topReasons } from "./reasons";

// Elevated and clear levels are common practice (no published source):
// iron elevated 0.2, clear 0.1; copper elevated 0.3, clear 0.1.
const day = (n: number) => Date.UTC(2025, 0, 1) + n * DAY_MS;
const iron = (value: number) => ({ value, belowDetection: false });
const copper = iron;

function test(id: number, poolId: string, at: number, readings: Partial<MetalTest> = {}): MetalTest {
  return { id: String(id), poolId, takenAt: at, copper: null, iron: null, manganese: null, ...readings };
}

function history(tests: MetalTest[], extra: Partial<AheadHistory> = {}): AheadHistory {
  return {
    asOf: day(200),
    tests,
    balance: [],
    copperAlgaecide: [],
    fillWaterTests: [],
    pools: [
      { poolId: "a", fillSourceId: "well", equipment: [{ id: "h", kind: "heater", exchangerMetal: "copper", installedAt: day(-15 * 365.25), removedAt: null }] },
      { poolId: "b", fillSourceId: "well", equipment: [] },
      { poolId: "c", fillSourceId: "well", equipment: [] },
    ],
    thresholds: DEFAULT_METAL_THRESHOLDS,
    balanceBand: { low: -0.3, high: 0.3 },
    ...extra,
  };
}

const value = (row: { values: number[] }, name: (typeof FEATURES)[number]) => row.values[FEATURES.indexOf(name)]!;

// Pool a: iron 0.1 on day 0, 0.25 on day 30 (opens), 0.05 on day 40 (closes), 0.15 on day 60, then weekly plain tests.
// Pool b: iron opens on day 50 and day 58 is still open; pool c: opens on day 55.
const tests: MetalTest[] = [
  test(1, "a", day(0), { iron: iron(0.1) }),
  test(2, "a", day(30), { iron: iron(0.25) }),
  test(3, "a", day(40), { iron: iron(0.05) }),
  test(4, "a", day(60), { iron: iron(0.15), copper: copper(0.12) }),
  test(5, "a", day(80), { iron: iron(0.22) }),
  ...Array.from({ length: 18 }, (_, i) => test(100 + i, "a", day(81 + 7 * i))),
  test(6, "b", day(0), { iron: iron(0.05) }),
  test(7, "b", day(50), { iron: iron(0.3) }),
  test(8, "b", day(58)),
  test(9, "c", day(10), { iron: iron(0.05) }),
  test(10, "c", day(55), { iron: iron(0.21) }),
  test(11, "c", day(60)),
];

describe("featureRow", () => {
  const prepared = prepareHistory(history(tests), ["copper", "iron", "manganese"]);

  it("reads the latest reading against the elevated level, the previous one and the episodes before the instant", () => {
    const row = featureRow(prepared, "a", "iron", day(61))!;
    // 0.15 / 0.2 = 0.75; rise (0.15 - 0.05) / 0.2 = 0.5
    expect(value(row, "latestReading")).toBeCloseTo(0.75, 12);
    expect(value(row, "readingRise")).toBeCloseTo(0.5, 12);
    // One opening (day 30): ln(1 + 1); closed on day 40, 21 days before: exp(-21 / 90)
    expect(value(row, "pastEpisodes")).toBeCloseTo(Math.log(2), 12);
    expect(value(row, "recentEpisode")).toBeCloseTo(Math.exp(-21 / 90), 12);
    expect(row.episodeOpen).toBe(false);
  });

  it("labels the row by an opening within the next 28 days", () => {
    // Day 80's 0.22 opens an episode: 19 days after day 61, inside the horizon.
    expect(featureRow(prepared, "a", "iron", day(61))!.outcome).toBe(1);
    // From day 45 the next opening (day 80) is 35 days away.
    expect(featureRow(prepared, "a", "iron", day(45))!.outcome).toBe(0);
    // Day 190: the horizon runs past asOf (day 200), so the outcome is not known yet.
    expect(featureRow(prepared, "a", "iron", day(190))!.outcome).toBeNull();
  });

  it("counts openings of other pools on the same source in the past 28 days, never the pool's own", () => {
    // At day 60: b opened on day 50 and c on day 55; a's own opening on day 30 is older than 28 days anyway.
    expect(featureRow(prepared, "a", "iron", day(60))!.facts.waveOpenings).toBe(2);
    // For b at day 59: c (day 55) counts, a's day-30 opening is 29 days back, b's own (day 50) never counts.
    expect(featureRow(prepared, "b", "iron", day(59))!.facts.waveOpenings).toBe(1);
    // At day 58 a's opening is exactly 28 days back and still counts: c and a.
    expect(featureRow(prepared, "b", "iron", day(58))!.facts.waveOpenings).toBe(2);
  });

  it("marks a pool with an open episode, which the list leaves out", () => {
    expect(featureRow(prepared, "b", "iron", day(58))!.episodeOpen).toBe(true);
  });

  it("gives copper rows the copper-bearing exchanger's age and other metals none", () => {
    const copperRow = featureRow(prepared, "a", "copper", day(61))!;
    expect(copperRow.facts.exchanger?.metal).toBe("copper");
    // Installed 15 years (of 365.25 days) before day 0, 61 days on: 15.17 years, feature = age / 10.
    expect(value(copperRow, "exchangerAge")).toBeCloseTo((15 * 365.25 + 61) / 365.25 / 10, 6);
    expect(value(featureRow(prepared, "a", "iron", day(61))!, "exchangerAge")).toBe(0);
  });

  it("uses nothing after the instant", () => {
    const without = prepareHistory(history(tests.filter((t) => t.takenAt <= day(61))), ["copper", "iron", "manganese"]);
    expect(featureRow(without, "a", "iron", day(61))!.values).toEqual(featureRow(prepared, "a", "iron", day(61))!.values);
  });

  it("leaves out a pool not tested in the 35 days before the instant", () => {
    expect(featureRow(prepared, "b", "iron", day(58 + 36))).toBeNull();
    expect(featureRow(prepared, "a", "iron", day(-1))).toBeNull();
  });
});

describe("reasons", () => {
  const prepared = prepareHistory(history(tests), ["copper", "iron", "manganese"]);
  const row = featureRow(prepared, "a", "iron", day(60))!;

  it("puts the facts into words", () => {
    expect(reasonText("reading", row.facts, "iron", DEFAULT_METAL_THRESHOLDS, row.at)).toBe("Latest iron reading 0.15 mg/L, 75% of the elevated level, up from 0.05 mg/L");
    expect(reasonText("wave", row.facts, "iron", DEFAULT_METAL_THRESHOLDS, row.at)).toBe("2 other pools on the same fill source opened an iron episode in the past 4 weeks");
    expect(reasonText("history", row.facts, "iron", DEFAULT_METAL_THRESHOLDS, row.at)).toBe("1 earlier iron episode, the last closed 20 days ago");
  });

  it("keeps the three largest raising reasons that are present, summing the parts of one reason", () => {
    const parts = FEATURES.map((f) => ({ latestReading: 0.5, readingRise: 0.2, sourceWave: 0.6, pastEpisodes: 0.1, corrosiveWater: 2, seasonSin: 0.05, seasonCos: 0.3 })[f as string] ?? 0);
    const reasons = topReasons(parts, row.facts, "iron", DEFAULT_METAL_THRESHOLDS, row.at);
    // Corrosive water (2) is left out: no balance reading shows it. reading 0.5 + 0.2 = 0.7, wave 0.6, season 0.35.
    expect(reasons.map((r) => r.key)).toEqual(["reading", "wave", "season"]);
    expect(reasons[0]!.logOdds).toBeCloseTo(0.7, 12);
  });
});

describe("metalOutlook", () => {
  it("ranks by the latest reading and says why when the history is too short to test a model", async () => {
    const outlook = await metalOutlook(history(tests, { asOf: day(60) }));
    expect(outlook.method).toBe("latest-reading");
    expect(outlook.backtest).toBeNull();
    expect(outlook.methodNote).toMatch(/Too little history/);
    // At day 60: a iron 0.15 (0.75 of elevated) leads; b and c have open iron episodes and are left out.
    expect(outlook.entries[0]).toMatchObject({ poolId: "a", metal: "iron", probability: null, latestValue: 0.15, flagged: true });
    expect(outlook.entries.some((e) => e.metal === "iron" && (e.poolId === "b" || e.poolId === "c"))).toBe(false);
  });

  it("steps origins a week apart ending at asOf", () => {
    expect(weeklyInstants(day(21), day(0))).toEqual([day(0), day(7), day(14), day(21)]);
  });
});
