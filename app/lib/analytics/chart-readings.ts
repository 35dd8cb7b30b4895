/**
 * Each chart's main result in one line of words, shown under the chart so a
 * page reads without decoding the drawing. Pure: the same figures the chart
 * draws go in, a sentence comes out.
 */
import { DEFAULT_ANALYTE_RANGES, judgeAnalyte } from "@analysis/chemistry/ranges";
import type { EpisodeJson, JsonInterval } from "@analysis/json-shapes";
import { METAL_LABELS } from "@analysis/metals/names";
import { type Metal, type MetalReading, type MetalThresholds, METALS, metalStatus } from "@analysis/metals/reading";

const metalWord = (metal: Metal) => METAL_LABELS[metal].toLowerCase();
const counted = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;
const day = (iso: string) => iso.slice(0, 10);
const wholePercent = (part: number, whole: number) => `${Math.round((part / whole) * 100)}%`;
/** A share as a percent: one decimal under 10 %, so a small share does not read as 0 %. */
export const percentText = (share: number) => `${(share * 100).toFixed(share > 0 && share < 0.1 ? 1 : 0)}%`;
const readingText = (r: MetalReading) => `${r.belowDetection ? "<" : ""}${r.value} mg/L`;

/** "copper", "copper and iron", "copper, iron and manganese". */
export function listWords(words: readonly string[]): string {
  if (words.length <= 1) return words.join("");
  return `${words.slice(0, -1).join(", ")} and ${words.at(-1)}`;
}

/** The metal (or metals, when tied) open on the most pools. */
export function openEpisodesReading(open: Readonly<Record<Metal, number>>): string {
  const total = METALS.reduce((sum, m) => sum + open[m], 0);
  if (total === 0) return "No pool has an open episode.";
  const most = Math.max(...METALS.map((m) => open[m]));
  const top = METALS.filter((m) => open[m] === most).map(metalWord);
  return top.length === 1
    ? `Most open: ${top[0]}, ${most} of ${total} open episodes.`
    : `Most open: ${listWords(top)}, ${most} each of ${total} open episodes.`;
}

type BalanceCounts = { corrosive: { pools: number }; balanced: { pools: number }; scaleForming: { pools: number } };

/** How many pools were balanced at their latest full test, and how the rest lean. */
export function balanceReading(balance: BalanceCounts): string {
  const { corrosive, balanced, scaleForming } = { corrosive: balance.corrosive.pools, balanced: balance.balanced.pools, scaleForming: balance.scaleForming.pools };
  const total = corrosive + balanced + scaleForming;
  if (total === 0) return "No pool has a test with pH, temperature, calcium hardness and alkalinity together.";
  return `${balanced} of ${total} pools (${wholePercent(balanced, total)}) were balanced at their latest full test; ${corrosive} corrosive (${wholePercent(corrosive, total)}), ${scaleForming} scale-forming (${wholePercent(scaleForming, total)}).`;
}

type MonthFigure = { metal: Metal; month: string; readings: number; elevated: number; elevatedShare: number; poolsElevated: number };

/** The month and metal with the largest share of elevated readings, in words; null when none was elevated. */
export function worstMonthReading(months: readonly MonthFigure[]): string | null {
  const worst = months.reduce<MonthFigure | null>((top, m) => (m.elevated > 0 && (!top || m.elevatedShare > top.elevatedShare) ? m : top), null);
  if (!worst) return null;
  return `Worst month: ${metalWord(worst.metal)} in ${worst.month}, ${percentText(worst.elevatedShare)} of ${worst.readings} tests at or above the elevated level, on ${counted(worst.poolsElevated, "pool")}.`;
}

type GroupRate = { label: string; risky: boolean; tooSmallToJudge: boolean; rateRatio: JsonInterval };

/** The risky group furthest above the rest (by its lower bound), or that none stands apart. */
export function groupReading(groups: readonly GroupRate[]): string {
  const risky = groups.filter((g) => g.risky && !g.tooSmallToJudge && g.rateRatio.lower !== null);
  if (risky.length === 0) return "No group stands apart: every group's interval reaches the rest of the route book's rate.";
  const top = risky.reduce((a, b) => ((b.rateRatio.lower ?? 0) > (a.rateRatio.lower ?? 0) ? b : a));
  const lower = top.rateRatio.lower!.toFixed(1);
  if (top.rateRatio.estimate === null) {
    return `${top.label}: at least ${lower} times the rest of the route book's rate (95%); the rest had no opening to compare with.`;
  }
  return `${top.label}: ${top.rateRatio.estimate.toFixed(1)} times the rest of the route book's rate (at least ${lower} times, 95%).`;
}

type ClearingArm = {
  label: string;
  tooFewToCompare: boolean;
  timeToClear: { medianDays: number | null; medianLower: number | null; medianUpper: number | null };
};

