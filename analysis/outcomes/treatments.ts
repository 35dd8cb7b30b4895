import { bisector } from "d3-array";
import { DAY_MS, type MetalTest } from "../metals/episodes";
import { DEFAULT_METAL_THRESHOLDS, metalStatus, type Metal, type MetalStatus, type MetalThresholds } from "../metals/reading";

export type ProductCategory =
  | "sequestrant"
  | "metal-collector-pad"
  | "ph-decreaser"
  | "copper-algaecide"
  | "other-algaecide"
  | "chlorine"
  | "other";

export interface TreatmentRecord {
  id: string;
  poolId: string;
  productId: string;
  category: ProductCategory;
  appliedAt: number;
  /** Cost of this application in the company's currency; null when not recorded. */
  cost?: number | null;
}

/** A test as the outcome analysis needs it: metals plus pH at treatment. */
export interface OutcomeTest extends MetalTest {
  ph?: number | null;
}

export interface OutcomeRules {
  /** Treatments on one pool within this many days of the first form one course (e.g. sequestrant plus pad). */
  combineWithinDays: number;
  /** Baseline: a reading at the same visit or within this many days before. */
  baselineLookbackDays: number;
  /** A test this soon after the treatment still belongs to the treatment visit. */
  sameVisitHours: number;
  followUpDays: number;
  reductionWindowDays: { from: number; to: number };
  recurrenceAfterClearDays: number;
  /** pH band in which sequestrants work best: common practice (no published source). */
  phBand: { low: number; high: number };
  /** Fewer treated pools than this: "too few to compare". */
  minPoolsToCompare: number;
  /** Categories that act on metals and so start a course. */
  courseCategories: readonly ProductCategory[];
}

export const DEFAULT_OUTCOME_RULES: OutcomeRules = {
  combineWithinDays: 3,
  baselineLookbackDays: 7,
  sameVisitHours: 4,
  followUpDays: 30,
  reductionWindowDays: { from: 3, to: 10 },
  recurrenceAfterClearDays: 90,
  phBand: { low: 7.2, high: 7.6 },
  minPoolsToCompare: 5,
  courseCategories: ["sequestrant", "metal-collector-pad", "ph-decreaser"],
};

/** Treatments on one pool applied together, started by one that acts on metals. */
export interface TreatmentCourse {
  poolId: string;
  startAt: number;
  treatments: TreatmentRecord[];
  productIds: string[];
  categories: ProductCategory[];
  /** Sorted product ids joined with " + ". */
  combination: string;
  /** Sorted categories joined with " + ". */
  categoryCombination: string;
  cost: number;
  costComplete: boolean;
}

const unique = <T extends string>(values: readonly T[]): T[] => [...new Set(values)].sort();

/**
 * Groups treatments into courses. pH decreaser on its own is not a metal
 * treatment, so a course must contain at least one other course category.
 */
export function buildCourses(treatments: readonly TreatmentRecord[], rulesOverride: Partial<OutcomeRules> = {}): TreatmentCourse[] {
  const rules = { ...DEFAULT_OUTCOME_RULES, ...rulesOverride };
  const relevant = treatments
    .filter((t) => rules.courseCategories.includes(t.category))
    .sort((a, b) => (a.poolId < b.poolId ? -1 : a.poolId > b.poolId ? 1 : a.appliedAt - b.appliedAt));
  const groups: TreatmentRecord[][] = [];
  for (const t of relevant) {
    const current = groups[groups.length - 1];
    const first = current?.[0];
    if (current && first && first.poolId === t.poolId && t.appliedAt - first.appliedAt <= rules.combineWithinDays * DAY_MS) {
      current.push(t);
    } else {
      groups.push([t]);
    }
  }
  return groups.filter((group) => group.some((t) => t.category !== "ph-decreaser")).map(courseOf);
}

