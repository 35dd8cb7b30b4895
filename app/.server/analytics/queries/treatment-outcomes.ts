import { and, eq, inArray, isNotNull, or } from "drizzle-orm";
import type { Metal, MetalThresholds } from "@analysis/metals/reading";
import { armCourseOf, escalationDue, summariseArmCourses, type ArmCourse, type ArmDimension, type ArmResult } from "@analysis/outcomes/summary";
import { testsNearTreatments } from "@analysis/outcomes/kept-courses";
import { buildCourses, courseOutcomes, DEFAULT_OUTCOME_RULES } from "@analysis/outcomes/treatments";
import { CATEGORY_WORDS } from "~/lib/analytics/labels";
import { isoInstant, jsonInterval, type JsonInterval } from "@analysis/json-shapes";
import { db } from "../../db/client";
import { pools, products, waterTests } from "../../db/schema";
import type { Scope } from "../../scope";
import { keptArmCourses } from "../kept/keep-courses";
import { keptVersionFor, type AnswerSource } from "../kept/read-kept";
import { anyMetalMeasured, treatmentRows, waterTestReadings } from "./metal-readings";
import { tenantCondition, isWithin, type TimeWindow } from "./tenant-and-window";

export type OutcomeParams = { window: TimeWindow; thresholds: MetalThresholds; metal: Metal; arm: ArmDimension };

export type CurvePoint = { day: number; stillElevated: number; lower: number; upper: number; atRisk: number; cleared: number; censored: number };

export type ArmFigures = {
  courses: number;
  pools: number;
  tooFewToCompare: boolean;
  /** Percent fall from baseline at the first follow-up 3 to 10 days later. */
  reduction: { count: number; median: number | null; mean: number | null };
  /** Kaplan-Meier share of courses still not clear, day by day. */
  timeToClear: { curve: CurvePoint[]; medianDays: number | null; medianLower: number | null; medianUpper: number | null; cleared: number };
  clearedPools: number;
  recurrence: { recurred: number; followed: number; share: JsonInterval | null };
  totalCost: number;
  costComplete: boolean;
  costPerClearedPool: number | null;
};

export type OutcomeArm = ArmFigures & { arm: string; label: string; byPh: { inside: ArmFigures; outside: ArmFigures; unknown: ArmFigures } };

export type TreatmentOutcomes = {
  metal: Metal;
  arm: ArmDimension;
  rules: { minPoolsToCompare: number; phBand: { low: number; high: number }; followUpDays: number; recurrenceAfterClearDays: number };
  courses: number;
  eligibleCourses: number;
  ineligible: Record<string, number>;
  arms: OutcomeArm[];
  escalation: Array<{ poolId: number; street: string; coursesWithoutClearing: number; since: string }>;
  source: AnswerSource;
};

function figures(result: ArmResult): ArmFigures {
  const curve = [
    { day: 0, stillElevated: 1, lower: 1, upper: 1, atRisk: result.timeToClear.observations, cleared: 0, censored: 0 },
    ...result.timeToClear.steps.map((s) => ({
      day: s.time,
      stillElevated: s.survival,
      lower: s.lower,
      upper: s.upper,
      atRisk: s.atRisk,
      cleared: s.events,
      censored: s.censored,
    })),
  ];
  return {
    courses: result.courses,
    pools: result.pools,
    tooFewToCompare: result.tooFewToCompare,
    reduction: result.reduction,
    timeToClear: {
      curve,
      medianDays: result.timeToClear.median,
      medianLower: result.timeToClear.medianLower,
      medianUpper: result.timeToClear.medianUpper,
      cleared: result.clearedCourses,
    },
    clearedPools: result.clearedPools,
    recurrence: { ...result.recurrence, share: result.recurrence.share ? jsonInterval(result.recurrence.share) : null },
    totalCost: result.totalCost,
    costComplete: result.costComplete,
    costPerClearedPool: result.costPerClearedPool,
  };
}

const COURSE_CATEGORIES = ["sequestrant", "collector_pad", "ph_decreaser"] as const;

/**
 * How metal treatments did: per product, category or combination, the fall
 * at the first follow-up, Kaplan-Meier time to clear, recurrence after
 * clearing and cost per cleared pool, each also split by pH at treatment.
 * Without a date window and under the company's levels, the courses come
 * from the kept results (a technician's: their routes' pools, as read from
 * the tests); otherwise they are worked out from the treatments and tests.
 */
