import { describe, expect, it } from "vitest";
import { DEFAULT_METAL_THRESHOLDS } from "@analysis/metals/reading";
import {
  balanceReading,
  groupReading,
  indexReading,
  listWords,
  metalHistoryReading,
  openEpisodesReading,
  phReading,
  poolEpisodesReading,
  recurringPoolReading,
  reductionReading,
  sourceTestReading,
  timeToClearReading,
  worstMonthReading,
} from "./chart-readings";

// Levels used below (common practice, app default): copper elevated 0.3 / clear 0.1, iron 0.2 / 0.1, manganese 0.05 / 0.02.
const levels = DEFAULT_METAL_THRESHOLDS;
const at = (iso: string) => new Date(`${iso}T12:00:00Z`);

describe("listWords", () => {
  it("joins one, two and three words as a sentence does", () => {
    expect(listWords([])).toBe("");
    expect(listWords(["iron"])).toBe("iron");
    expect(listWords(["copper", "iron"])).toBe("copper and iron");
    expect(listWords(["copper", "iron", "manganese"])).toBe("copper, iron and manganese");
  });
});

describe("open episodes reading", () => {
  it("names the metal open on the most pools out of the total", () => {
    expect(openEpisodesReading({ copper: 1, iron: 5, manganese: 3 })).toBe("Most open: iron, 5 of 9 open episodes.");
  });
  it("names every metal of a tie", () => {
    expect(openEpisodesReading({ copper: 3, iron: 3, manganese: 0 })).toBe("Most open: copper and iron, 3 each of 6 open episodes.");
  });
  it("says when nothing is open", () => {
    expect(openEpisodesReading({ copper: 0, iron: 0, manganese: 0 })).toBe("No pool has an open episode.");
  });
});

describe("balance reading", () => {
  it("gives the balanced count and how the rest lean, as whole percents of the pools judged", () => {
    // 7 + 4 + 1 = 12 pools; 7/12 = 58.3 %, 4/12 = 33.3 %, 1/12 = 8.3 %.
    expect(balanceReading({ balanced: { pools: 7 }, corrosive: { pools: 4 }, scaleForming: { pools: 1 } })).toBe(
      "7 of 12 pools (58%) were balanced at their latest full test; 4 corrosive (33%), 1 scale-forming (8%).",
    );
  });
  it("says what is missing when no pool could be judged", () => {
    expect(balanceReading({ balanced: { pools: 0 }, corrosive: { pools: 0 }, scaleForming: { pools: 0 } })).toMatch(/^No pool has a test with pH/);
  });
});

describe("worst month reading", () => {
  const month = { metal: "iron" as const, month: "2025-07", readings: 40, elevated: 10, elevatedShare: 0.25, poolsElevated: 8 };
  it("picks the month and metal with the largest share elevated", () => {
    const other = { ...month, metal: "copper" as const, month: "2025-08", elevated: 2, elevatedShare: 0.05, poolsElevated: 1 };
    expect(worstMonthReading([other, month])).toBe("Worst month: iron in 2025-07, 25% of 40 tests at or above the elevated level, on 8 pools.");
  });
  it("keeps a small share from reading as 0 % and counts one pool in the singular", () => {
    // 1 of 40 = 2.5 %.
    expect(worstMonthReading([{ ...month, elevated: 1, elevatedShare: 0.025, poolsElevated: 1 }])).toBe(
      "Worst month: iron in 2025-07, 2.5% of 40 tests at or above the elevated level, on 1 pool.",
    );
  });
  it("is null when no month had an elevated test", () => {
    expect(worstMonthReading([{ ...month, elevated: 0, elevatedShare: 0, poolsElevated: 0 }])).toBeNull();
  });
});

describe("group reading", () => {
  const group = (label: string, estimate: number | null, lower: number | null, risky = true) => ({
    label,
    risky,
    tooSmallToJudge: false,
    rateRatio: { estimate, lower, upper: null },
  });
  it("names the risky group with the highest lower bound", () => {
    expect(groupReading([group("North well", 6, 1.2), group("Shared well", 4.7, 2.9), group("Town main", 0.8, 0.4, false)])).toBe(
      "Shared well: 4.7 times the rest of the route book's rate (at least 2.9 times, 95%).",
    );
  });
  it("says 'at least' alone when the rest had no opening", () => {
    expect(groupReading([group("Shared well", null, 3.1)])).toBe(
      "Shared well: at least 3.1 times the rest of the route book's rate (95%); the rest had no opening to compare with.",
    );
  });
  it("says no group stands apart when none is risky", () => {
    expect(groupReading([group("Town main", 1.1, 0.6, false)])).toMatch(/^No group stands apart/);
  });
});

