import { chiSquareSurvival, normalCriticalValue } from "./distributions";
import { DEFAULT_CONFIDENCE } from "./intervals";

export interface SurvivalObservation {
  /** Time from the start (e.g. days from treatment). */
  time: number;
  /** True when the event (e.g. clear) was seen; false when censored at this time. */
  event: boolean;
}

export interface SurvivalStep {
  time: number;
  atRisk: number;
  events: number;
  censored: number;
  survival: number;
  /** Greenwood standard error of the survival estimate. */
  standardError: number;
  lower: number;
  upper: number;
}

export type SurvivalIntervalKind = "log-log" | "plain";

export interface KaplanMeierCurve {
  steps: SurvivalStep[];
  observations: number;
  events: number;
  /** First time at which survival is at or below one half; null when the curve never gets there. */
  median: number | null;
  medianLower: number | null;
  medianUpper: number | null;
  interval: SurvivalIntervalKind;
  level: number;
}

/**
 * Kaplan-Meier product-limit estimate with Greenwood variance. Censorings
 * tied with events at the same time are counted at risk for those events,
 * as is conventional. The default log-log interval stays inside [0, 1];
 * the plain interval is S +/- z SE, clipped.
 */
export function kaplanMeier(
  observations: readonly SurvivalObservation[],
  options: { level?: number; interval?: SurvivalIntervalKind } = {},
): KaplanMeierCurve {
  const level = options.level ?? DEFAULT_CONFIDENCE;
  const interval = options.interval ?? "log-log";
  const z = normalCriticalValue(level);
  const steps: SurvivalStep[] = [];
  let atRisk = observations.length;
  let survival = 1;
  let greenwoodSum = 0;
  let totalEvents = 0;
  for (const tied of tiedTimes([observations])) {
    const { time } = tied;
    const events = tied.events[0]!;
    const censored = tied.leaving[0]! - events;
    if (events > 0) {
      survival *= 1 - events / atRisk;
      greenwoodSum += atRisk > events ? events / (atRisk * (atRisk - events)) : Infinity;
      totalEvents += events;
    }
    const standardError = survival * Math.sqrt(greenwoodSum);
    const bounds = survivalBounds(survival, greenwoodSum, z, interval);
    steps.push({ time, atRisk, events, censored, survival, standardError: Number.isFinite(standardError) ? standardError : 0, ...bounds });
    atRisk -= events + censored;
  }
  const firstAtOrBelowHalf = (pick: (s: SurvivalStep) => number) => steps.find((s) => s.events > 0 && pick(s) <= 0.5)?.time ?? null;
  return {
    steps,
    observations: observations.length,
    events: totalEvents,
    median: firstAtOrBelowHalf((s) => s.survival),
    // The lower band falls to one half first, so it gives the earlier limit.
    medianLower: firstAtOrBelowHalf((s) => s.lower),
    medianUpper: firstAtOrBelowHalf((s) => s.upper),
    interval,
    level,
  };
}

function survivalBounds(survival: number, greenwoodSum: number, z: number, kind: SurvivalIntervalKind): { lower: number; upper: number } {
  if (survival <= 0) return { lower: 0, upper: 0 };
  if (greenwoodSum === 0) return { lower: survival, upper: survival };
  if (kind === "plain") {
    const half = z * survival * Math.sqrt(greenwoodSum);
    return { lower: Math.max(0, survival - half), upper: Math.min(1, survival + half) };
  }
  const logSurvival = Math.log(survival);
  const spread = (z * Math.sqrt(greenwoodSum)) / Math.abs(logSurvival);
  return { lower: survival ** Math.exp(spread), upper: survival ** Math.exp(-spread) };
}

/** Survival estimate at time t (right-continuous step function). */
export function survivalAt(curve: KaplanMeierCurve, time: number): number {
  let value = 1;
  for (const step of curve.steps) {
    if (step.time > time) break;
    value = step.survival;
  }
  return value;
}

/** One distinct time of the observations, with each group's events and departures (events and censorings) then. */
interface TiedTime {
  time: number;
  events: number[];
  leaving: number[];
}

/** The groups' observations pooled and sorted by time, one entry per distinct time. */
function tiedTimes(groups: readonly (readonly SurvivalObservation[])[]): TiedTime[] {
  const pooled = groups
    .flatMap((observations, group) => observations.map((o) => ({ time: o.time, event: o.event, group })))
    .sort((a, b) => a.time - b.time);
  const times: TiedTime[] = [];
  for (const o of pooled) {
    let current = times.at(-1);
    if (current?.time !== o.time) {
      current = { time: o.time, events: groups.map(() => 0), leaving: groups.map(() => 0) };
      times.push(current);
    }
    current.leaving[o.group]! += 1;
    if (o.event) current.events[o.group]! += 1;
  }
  return times;
}

export interface LogRankResult {
  chiSquare: number;
  pValue: number;
  observed: [number, number];
  expected: [number, number];
}

/**
 * Two-group log-rank test (Mantel-Haenszel form with the hypergeometric
 * variance at each event time, ties included), chi-square on 1 degree of freedom.
 */
export function logRankTest(groupA: readonly SurvivalObservation[], groupB: readonly SurvivalObservation[]): LogRankResult {
  let riskA = groupA.length;
  let riskB = groupB.length;
  let observedA = 0;
  let expectedA = 0;
  let observedB = 0;
  let variance = 0;
  for (const tied of tiedTimes([groupA, groupB])) {
    const [eventsA, eventsB] = tied.events as [number, number];
    const [leavingA, leavingB] = tied.leaving as [number, number];
    const events = eventsA + eventsB;
    const risk = riskA + riskB;
    if (events > 0 && risk > 0) {
      expectedA += (events * riskA) / risk;
      if (risk > 1) variance += (events * (riskA / risk) * (riskB / risk) * (risk - events)) / (risk - 1);
      observedA += eventsA;
      observedB += eventsB;
    }
    riskA -= leavingA;
    riskB -= leavingB;
  }
  const totalEvents = observedA + observedB;
  const chiSquare = variance > 0 ? (observedA - expectedA) ** 2 / variance : 0;
  return {
    chiSquare,
    pValue: variance > 0 ? chiSquareSurvival(chiSquare, 1) : 1,
    observed: [observedA, observedB],
    expected: [expectedA, totalEvents - expectedA],
  };
}