export async function treatmentOutcomes(scope: Scope, params: OutcomeParams): Promise<TreatmentOutcomes> {
  const versionId = await keptVersionFor(scope.companyId, params);
  if (versionId !== null) {
    const courses = await keptArmCourses({ scope }, versionId, params.metal, params.arm);
    return outcomesAnswer(scope, params, courses, await productNamesOf(scope, params.arm, courses), "kept");
  }
  // Every metal treatment bounds the tests kept; only those in the window form courses.
  const everyApplied = await treatmentRows({ scope }, { categories: COURSE_CATEGORIES });
  const applied = everyApplied.filter((t) => isWithin(t.appliedAt, params.window));
  const courses = buildCourses(applied);
  const treatedPools = [...new Set(courses.map((c) => Number(c.poolId)))];
  const read = await waterTestReadings({ scope }, { poolIds: treatedPools, with: { ph: true }, where: or(anyMetalMeasured(), isNotNull(waterTests.ph)) });
  const tests = testsNearTreatments(read, everyApplied);
  const outcomes = courseOutcomes(courses, tests, params.metal, { thresholds: params.thresholds }).map((o) => armCourseOf(o, params.arm));
  return outcomesAnswer(scope, params, outcomes, new Map(applied.map((t) => [t.productId, t.productName])), "recomputed");
}

/** The names of the products that product and combination arms are made of. */
async function productNamesOf(scope: Scope, arm: ArmDimension, courses: readonly ArmCourse[]): Promise<Map<string, string>> {
  if (arm !== "product" && arm !== "combination") return new Map();
  const keys = new Set<string>();
  for (const c of courses) for (const key of c.arms) keys.add(key);
  const ids = new Set([...keys].flatMap((key) => key.split(" + ").map(Number)));
  if (ids.size === 0) return new Map();
  const named = await db()
    .select({ id: products.id, name: products.name })
    .from(products)
    .where(and(eq(products.companyId, scope.companyId), inArray(products.id, [...ids])));
  return new Map(named.map((p) => [String(p.id), p.name]));
}

async function outcomesAnswer(
  scope: Scope,
  params: OutcomeParams,
  courses: ArmCourse[],
  productNames: ReadonlyMap<string, string>,
  source: AnswerSource,
): Promise<TreatmentOutcomes> {
  const summaries = summariseArmCourses(courses);

  // Parts of a combination are named in alphabetical order, whatever their ids.
  const joinNames = (names: string[]) => names.sort((a, b) => a.localeCompare(b)).join(" + ");
  const label = (arm: string) => {
    if (params.arm === "product") return productNames.get(arm) ?? arm;
    if (params.arm === "category") return CATEGORY_WORDS[arm] ?? arm;
    if (params.arm === "combination") return joinNames(arm.split(" + ").map((id) => productNames.get(id) ?? id));
    return joinNames(arm.split(" + ").map((c) => CATEGORY_WORDS[c] ?? c));
  };

  const ineligible: Record<string, number> = {};
  for (const c of courses) if (c.ineligible) ineligible[c.ineligible] = (ineligible[c.ineligible] ?? 0) + 1;

  const hints = escalationDue(courses);
  const streets = hints.length
    ? new Map(
        (await db().select({ id: pools.id, street: pools.street }).from(pools).where(and(tenantCondition({ scope }), inArray(pools.id, hints.map((h) => Number(h.poolId)))))).map(
          (p) => [p.id, p.street],
        ),
      )
    : new Map<number, string>();

  return {
    metal: params.metal,
    arm: params.arm,
    rules: {
      minPoolsToCompare: DEFAULT_OUTCOME_RULES.minPoolsToCompare,
      phBand: DEFAULT_OUTCOME_RULES.phBand,
      followUpDays: DEFAULT_OUTCOME_RULES.followUpDays,
      recurrenceAfterClearDays: DEFAULT_OUTCOME_RULES.recurrenceAfterClearDays,
    },
    courses: courses.length,
    eligibleCourses: courses.filter((c) => c.ineligible === null).length,
    ineligible,
    arms: summaries.map((s) => ({
      arm: s.arm,
      label: label(s.arm),
      ...figures(s),
      byPh: { inside: figures(s.byPh.inside), outside: figures(s.byPh.outside), unknown: figures(s.byPh.unknown) },
    })),
    escalation: hints.map((h) => ({
      poolId: Number(h.poolId),
      street: streets.get(Number(h.poolId)) ?? "",
      coursesWithoutClearing: h.coursesWithoutClearing,
      since: isoInstant(h.since)!,
    })),
    source,
  };
}
