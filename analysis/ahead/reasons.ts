// A pool's number put into words: the feature contributions grouped into
// reasons a person recognises, the three largest first.
import type { Metal, MetalThresholds } from "../metals/reading";
import { METAL_LABELS } from "../metals/names";
import { FEATURES, type FeatureName, type RowFacts } from "./features";

export type ReasonKey = "reading" | "history" | "fillWater" | "wave" | "balance" | "exchanger" | "season" | "algaecide";

const REASON_OF: Record<FeatureName, ReasonKey> = {
  latestReading: "reading",
  readingRise: "reading",
  pastEpisodes: "history",
  recentEpisode: "history",
  fillWater: "fillWater",
  sourceWave: "wave",
  corrosiveWater: "balance",
  exchangerAge: "exchanger",
  exchangerInCorrosiveWater: "exchanger",
  seasonSin: "season",
  seasonCos: "season",
  copperAlgaecide: "algaecide",
};

export interface Reason {
  key: ReasonKey;
  /** Added log-odds against the company's average pool-week. */
  logOdds: number;
  text: string;
}

const mgL = (value: number) => `${Number(value.toFixed(3))} mg/L`;
const withArticle = (word: string) => (/^[aeiou]/.test(word) ? `an ${word}` : `a ${word}`);
const plural = (n: number, one: string, many: string) => `${n} ${n === 1 ? one : many}`;

export function reasonText(key: ReasonKey, facts: RowFacts, metal: Metal, thresholds: MetalThresholds, at: number): string {
  const name = METAL_LABELS[metal].toLowerCase();
  const elevated = thresholds[metal].elevated;
  switch (key) {
    case "reading": {
      if (facts.latestValue === null) return `No ${name} reading on record yet`;
      if (facts.latestValue === 0) return `Latest ${name} reading below detection`;
      const share = Math.round((100 * facts.latestValue) / elevated);
      const rising = facts.previousValue !== null && facts.latestValue > facts.previousValue ? `, up from ${mgL(facts.previousValue)}` : "";
      return `Latest ${name} reading ${mgL(facts.latestValue)}, ${share}% of the elevated level${rising}`;
    }
    case "history": {
      if (facts.openings === 0) return `No earlier ${name} episode`;
      const days = facts.lastClosedAt === null ? null : Math.round((at - facts.lastClosedAt) / 86_400_000);
      const closed = days === null ? ", the last still open" : `, the last closed ${plural(days, "day", "days")} ago`;
      return `${plural(facts.openings, `earlier ${name} episode`, `earlier ${name} episodes`)}${closed}`;
    }
    case "fillWater":
      return facts.fillWaterValue === null
        ? `No recent fill-water test for ${name}`
        : `Fill water tested ${mgL(facts.fillWaterValue)} ${name} (elevated level ${mgL(elevated)})`;
    case "wave":
      return facts.waveOpenings === 0
        ? `No ${name} episode on other pools of the same fill source in the past 4 weeks`
        : `${plural(facts.waveOpenings, "other pool", "other pools")} on the same fill source opened ${withArticle(name)} episode in the past 4 weeks`;
    case "balance":
      return facts.corrosiveShare === null
        ? "No recent water-balance reading"
        : `Corrosive water: ${Math.round(facts.corrosiveShare * 100)}% of recent balance readings below the balanced band`;
    case "exchanger":
      return facts.exchanger === null
        ? "No copper-bearing heat exchanger"
        : `${Math.floor(facts.exchanger.ageYears)}-year-old ${facts.exchanger.metal} heat exchanger${facts.corrosiveShare ? " in corrosive water" : ""}`;
    case "season":
      return `Time of year: ${name} episodes of this company open more often in these weeks`;
    case "algaecide":
      return facts.algaecideDoses === 0
        ? "No copper algaecide in the past 4 weeks"
        : `${plural(facts.algaecideDoses, "copper algaecide dose", "copper algaecide doses")} in the past 4 weeks`;
  }
}

/**
 * Whether the facts show the reason present. A missing cause can raise a number
 * too (when the cause's coefficient is negative, having none sits above the
 * average), but "no corrosive water" is not a reason a person can act on.
 */
export function reasonPresent(key: ReasonKey, facts: RowFacts): boolean {
  switch (key) {
    case "reading":
      return facts.latestValue !== null && facts.latestValue > 0;
    case "history":
      return facts.openings > 0;
    case "fillWater":
      return facts.fillWaterValue !== null && facts.fillWaterValue > 0;
    case "wave":
      return facts.waveOpenings > 0;
    case "balance":
      return (facts.corrosiveShare ?? 0) > 0;
    case "exchanger":
      return facts.exchanger !== null;
    case "season":
      return true;
    case "algaecide":
      return facts.algaecideDoses > 0;
  }
}

/** The reasons that raise the number most, largest first; at most `count`, only present ones that raise it. */
export function topReasons(
  parts: readonly number[],
  facts: RowFacts,
  metal: Metal,
  thresholds: MetalThresholds,
  at: number,
  count = 3,
): Reason[] {
  const sums = new Map<ReasonKey, number>();
  FEATURES.forEach((feature, j) => {
    const key = REASON_OF[feature];
    sums.set(key, (sums.get(key) ?? 0) + parts[j]!);
  });
  return [...sums]
    .filter(([key, logOdds]) => logOdds > 0.01 && reasonPresent(key, facts))
    .sort((a, b) => b[1] - a[1])
    .slice(0, count)
    .map(([key, logOdds]) => ({ key, logOdds, text: reasonText(key, facts, metal, thresholds, at) }));
}