const days = (n: number) => `${n.toFixed(0)} days`;
function medianInterval(arm: ClearingArm): string {
  const { medianLower: low, medianUpper: high } = arm.timeToClear;
  if (low === null) return "";
  return high === null ? ` (95%: ${days(low)} or more)` : ` (95%: ${low.toFixed(0)} to ${days(high)})`;
}

/**
 * The treatment whose courses cleared soonest (median, Kaplan-Meier), among
 * those with enough pools to compare; names every treatment of a tie, and
 * says so when the next one's interval overlaps, since the gap may then be chance.
 */
export function timeToClearReading(arms: readonly ClearingArm[], followUpDays: number): string {
  if (arms.length === 0) return "No treated course started above the clear level in this window.";
  const compared = arms.filter((a) => !a.tooFewToCompare);
  if (compared.length === 0) return "Every treatment here has too few pools to compare: the curves show what happened, not which works better.";
  const ranked = [...compared].sort((a, b) => (a.timeToClear.medianDays ?? Infinity) - (b.timeToClear.medianDays ?? Infinity));
  const [best, next] = ranked as [ClearingArm, ...ClearingArm[]];
  if (best.timeToClear.medianDays === null) return `No treatment with enough pools cleared half its courses within ${days(followUpDays)}.`;
  // Days are read as whole days, as the page prints them: 6.6 and 7.2 days are both "day 7", a tie.
  const tied = ranked.filter((a) => a.timeToClear.medianDays !== null && Math.round(a.timeToClear.medianDays) === Math.round(best.timeToClear.medianDays!));
  if (tied.length > 1) return `Tied soonest to clear, half their courses clear by day ${best.timeToClear.medianDays.toFixed(0)}: ${listWords(tied.map((a) => a.label))}.`;
  const lead = `Soonest to clear: ${best.label}, half its courses clear by day ${best.timeToClear.medianDays.toFixed(0)}${medianInterval(best)}`;
  if (!next) return `${lead}; the only treatment with enough pools to compare.`;
  const nextText =
    next.timeToClear.medianDays === null ? `${next.label}, not half within ${days(followUpDays)}` : `${next.label}, day ${next.timeToClear.medianDays.toFixed(0)}`;
  const bestHigh = best.timeToClear.medianUpper;
  const nextLow = next.timeToClear.medianLower;
  const overlaps = bestHigh === null || nextLow === null || bestHigh >= nextLow;
  return `${lead}; next: ${nextText}${overlaps ? ". The intervals overlap, so the gap may be chance." : "."}`;
}

type ReductionArm = { label: string; tooFewToCompare: boolean; reduction: { count: number; median: number | null } };

/** The treatment with the largest median fall at the first follow-up, among those with enough pools. */
export function reductionReading(arms: readonly ReductionArm[]): string {
  const followed = arms.filter((a) => a.reduction.median !== null);
  if (followed.length === 0) return "No course had a follow-up reading 3 to 10 days after treatment.";
  const compared = followed.filter((a) => !a.tooFewToCompare).sort((a, b) => b.reduction.median! - a.reduction.median!);
  const [best, next] = compared;
  if (!best) return "Only treatments with too few pools to compare had a follow-up: the bars show what happened, not which works better.";
  const median = best.reduction.median!;
  const over = `over ${counted(best.reduction.count, "course")}`;
  if (median <= 0) return `No treatment with enough pools lowered the metal at the median; the closest, ${best.label}, ended ${Math.abs(median).toFixed(0)}% higher (${over}).`;
  const lead = `Largest median fall: ${best.label}, ${median.toFixed(0)}% ${over}`;
  return next ? `${lead}; next: ${next.label}, ${next.reduction.median!.toFixed(0)}%.` : `${lead}.`;
}

type SourceTest = { sampledOn: string } & Record<Metal, MetalReading | null>;

/** Whether the source's own water brought a metal in: its tests at or above the elevated level, or its latest test. */
export function sourceTestReading(tests: readonly SourceTest[], thresholds: MetalThresholds): string | null {
  if (tests.length === 0) return null;
  const ordered = [...tests].sort((a, b) => a.sampledOn.localeCompare(b.sampledOn));
  const elevated = ordered.flatMap((t) =>
    METALS.flatMap((metal) => {
      const r = t[metal];
      return r && metalStatus(r, thresholds[metal]) === "elevated" ? [{ metal, reading: r, on: t.sampledOn, times: r.value / thresholds[metal].elevated }] : [];
    }),
  );
  if (elevated.length === 0) {
    const latest = ordered.at(-1)!;
    const measured = METALS.flatMap((m) => (latest[m] ? [`${metalWord(m)} ${readingText(latest[m])}`] : []));
    return `No test of this water reached the elevated level (${counted(ordered.length, "test")}); the latest, ${latest.sampledOn}: ${listWords(measured)}.`;
  }
  const testsElevated = new Set(elevated.map((e) => e.on)).size;
  const highest = elevated.reduce((a, b) => (b.times > a.times ? b : a));
  return `${testsElevated} of ${counted(ordered.length, "test")} at or above the elevated level; the highest: ${metalWord(highest.metal)} ${readingText(highest.reading)} on ${highest.on} (elevated level ${thresholds[highest.metal].elevated} mg/L).`;
}