describe("time to clear reading", () => {
  const arm = (label: string, median: number | null, lower: number | null, upper: number | null, tooFew = false) => ({
    label,
    tooFewToCompare: tooFew,
    timeToClear: { medianDays: median, medianLower: lower, medianUpper: upper },
  });
  it("names the soonest median and warns when the next interval overlaps", () => {
    // Pads 9 (6 to 14) against sequestrant 15 (11 to 20): 14 >= 11, so they overlap.
    expect(timeToClearReading([arm("Sequestrant", 15, 11, 20), arm("Pads", 9, 6, 14)], 60)).toBe(
      "Soonest to clear: Pads, half its courses clear by day 9 (95%: 6 to 14 days); next: Sequestrant, day 15. The intervals overlap, so the gap may be chance.",
    );
  });
  it("states the gap plainly when the intervals are apart", () => {
    expect(timeToClearReading([arm("Sequestrant", 30, 22, 41), arm("Pads", 9, 6, 14)], 60)).toBe(
      "Soonest to clear: Pads, half its courses clear by day 9 (95%: 6 to 14 days); next: Sequestrant, day 30.",
    );
  });
  it("names every treatment of a tie rather than calling one the soonest", () => {
    expect(timeToClearReading([arm("Pads", 7, 5, 14), arm("Sequestrant", 7, 7, 14), arm("Shock", 20, 15, 30)], 60)).toBe(
      "Tied soonest to clear, half their courses clear by day 7: Pads and Sequestrant.",
    );
    // 6.6 and 7.2 days both print as day 7.
    expect(timeToClearReading([arm("Sequestrant", 7.2, 7, 14), arm("Pads", 6.6, 5, 14)], 60)).toBe(
      "Tied soonest to clear, half their courses clear by day 7: Pads and Sequestrant.",
    );
  });
  it("leaves out treatments with too few pools and says when one alone is left", () => {
    expect(timeToClearReading([arm("Pads", 9, 6, null), arm("Tiny trial", 2, 1, 3, true)], 60)).toBe(
      "Soonest to clear: Pads, half its courses clear by day 9 (95%: 6 days or more); the only treatment with enough pools to compare.",
    );
  });
  it("says when a compared treatment never cleared half its courses", () => {
    expect(timeToClearReading([arm("Pads", 9, 6, 14), arm("Sequestrant", null, 20, null)], 60)).toBe(
      "Soonest to clear: Pads, half its courses clear by day 9 (95%: 6 to 14 days); next: Sequestrant, not half within 60 days.",
    );
    expect(timeToClearReading([arm("Sequestrant", null, null, null)], 60)).toBe("No treatment with enough pools cleared half its courses within 60 days.");
  });
  it("refuses to rank when every treatment is too small, and says when nothing was treated", () => {
    expect(timeToClearReading([arm("Tiny trial", 2, 1, 3, true)], 60)).toMatch(/^Every treatment here has too few pools to compare/);
    expect(timeToClearReading([], 60)).toBe("No treated course started above the clear level in this window.");
  });
});

describe("reduction reading", () => {
  const arm = (label: string, median: number | null, count: number, tooFew = false) => ({ label, tooFewToCompare: tooFew, reduction: { count, median } });
  it("names the largest median fall among treatments with enough pools, then the next", () => {
    expect(reductionReading([arm("Sequestrant", 40, 12), arm("Pads", 62.4, 14), arm("Tiny trial", 90, 2, true)])).toBe(
      "Largest median fall: Pads, 62% over 14 courses; next: Sequestrant, 40%.",
    );
  });
  it("does not call a rise a fall", () => {
    expect(reductionReading([arm("Pads", -12, 6)])).toBe(
      "No treatment with enough pools lowered the metal at the median; the closest, Pads, ended 12% higher (over 6 courses).",
    );
  });
  it("says when only small treatments or none had a follow-up", () => {
    expect(reductionReading([arm("Tiny trial", 90, 1, true)])).toMatch(/^Only treatments with too few pools/);
    expect(reductionReading([arm("Pads", null, 0)])).toBe("No course had a follow-up reading 3 to 10 days after treatment.");
  });
});

describe("source test reading", () => {
  const test = (sampledOn: string, iron: number | null, copper: number | null = null) => ({
    sampledOn,
    iron: iron === null ? null : { value: iron, belowDetection: false },
    copper: copper === null ? null : { value: copper, belowDetection: true },
    manganese: null,
  });
  it("counts the tests at or above the elevated level and names the highest against its level", () => {
    // Iron elevated at 0.2: 0.62 and 0.9 are elevated (0.9 / 0.2 = 4.5 times, the highest), 0.05 is not.
    expect(sourceTestReading([test("2025-05-01", 0.62), test("2025-03-01", 0.9), test("2025-07-01", 0.05)], levels)).toBe(
      "2 of 3 tests at or above the elevated level; the highest: iron 0.9 mg/L on 2025-03-01 (elevated level 0.2 mg/L).",
    );
  });
  it("gives the latest test when none reached the level", () => {
    expect(sourceTestReading([test("2025-07-01", 0.05, 0.05), test("2025-03-01", 0.1)], levels)).toBe(
      "No test of this water reached the elevated level (2 tests); the latest, 2025-07-01: copper <0.05 mg/L and iron 0.05 mg/L.",
    );
  });
  it("is null without tests (the chart shows its empty note)", () => {
    expect(sourceTestReading([], levels)).toBeNull();
  });
});

