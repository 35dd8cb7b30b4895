import { DAY_MS } from "../metals/episodes";
import { METALS, type Metal, type MetalStatus, type MetalThresholds } from "../metals/reading";
import {
  buildCourses,
  courseOf,
  courseOutcomes,
  DEFAULT_OUTCOME_RULES,
  percentFall,
  type CensoringCause,
  type CourseOutcome,
  type Ineligible,
  type OutcomeTest,
  type PhStratum,
  type RecurrenceOutcome,
  type TreatmentRecord,
} from "./treatments";

// Tests this long after a treatment still matter: 30 days of follow-up, then
// 90 days in which a cleared metal may come back, with room for a late visit.
const FOLLOW_DAYS_AFTER = DEFAULT_OUTCOME_RULES.followUpDays + DEFAULT_OUTCOME_RULES.recurrenceAfterClearDays + 30;
const LOOK_DAYS_BEFORE = DEFAULT_OUTCOME_RULES.baselineLookbackDays;

/**
 * Keeps the tests taken from the baseline look-back before to the end of the
 * recurrence check after any metal treatment of their pool. Tests and
 * treatments both come ordered by pool and time, so one pass with a moving
 * pointer into the treatments does it.
 */
export function testsNearTreatments(tests: readonly OutcomeTest[], applied: ReadonlyArray<{ poolId: string; appliedAt: number }>): OutcomeTest[] {
  const before = LOOK_DAYS_BEFORE * DAY_MS;
  const after = FOLLOW_DAYS_AFTER * DAY_MS;
  const timesByPool = new Map<string, number[]>();
  for (const t of applied) {
    const times = timesByPool.get(t.poolId);
    if (times) times.push(t.appliedAt);
    else timesByPool.set(t.poolId, [t.appliedAt]);
  }
  const kept: OutcomeTest[] = [];
  let poolId: string | null = null;
  let times: number[] = [];
  let next = 0;
  for (const test of tests) {
    if (test.poolId !== poolId) {
      poolId = test.poolId;
      times = timesByPool.get(poolId) ?? [];
      next = 0;
    }
    // Treatments whose follow-up ended before this test cannot reach any later test either.
    while (next < times.length && times[next]! + after < test.takenAt) next++;
    const earliest = times[next];
    if (earliest !== undefined && earliest - before <= test.takenAt) kept.push(test);
  }
  return kept;
}

/**
 * One treatment course followed on one metal, as kept: the facts the outcome
 * summary is worked out from. Quantities derived from them (days after the
 * start, the percent fall) are worked out again on reading, the same way, so
 * a kept answer is the recomputed one to the last digit.
 */
export interface KeptCourse {
  poolId: string;
  metal: Metal;
  /** The course's place among its pool's courses, by start. */
  seq: number;
  startAt: number;
  /** The course's treatments in the order they were grouped (costs as recorded with each). */
  treatments: TreatmentRecord[];
  combination: string;
  categoryCombination: string;
  cost: number;
  costComplete: boolean;
  baseline: { testId: string; takenAt: number; value: number; status: MetalStatus } | null;
  ineligible: Ineligible | null;
  phAtTreatment: number | null;
  phStratum: PhStratum;
  firstFollowUp: { testId: string; takenAt: number; value: number; belowDetection: boolean } | null;
  /** When the clock to clearing stopped: the clearing test, else the last follow-up reading, else the start. */
  clockStoppedAt: number;
  cleared: boolean;
  censoredBy: CensoringCause | null;
  clearedAt: number | null;
  recurrence: RecurrenceOutcome | null;
}

/** Orders courses as buildCourses does: by pool id (as text), then by start. */
export function courseOrder(a: Pick<KeptCourse, "poolId" | "seq">, b: Pick<KeptCourse, "poolId" | "seq">): number {
  if (a.poolId !== b.poolId) return a.poolId < b.poolId ? -1 : 1;
  return a.seq - b.seq;
}

/**
 * Every metal treatment course of some pools, followed on each metal, under
 * one set of levels. `treatments` are the pools' treatments and `tests` their
 * tests (any analyte, with pH), both ordered by pool, time and id. A pool's
 * rows depend only on its own treatments and tests.
 */
export function keptCoursesOf(treatments: readonly TreatmentRecord[], tests: readonly OutcomeTest[], thresholds: MetalThresholds): KeptCourse[] {
  const categories = DEFAULT_OUTCOME_RULES.courseCategories;
  const applied = treatments.filter((t) => categories.includes(t.category));
  const courses = buildCourses(applied);
  if (courses.length === 0) return [];
  const treated = new Set(courses.map((c) => c.poolId));
  const read = tests.filter((t) => treated.has(t.poolId) && (t.copper || t.iron || t.manganese || (t.ph !== null && t.ph !== undefined)));
  const near = testsNearTreatments(read, applied);
  const rows: KeptCourse[] = [];
  for (const metal of METALS) {
    let seq = 0;
    let pool: string | null = null;
    for (const outcome of courseOutcomes(courses, near, metal, { thresholds })) {
      seq = outcome.course.poolId === pool ? seq + 1 : 0;
      pool = outcome.course.poolId;
      rows.push(keptCourseOf(outcome, seq));
    }
  }
  return rows;
}

export function keptCourseOf(outcome: CourseOutcome, seq: number): KeptCourse {
  const { course, timeToClear } = outcome;
  return {
    poolId: course.poolId,
    metal: outcome.metal,
    seq,
    startAt: course.startAt,
    treatments: course.treatments,
    combination: course.combination,
    categoryCombination: course.categoryCombination,
    cost: course.cost,
    costComplete: course.costComplete,
    baseline: outcome.baseline,
    ineligible: outcome.ineligible,
    phAtTreatment: outcome.phAtTreatment,
    phStratum: outcome.phStratum,
    firstFollowUp: outcome.firstFollowUp
      ? {
          testId: outcome.firstFollowUp.testId,
          takenAt: outcome.firstFollowUp.takenAt,
          value: outcome.firstFollowUp.value,
          belowDetection: outcome.firstFollowUp.belowDetection,
        }
      : null,
    // Test times are whole milliseconds: rounding undoes the division into days exactly.
    clockStoppedAt: outcome.clearedAt ?? Math.round(course.startAt + timeToClear.days * DAY_MS),
    cleared: timeToClear.cleared,
    censoredBy: timeToClear.censoredBy,
    clearedAt: outcome.clearedAt,
    recurrence: outcome.recurrence,
  };
}

/** The course outcome a kept row stands for, with the derived quantities worked out as courseOutcomes does. */
export function outcomeOfKept(row: KeptCourse): CourseOutcome {
  const { baseline, firstFollowUp, ineligible } = row;
  const percentReduction = percentFall(ineligible, baseline?.value ?? null, firstFollowUp?.value ?? null);
  return {
    course: courseOf(row.treatments),
    metal: row.metal,
    baseline,
    ineligible,
    phAtTreatment: row.phAtTreatment,
    phStratum: row.phStratum,
    firstFollowUp: firstFollowUp ? { ...firstFollowUp, daysAfter: (firstFollowUp.takenAt - row.startAt) / DAY_MS } : null,
    percentReduction,
    reductionIsAtLeast: percentReduction !== null && firstFollowUp!.belowDetection,
    timeToClear: { days: (row.clockStoppedAt - row.startAt) / DAY_MS, cleared: row.cleared, censoredBy: row.censoredBy },
    clearedAt: row.clearedAt,
    recurrence: row.recurrence,
  };
}