type EpisodeLine = Pick<EpisodeJson, "metal" | "openedAt" | "closedAt" | "censored" | "durationDays" | "peak">;

function latestEpisodeText(latest: EpisodeLine): string {
  return latest.censored
    ? `the latest opened ${day(latest.openedAt)} and is still open (${days(latest.durationDays)}, peak ${latest.peak} mg/L)`
    : `the latest opened ${day(latest.openedAt)} and cleared after ${days(latest.durationDays)}`;
}

/** For one listed pool: the metal that came back most often, its longest episode and where the latest stands. */
export function recurringPoolReading(episodes: readonly EpisodeLine[], metals: readonly Metal[]): string {
  const shown = episodes.filter((e) => metals.includes(e.metal));
  if (shown.length === 0) return "No episode of these metals in this window.";
  const byMetal = METALS.map((metal) => ({ metal, episodes: shown.filter((e) => e.metal === metal) })).filter((m) => m.episodes.length > 0);
  const top = byMetal.reduce((a, b) => (b.episodes.length > a.episodes.length ? b : a));
  const longest = Math.max(...top.episodes.map((e) => e.durationDays));
  const latest = top.episodes.reduce((a, b) => (b.openedAt > a.openedAt ? b : a));
  return `${METAL_LABELS[top.metal]}: ${counted(top.episodes.length, "episode")}, the longest ${days(longest)}; ${latestEpisodeText(latest)}.`;
}

/** A pool's episodes in one line: which are still open, or how the latest ended. */
export function poolEpisodesReading(episodes: readonly EpisodeLine[]): string | null {
  if (episodes.length === 0) return null;
  const open = episodes.filter((e) => e.censored);
  const onRecord = `${counted(episodes.length, "episode")} on record`;
  if (open.length > 0) {
    const since = open.map((e) => `${metalWord(e.metal)} since ${day(e.openedAt)} (${days(e.durationDays)}, peak ${e.peak} mg/L)`);
    return `${onRecord}; still open: ${listWords(since)}.`;
  }
  const latest = episodes.reduce((a, b) => (b.openedAt > a.openedAt ? b : a));
  return `${onRecord}, none open; the latest, ${metalWord(latest.metal)}, cleared on ${day(latest.closedAt ?? latest.openedAt)} after ${days(latest.durationDays)}.`;
}

type MetalPoint = { at: Date; metal: Metal; value: number; belowDetection: boolean };

/** Where each metal stands at its latest test against the company's levels. */
export function metalHistoryReading(points: readonly MetalPoint[], thresholds: MetalThresholds): string | null {
  const latest = METALS.flatMap((metal) => {
    const mine = points.filter((p) => p.metal === metal);
    if (mine.length === 0) return [];
    const last = mine.reduce((a, b) => (b.at > a.at ? b : a));
    return [{ metal, last, status: metalStatus(last, thresholds[metal]) }];
  });
  if (latest.length === 0) return null;
  const text = (l: (typeof latest)[number]) => `${metalWord(l.metal)} ${readingText(l.last)} on ${l.last.at.toISOString().slice(0, 10)}`;
  const elevated = latest.filter((l) => l.status === "elevated");
  if (elevated.length > 0) return `At or above the elevated level at the latest test: ${listWords(elevated.map(text))}.`;
  const watch = latest.filter((l) => l.status === "watch");
  if (watch.length > 0) return `No metal at the elevated level at its latest test; between the clear and elevated levels: ${listWords(watch.map(text))}.`;
  return `Every metal is below the elevated level at its latest test (${listWords(latest.map(text))}).`;
}

/** The latest pH, and whether it sits inside the acceptable range (the project's default, from a public pool code). */
export function phReading(points: readonly { at: Date; value: number }[], range = DEFAULT_ANALYTE_RANGES.ph): string | null {
  const last = points.at(-1);
  if (!last) return null;
  const judgement = judgeAnalyte("ph", last.value, { ...DEFAULT_ANALYTE_RANGES, ph: range });
  const where = judgement === "low" ? "below" : judgement === "high" ? "above" : "inside";
  return `Latest pH ${last.value} on ${last.at.toISOString().slice(0, 10)}, ${where} the range ${range.low} to ${range.high}.`;
}

/** The latest saturation index and which side of the company's balanced band it falls. */
export function indexReading(points: readonly { at: Date; value: number }[], band: { low: number; high: number }): string | null {
  const last = points.at(-1);
  if (!last) return null;
  const word = last.value < band.low ? "corrosive" : last.value > band.high ? "scale-forming" : "balanced";
  return `Latest index ${last.value.toFixed(2)} on ${last.at.toISOString().slice(0, 10)}: ${word}.`;
}