/** The course made of treatments grouped together, the first of them starting it. */
export function courseOf(group: TreatmentRecord[]): TreatmentCourse {
  const productIds = unique(group.map((t) => t.productId));
  const categories = unique(group.map((t) => t.category));
  return {
    poolId: group[0]!.poolId,
    startAt: group[0]!.appliedAt,
    treatments: group,
    productIds,
    categories,
    combination: productIds.join(" + "),
    categoryCombination: categories.join(" + "),
    cost: group.reduce((sum, t) => sum + (t.cost ?? 0), 0),
    costComplete: group.every((t) => typeof t.cost === "number"),
  };
}

export type PhStratum = "inside" | "outside" | "unknown";

export type CensoringCause = "follow-up-window" | "end-of-data" | "different-treatment";

export type RecurrenceOutcome = "recurred" | "stayed-clear" | "not-followed-long-enough";

export type Ineligible = "no-baseline" | "baseline-clear" | "baseline-below-detection";

export interface CourseOutcome {
  course: TreatmentCourse;
  metal: Metal;
  baseline: { testId: string; takenAt: number; value: number; status: MetalStatus } | null;
  /** Why the course cannot show an effect on this metal; null when it can. */
  ineligible: Ineligible | null;
  phAtTreatment: number | null;
  phStratum: PhStratum;
  firstFollowUp: { testId: string; takenAt: number; daysAfter: number; value: number; belowDetection: boolean } | null;
  /** Percent fall from baseline at the first follow-up 3 to 10 days later. */
  percentReduction: number | null;
  /** True when the follow-up read "<x": the fall is at least this much. */
  reductionIsAtLeast: boolean;
  timeToClear: { days: number; cleared: boolean; censoredBy: CensoringCause | null };
  clearedAt: number | null;
  recurrence: RecurrenceOutcome | null;
}

/** Percent fall from the baseline at the first follow-up; null for an ineligible course, a missing reading or a zero baseline. */
export function percentFall(ineligible: Ineligible | null, baseline: number | null, firstFollowUp: number | null): number | null {
  return ineligible === null && baseline !== null && firstFollowUp !== null && baseline > 0 ? ((baseline - firstFollowUp) / baseline) * 100 : null;
}

const byTime = bisector((t: OutcomeTest) => t.takenAt);

function phStratum(ph: number | null, band: OutcomeRules["phBand"]): PhStratum {
  if (ph === null) return "unknown";
  return ph >= band.low && ph <= band.high ? "inside" : "outside";
}

/**
 * Follows each course on one metal: baseline, first follow-up, time to clear
 * (censored at the end of the follow-up window, at the end of the data, or
 * when a different treatment starts), and recurrence after clearing.
 */