const episode = (metal: "copper" | "iron", openedAt: string, durationDays: number, censored: boolean, peak = 0.5) => ({
  metal,
  openedAt: `${openedAt}T10:00:00.000Z`,
  closedAt: censored ? null : new Date(Date.parse(`${openedAt}T10:00:00Z`) + durationDays * 86_400_000).toISOString(),
  censored,
  durationDays,
  peak,
});

describe("recurring pool reading", () => {
  it("follows the metal with the most episodes: its longest and where the latest stands", () => {
    const episodes = [episode("iron", "2024-05-01", 40, false), episode("iron", "2025-04-02", 12, true, 0.9), episode("copper", "2025-01-01", 90, false)];
    expect(recurringPoolReading(episodes, ["copper", "iron"])).toBe(
      "Iron: 2 episodes, the longest 40 days; the latest opened 2025-04-02 and is still open (12 days, peak 0.9 mg/L).",
    );
  });
  it("only reads the metals the page shows", () => {
    const episodes = [episode("iron", "2024-05-01", 40, false), episode("iron", "2025-04-02", 12, true), episode("copper", "2025-01-01", 90, false)];
    expect(recurringPoolReading(episodes, ["copper"])).toBe("Copper: 1 episode, the longest 90 days; the latest opened 2025-01-01 and cleared after 90 days.");
    expect(recurringPoolReading(episodes, ["manganese"])).toBe("No episode of these metals in this window.");
  });
});

describe("pool episodes reading", () => {
  it("lists the episodes still open", () => {
    expect(poolEpisodesReading([episode("iron", "2025-04-02", 12, true, 0.9), episode("copper", "2024-01-01", 30, false)])).toBe(
      "2 episodes on record; still open: iron since 2025-04-02 (12 days, peak 0.9 mg/L).",
    );
  });
  it("says how the latest ended when none is open", () => {
    // Opened 2025-01-01 10:00, 20 days later: closed 2025-01-21.
    expect(poolEpisodesReading([episode("copper", "2024-01-01", 30, false), episode("iron", "2025-01-01", 20, false)])).toBe(
      "2 episodes on record, none open; the latest, iron, cleared on 2025-01-21 after 20 days.",
    );
    expect(poolEpisodesReading([])).toBeNull();
  });
});

describe("metal history reading", () => {
  const point = (metal: "copper" | "iron" | "manganese", iso: string, value: number, belowDetection = false) => ({ at: at(iso), metal, value, belowDetection });
  it("names the metals at or above the elevated level at their latest test", () => {
    // Iron's latest 0.35 >= 0.2; copper's latest 0.05 < 0.1 (an earlier 0.5 no longer counts).
    expect(metalHistoryReading([point("copper", "2025-01-01", 0.5), point("copper", "2025-06-01", 0.05), point("iron", "2025-06-01", 0.35)], levels)).toBe(
      "At or above the elevated level at the latest test: iron 0.35 mg/L on 2025-06-01.",
    );
  });
  it("names the metals between the clear and elevated levels when none is elevated", () => {
    // Copper 0.2: at or above clear 0.1, below elevated 0.3.
    expect(metalHistoryReading([point("copper", "2025-06-01", 0.2), point("iron", "2025-06-01", 0.05, true)], levels)).toBe(
      "No metal at the elevated level at its latest test; between the clear and elevated levels: copper 0.2 mg/L on 2025-06-01.",
    );
  });
  it("says every metal is below the elevated level otherwise", () => {
    expect(metalHistoryReading([point("iron", "2025-06-01", 0.05, true), point("manganese", "2025-06-02", 0.01)], levels)).toBe(
      "Every metal is below the elevated level at its latest test (iron <0.05 mg/L on 2025-06-01 and manganese 0.01 mg/L on 2025-06-02).",
    );
    expect(metalHistoryReading([], levels)).toBeNull();
  });
});

describe("pH and saturation index readings", () => {
  it("judge the latest pH against the acceptable range (Montana pool rules, 7.2 to 7.8)", () => {
    expect(phReading([{ at: at("2025-01-01"), value: 8.1 }, { at: at("2025-06-01"), value: 7.4 }])).toBe("Latest pH 7.4 on 2025-06-01, inside the range 7.2 to 7.8.");
    expect(phReading([{ at: at("2025-06-01"), value: 7.9 }])).toBe("Latest pH 7.9 on 2025-06-01, above the range 7.2 to 7.8.");
    expect(phReading([{ at: at("2025-06-01"), value: 7.1 }])).toBe("Latest pH 7.1 on 2025-06-01, below the range 7.2 to 7.8.");
    expect(phReading([])).toBeNull();
  });
  it("place the latest index against the balanced band", () => {
    const band = { low: -0.3, high: 0.3 };
    expect(indexReading([{ at: at("2025-06-01"), value: -0.42 }], band)).toBe("Latest index -0.42 on 2025-06-01: corrosive.");
    expect(indexReading([{ at: at("2025-06-01"), value: 0.3 }], band)).toBe("Latest index 0.30 on 2025-06-01: balanced.");
    expect(indexReading([{ at: at("2025-06-01"), value: 0.31 }], band)).toBe("Latest index 0.31 on 2025-06-01: scale-forming.");
  });
});
