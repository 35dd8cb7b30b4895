import { mean, median } from "d3-array";
import { wilsonInterval, type Interval } from "../stats/intervals";
import { mannWhitney, type RankTestResult } from "../stats/rank-tests";
import { kaplanMeier, logRankTest, type KaplanMeierCurve, type LogRankResult, type SurvivalObservation } from "../stats/survival";
import { DEFAULT_OUTCOME_RULES, type CourseOutcome, type PhStratum } from "./treatments";

/**
 * How courses are put into arms. "product" and "category" count a course
 * under every metal product or category it used (acid given first to bring
 * the pH down is part of the course, not a metal treatment, so it is no arm
 * of its own); "combination" puts it under exactly one arm, its full set of
 * products including any acid (e.g. "pad-A + seq-B").
 */
export type ArmDimension = "product" | "category" | "combination" | "category-combination";

export function armsOf(outcome: CourseOutcome, dimension: ArmDimension): string[] {
  switch (dimension) {
    case "product":
      if (outcome.course.treatments.length === 0) throw new Error("a course read without its treatments has no product arms");
      return [...new Set(outcome.course.treatments.filter((t) => t.category !== "ph-decreaser").map((t) => t.productId))].sort();
    case "category":
      return outcome.course.categories.filter((c) => c !== "ph-decreaser");
    case "combination":
      return [outcome.course.combination];
    case "category-combination":
      return [outcome.course.categoryCombination];
  }
}

export interface ArmResult {
  courses: number;
  /** Distinct pools treated with a baseline above clear. */
  pools: number;
  tooFewToCompare: boolean;
  reduction: { count: number; median: number | null; mean: number | null };
  timeToClear: KaplanMeierCurve;
  clearedCourses: number;
  clearedPools: number;
  recurrence: { recurred: number; followed: number; share: Interval | null };
  totalCost: number;
  costComplete: boolean;
  costPerClearedPool: number | null;
}

export interface ArmSummary extends ArmResult {
  arm: string;
  byPh: Record<PhStratum, ArmResult>;
}

export function timeToClearObservations(outcomes: readonly CourseOutcome[]): SurvivalObservation[] {
  return outcomes.map((o) => ({ time: o.timeToClear.days, event: o.timeToClear.cleared }));
}

/** Summary of one set of eligible course outcomes. */
export function summariseArm(outcomes: readonly CourseOutcome[], minPoolsToCompare = DEFAULT_OUTCOME_RULES.minPoolsToCompare): ArmResult {
  const pools = new Set(outcomes.map((o) => o.course.poolId));
  const reductions = outcomes.map((o) => o.percentReduction).filter((v): v is number => v !== null);
  const cleared = outcomes.filter((o) => o.timeToClear.cleared);
  const clearedPools = new Set(cleared.map((o) => o.course.poolId));
  const recurred = outcomes.filter((o) => o.recurrence === "recurred").length;
  const followed = recurred + outcomes.filter((o) => o.recurrence === "stayed-clear").length;
  const totalCost = outcomes.reduce((sum, o) => sum + o.course.cost, 0);
  return {
    courses: outcomes.length,
    pools: pools.size,
    tooFewToCompare: pools.size < minPoolsToCompare,
    reduction: { count: reductions.length, median: median(reductions) ?? null, mean: mean(reductions) ?? null },
    timeToClear: kaplanMeier(timeToClearObservations(outcomes)),
    clearedCourses: cleared.length,
    clearedPools: clearedPools.size,
    recurrence: { recurred, followed, share: followed > 0 ? wilsonInterval(recurred, followed) : null },
    totalCost,
    costComplete: outcomes.every((o) => o.course.costComplete),
    costPerClearedPool: clearedPools.size > 0 ? totalCost / clearedPools.size : null,
  };
}

/**
 * Per-arm outcome summaries, each split by pH at treatment (inside or
 * outside the band). Courses whose baseline was already clear, or unknown,
 * cannot show an effect and are left out.
 */
export function summariseOutcomes(
  outcomes: readonly CourseOutcome[],
  dimension: ArmDimension,
  minPoolsToCompare = DEFAULT_OUTCOME_RULES.minPoolsToCompare,
): ArmSummary[] {
  const arms = new Map<string, CourseOutcome[]>();
  for (const o of outcomes) {
    if (o.ineligible !== null) continue;
    for (const arm of armsOf(o, dimension)) {
      const list = arms.get(arm);
      if (list) list.push(o);
      else arms.set(arm, [o]);
    }
  }
  return [...arms.entries()]
    .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0))
    .map(([arm, list]) => ({
      arm,
      ...summariseArm(list, minPoolsToCompare),
      byPh: {
        inside: summariseArm(list.filter((o) => o.phStratum === "inside"), minPoolsToCompare),
        outside: summariseArm(list.filter((o) => o.phStratum === "outside"), minPoolsToCompare),
        unknown: summariseArm(list.filter((o) => o.phStratum === "unknown"), minPoolsToCompare),
      },
    }));
}

export interface ArmComparison {
  /** Either arm has fewer treated pools than the minimum: show, but do not rank. */
  tooFewToCompare: boolean;
  timeToClear: LogRankResult;
  /** Mann-Whitney on percent reduction at the first follow-up; null when either arm has none. */
  reduction: RankTestResult | null;
}

export function compareArms(
  a: readonly CourseOutcome[],
  b: readonly CourseOutcome[],
  minPoolsToCompare = DEFAULT_OUTCOME_RULES.minPoolsToCompare,
): ArmComparison {
  const eligibleA = a.filter((o) => o.ineligible === null);
  const eligibleB = b.filter((o) => o.ineligible === null);
  const poolCount = (list: readonly CourseOutcome[]) => new Set(list.map((o) => o.course.poolId)).size;
  const reductions = (list: readonly CourseOutcome[]) => list.map((o) => o.percentReduction).filter((v): v is number => v !== null);
  const ra = reductions(eligibleA);
  const rb = reductions(eligibleB);
  return {
    tooFewToCompare: poolCount(eligibleA) < minPoolsToCompare || poolCount(eligibleB) < minPoolsToCompare,
    timeToClear: logRankTest(timeToClearObservations(eligibleA), timeToClearObservations(eligibleB)),
    reduction: ra.length > 0 && rb.length > 0 ? mannWhitney(ra, rb) : null,
  };
}

export interface EscalationHint {
  poolId: string;
  coursesWithoutClearing: number;
  since: number;
}

/**
 * Pools where the last few courses in a row did not clear the metal: more
 * product is unlikely to help, and the cause or the surface needs attention.
 */
export function escalationDue(outcomes: readonly CourseOutcome[], minCoursesWithoutClearing = 3): EscalationHint[] {
  const byPool = new Map<string, CourseOutcome[]>();
  for (const o of outcomes) {
    // A course still inside its follow-up at the end of the data has not failed yet.
    if (o.ineligible !== null || o.timeToClear.censoredBy === "end-of-data") continue;
    const list = byPool.get(o.course.poolId);
    if (list) list.push(o);
    else byPool.set(o.course.poolId, [o]);
  }
  const hints: EscalationHint[] = [];
  for (const [poolId, list] of byPool) {
    list.sort((x, y) => x.course.startAt - y.course.startAt);
    let streak = 0;
    for (let i = list.length - 1; i >= 0 && !list[i]!.timeToClear.cleared; i--) streak++;
    if (streak >= minCoursesWithoutClearing) {
      hints.push({ poolId, coursesWithoutClearing: streak, since: list[list.length - streak]!.course.startAt });
    }
  }
  return hints;
}