export function courseOutcomes(
  courses: readonly TreatmentCourse[],
  tests: readonly OutcomeTest[],
  metal: Metal,
  options: { rules?: Partial<OutcomeRules>; thresholds?: MetalThresholds } = {},
): CourseOutcome[] {
  const rules = { ...DEFAULT_OUTCOME_RULES, ...options.rules };
  const levels = (options.thresholds ?? DEFAULT_METAL_THRESHOLDS)[metal];
  const testsByPool = new Map<string, OutcomeTest[]>();
  for (const t of tests) {
    const list = testsByPool.get(t.poolId);
    if (list) list.push(t);
    else testsByPool.set(t.poolId, [t]);
  }
  for (const list of testsByPool.values()) list.sort((a, b) => a.takenAt - b.takenAt);
  const coursesByPool = new Map<string, TreatmentCourse[]>();
  for (const c of courses) coursesByPool.set(c.poolId, [...(coursesByPool.get(c.poolId) ?? []), c]);
  for (const list of coursesByPool.values()) list.sort((a, b) => a.startAt - b.startAt);

  const visitMs = rules.sameVisitHours * 3_600_000;
  return courses.map((course) => {
    const poolTests = testsByPool.get(course.poolId) ?? [];
    const visitEnd = course.startAt + visitMs;
    const lookbackStart = course.startAt - rules.baselineLookbackDays * DAY_MS;
    const fromIndex = byTime.left(poolTests, lookbackStart);
    const afterVisitIndex = byTime.right(poolTests, visitEnd);
    const around = poolTests.slice(fromIndex, afterVisitIndex);
    const baselineTest = around.findLast((t) => t[metal]);
    const phTest = around.findLast((t) => typeof t.ph === "number");
    const phAtTreatment = phTest?.ph ?? null;
    const reading = baselineTest?.[metal] ?? null;
    const baseline = baselineTest && reading
      ? { testId: baselineTest.id, takenAt: baselineTest.takenAt, value: reading.value, status: metalStatus(reading, levels) }
      : null;
    const ineligible: Ineligible | null = !baseline
      ? "no-baseline"
      : baseline.status === "clear"
        ? "baseline-clear"
        : reading?.belowDetection
          ? "baseline-below-detection"
          : null;

    const laterCourse = (coursesByPool.get(course.poolId) ?? []).find(
      (c) => c.startAt > course.startAt && c.combination !== course.combination,
    );
    const windowEnd = course.startAt + rules.followUpDays * DAY_MS;
    const followUpEnd = Math.min(windowEnd, laterCourse ? laterCourse.startAt - 1 : Infinity);
    const followUps = poolTests
      .slice(afterVisitIndex, byTime.right(poolTests, followUpEnd))
      .filter((t) => t[metal]);
    const daysAfter = (t: OutcomeTest) => (t.takenAt - course.startAt) / DAY_MS;

    const first = followUps.find((t) => {
      const d = daysAfter(t);
      return d >= rules.reductionWindowDays.from && d <= rules.reductionWindowDays.to;
    });
    const firstReading = first?.[metal] ?? null;
    const firstFollowUp = first && firstReading
      ? { testId: first.id, takenAt: first.takenAt, daysAfter: daysAfter(first), value: firstReading.value, belowDetection: firstReading.belowDetection }
      : null;
    const percentReduction = percentFall(ineligible, baseline?.value ?? null, firstFollowUp?.value ?? null);

    const clearing = followUps.find((t) => metalStatus(t[metal]!, levels) === "clear");
    let timeToClear: CourseOutcome["timeToClear"];
    if (clearing) {
      timeToClear = { days: daysAfter(clearing), cleared: true, censoredBy: null };
    } else {
      const lastSeen = followUps[followUps.length - 1];
      const poolLastTest = poolTests[poolTests.length - 1]?.takenAt ?? course.startAt;
      const censoredBy: CensoringCause =
        laterCourse && laterCourse.startAt <= windowEnd ? "different-treatment" : poolLastTest < windowEnd ? "end-of-data" : "follow-up-window";
      timeToClear = { days: lastSeen ? daysAfter(lastSeen) : 0, cleared: false, censoredBy };
    }
    const clearedAt = clearing?.takenAt ?? null;

    let recurrence: RecurrenceOutcome | null = null;
    if (clearedAt !== null) {
      const horizon = clearedAt + rules.recurrenceAfterClearDays * DAY_MS;
      const after = poolTests.slice(byTime.right(poolTests, clearedAt)).filter((t) => t[metal]);
      if (after.some((t) => t.takenAt <= horizon && metalStatus(t[metal]!, levels) === "elevated")) recurrence = "recurred";
      else if (after.some((t) => t.takenAt >= horizon)) recurrence = "stayed-clear";
      else recurrence = "not-followed-long-enough";
    }

    return {
      course,
      metal,
      baseline,
      ineligible,
      phAtTreatment,
      phStratum: phStratum(phAtTreatment, rules.phBand),
      firstFollowUp,
      percentReduction,
      reductionIsAtLeast: percentReduction !== null && firstFollowUp!.belowDetection,
      timeToClear,
      clearedAt,
      recurrence,
    };
  });
}

