import { mean, median } from "d3-array";
import { wilsonInterval, type Interval } from "../stats/intervals";
import { mannWhitney, type RankTestResult } from "../stats/rank-tests";
import { kaplanMeier, logRankTest, type KaplanMeierCurve, type LogRankResult, type SurvivalObservation } from "../stats/survival";
import {
  DEFAULT_OUTCOME_RULES,
  type CensoringCause,
  type CourseOutcome,
  type Ineligible,
  type PhStratum,
  type ProductCategory,
  type RecurrenceOutcome,
} from "./treatments";

/**
 * How courses are put into arms. "product" and "category" count a course
 * under every metal product or category it used (acid given first to bring
 * the pH down is part of the course, not a metal treatment, so it is no arm
 * of its own); "combination" puts it under exactly one arm, its full set of
 * products including any acid (e.g. "pad-A + seq-B").
 */
export type ArmDimension = "product" | "category" | "combination" | "category-combination";

export function armsOf(outcome: CourseOutcome, dimension: ArmDimension): string[] {
  if (dimension === "product" && outcome.course.treatments.length === 0) throw new Error("a course read without its treatments has no product arms");
  return courseArms(dimension, outcome.course);
}

/** A course's arms on a dimension, from its arm keys (and, for "product", its treatments). */
export function courseArms(
  dimension: ArmDimension,
  course: { combination: string; categoryCombination: string; treatments?: ReadonlyArray<{ productId: string; category: ProductCategory }> },
): string[] {
  switch (dimension) {
    case "product":
      return [...new Set((course.treatments ?? []).filter((t) => t.category !== "ph-decreaser").map((t) => t.productId))].sort();
    case "category":
      return course.categoryCombination.split(" + ").filter((c) => c !== "ph-decreaser");
    case "combination":
      return [course.combination];
    case "category-combination":
      return [course.categoryCombination];
  }
}

/**
 * What the arm summaries and escalation hints read of one course followed on
 * one metal, flat: the answer from the kept results builds these straight
 * from its rows, tens of thousands of them on a large company.
 */
export interface ArmCourse {
  poolId: string;
  startAt: number;
  /** The arms it counts under on the dimension summarised (none when ineligible). */
  arms: readonly string[];
  ineligible: Ineligible | null;
  phStratum: PhStratum;
  percentReduction: number | null;
  daysToClear: number;
  cleared: boolean;
  censoredBy: CensoringCause | null;
  recurrence: RecurrenceOutcome | null;
  cost: number;
  costComplete: boolean;
}

export function armCourseOf(outcome: CourseOutcome, dimension: ArmDimension): ArmCourse {
  return {
    poolId: outcome.course.poolId,
    startAt: outcome.course.startAt,
    arms: outcome.ineligible === null ? armsOf(outcome, dimension) : [],
    ineligible: outcome.ineligible,
    phStratum: outcome.phStratum,
    percentReduction: outcome.percentReduction,
    daysToClear: outcome.timeToClear.days,
    cleared: outcome.timeToClear.cleared,
    censoredBy: outcome.timeToClear.censoredBy,
    recurrence: outcome.recurrence,
    cost: outcome.course.cost,
    costComplete: outcome.course.costComplete,
  };
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

/** Summary of one set of eligible courses. */
export function summariseArm(courses: readonly ArmCourse[], minPoolsToCompare = DEFAULT_OUTCOME_RULES.minPoolsToCompare): ArmResult {
  const pools = new Set<string>();
  const clearedPools = new Set<string>();
  const reductions: number[] = [];
  const observations: SurvivalObservation[] = [];
  let cleared = 0;
  let recurred = 0;
  let followed = 0;
  let totalCost = 0;
  let costComplete = true;
  for (const c of courses) {
    pools.add(c.poolId);
    if (c.percentReduction !== null) reductions.push(c.percentReduction);
    observations.push({ time: c.daysToClear, event: c.cleared });
    if (c.cleared) {
      cleared++;
      clearedPools.add(c.poolId);
    }
    if (c.recurrence === "recurred") recurred++;
    if (c.recurrence === "recurred" || c.recurrence === "stayed-clear") followed++;
    totalCost += c.cost;
    costComplete &&= c.costComplete;
  }
  return {
    courses: courses.length,
    pools: pools.size,
    tooFewToCompare: pools.size < minPoolsToCompare,
    reduction: { count: reductions.length, median: median(reductions) ?? null, mean: mean(reductions) ?? null },
    timeToClear: kaplanMeier(observations),
    clearedCourses: cleared,
    clearedPools: clearedPools.size,
    recurrence: { recurred, followed, share: followed > 0 ? wilsonInterval(recurred, followed) : null },
    totalCost,
    costComplete,
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
  return summariseArmCourses(
    outcomes.map((o) => armCourseOf(o, dimension)),
    minPoolsToCompare,
  );
}

/** The same from courses already put into arms. */
export function summariseArmCourses(courses: readonly ArmCourse[], minPoolsToCompare = DEFAULT_OUTCOME_RULES.minPoolsToCompare): ArmSummary[] {
  const arms = new Map<string, ArmCourse[]>();
  for (const c of courses) {
    if (c.ineligible !== null) continue;
    for (const arm of c.arms) {
      const list = arms.get(arm);
      if (list) list.push(c);
      else arms.set(arm, [c]);
    }
  }
  return [...arms.entries()]
    .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0))
    .map(([arm, list]) => {
      const byPh: Record<PhStratum, ArmCourse[]> = { inside: [], outside: [], unknown: [] };
      for (const c of list) byPh[c.phStratum].push(c);
      return {
        arm,
        ...summariseArm(list, minPoolsToCompare),
        byPh: {
          inside: summariseArm(byPh.inside, minPoolsToCompare),
          outside: summariseArm(byPh.outside, minPoolsToCompare),
          unknown: summariseArm(byPh.unknown, minPoolsToCompare),
        },
      };
    });
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
export function escalationDue(courses: readonly ArmCourse[], minCoursesWithoutClearing = 3): EscalationHint[] {
  const byPool = new Map<string, ArmCourse[]>();
  for (const c of courses) {
    // A course still inside its follow-up at the end of the data has not failed yet.
    if (c.ineligible !== null || c.censoredBy === "end-of-data") continue;
    const list = byPool.get(c.poolId);
    if (list) list.push(c);
    else byPool.set(c.poolId, [c]);
  }
  const hints: EscalationHint[] = [];
  for (const [poolId, list] of byPool) {
    list.sort((x, y) => x.startAt - y.startAt);
    let streak = 0;
    for (let i = list.length - 1; i >= 0 && !list[i]!.cleared; i--) streak++;
    if (streak >= minCoursesWithoutClearing) {
      hints.push({ poolId, coursesWithoutClearing: streak, since: list[list.length - streak]!.startAt });
    }
  }
  return hints;
}
