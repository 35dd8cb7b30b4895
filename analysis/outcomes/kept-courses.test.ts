import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { DAY_MS } from "../metals/episodes";
import { DEFAULT_METAL_THRESHOLDS, METALS, type MetalReading } from "../metals/reading";
import { courseOrder, keptCoursesOf, outcomeOfKept, testsNearTreatments, type KeptCourse } from "./kept-courses";
import { armCourseOf, escalationDue, summariseOutcomes, type ArmDimension } from "./summary";
import { buildCourses, courseOutcomes, DEFAULT_OUTCOME_RULES, type OutcomeTest, type ProductCategory, type TreatmentRecord } from "./treatments";

const T0 = Date.UTC(2024, 5, 3, 9);
const day = (n: number) => T0 + n * DAY_MS;
const cu = (value: number, belowDetection = false): MetalReading => ({ value, belowDetection });
const ARMS: ArmDimension[] = ["product", "category", "combination", "category-combination"];

/** What the recomputed answer does with every treatment and test of the tenant. */
function recomputed(treatments: readonly TreatmentRecord[], tests: readonly OutcomeTest[], metal: (typeof METALS)[number]) {
  const applied = treatments.filter((t) => DEFAULT_OUTCOME_RULES.courseCategories.includes(t.category));
  const courses = buildCourses(applied);
  const treated = new Set(courses.map((c) => c.poolId));
  const read = tests.filter((t) => treated.has(t.poolId) && (t.copper || t.iron || t.manganese || typeof t.ph === "number"));
  return courseOutcomes(courses, testsNearTreatments(read, applied), metal, { thresholds: DEFAULT_METAL_THRESHOLDS });
}

const keptOutcomes = (rows: readonly KeptCourse[], metal: (typeof METALS)[number]) =>
  rows.filter((r) => r.metal === metal).sort(courseOrder).map(outcomeOfKept);

describe("kept treatment courses", () => {
  // Copper, default levels (elevated 0.3, clear 0.1: common practice, no published source).
  // Pool 1: baseline 0.6 the hour before a sequestrant, pad a day later (one course); day 5 0.3 (a 50 % fall),
  //   day 12 "<0.05" clears; a later test 200 days on lies beyond the follow-up of any treatment.
  // Pool 2: acid alone (no course), then a sequestrant on day 40 with baseline 0.5 on day 38, no later tests.
  const tests: OutcomeTest[] = [
    { id: "a", poolId: "1", takenAt: day(0) - 3_600_000, copper: cu(0.6), ph: 7.4 },
    { id: "b", poolId: "1", takenAt: day(5), copper: cu(0.3) },
    { id: "c", poolId: "1", takenAt: day(12), copper: cu(0.05, true) },
    { id: "d", poolId: "1", takenAt: day(200), copper: cu(0.4) },
    { id: "e", poolId: "2", takenAt: day(38), copper: cu(0.5), ph: 7.9 },
  ];
  const treatments: TreatmentRecord[] = [
    { id: "1", poolId: "1", productId: "9", category: "sequestrant", appliedAt: day(0), cost: 30 },
    { id: "2", poolId: "1", productId: "4", category: "metal-collector-pad", appliedAt: day(1), cost: 20 },
    { id: "3", poolId: "2", productId: "5", category: "ph-decreaser", appliedAt: day(0), cost: null },
    { id: "4", poolId: "2", productId: "9", category: "sequestrant", appliedAt: day(40), cost: null },
  ];

  it("keeps each course on each metal with the facts its outcome is worked out from", () => {
    const rows = keptCoursesOf(treatments, tests, DEFAULT_METAL_THRESHOLDS);
    expect(rows).toHaveLength(2 * METALS.length);
    const [first, second] = rows.filter((r) => r.metal === "copper");
    expect(first).toMatchObject({
      poolId: "1",
      seq: 0,
      combination: "4 + 9",
      categoryCombination: "metal-collector-pad + sequestrant",
      cost: 50,
      costComplete: true,
      baseline: { testId: "a", value: 0.6, status: "elevated" },
      ineligible: null,
      phAtTreatment: 7.4,
      phStratum: "inside",
      firstFollowUp: { testId: "b", takenAt: day(5), value: 0.3, belowDetection: false },
      clockStoppedAt: day(12),
      cleared: true,
      clearedAt: day(12),
      // Cleared on day 12; the day-200 test is past the look-ahead of any treatment and is not read.
      recurrence: "not-followed-long-enough",
    });
    expect(second).toMatchObject({ poolId: "2", seq: 0, costComplete: false, phStratum: "outside", cleared: false, censoredBy: "end-of-data", clockStoppedAt: day(40) });
    const copper = keptOutcomes(rows, "copper");
    expect(copper[0]!.percentReduction).toBe(50);
    expect(copper[0]!.timeToClear.days).toBe(12);
    // Iron was never measured: no baseline, so no course can show an effect on it.
    expect(rows.filter((r) => r.metal === "iron").map((r) => r.ineligible)).toEqual(["no-baseline", "no-baseline"]);
  });

  it("gives back the outcomes courseOutcomes finds", () => {
    const rows = keptCoursesOf(treatments, tests, DEFAULT_METAL_THRESHOLDS);
    for (const metal of METALS) expect(keptOutcomes(rows, metal)).toEqual(recomputed(treatments, tests, metal));
  });

  const poolIds = ["1", "2", "10"];
  const categories: ProductCategory[] = ["sequestrant", "metal-collector-pad", "ph-decreaser", "chlorine", "copper-algaecide"];
  const reading = fc.option(
    fc.record({ value: fc.constantFrom(0, 0.05, 0.1, 0.2, 0.3, 0.45, 0.8), belowDetection: fc.boolean() }),
    { nil: null, freq: 2 },
  );
  const history = fc.record({
    treatments: fc.array(
      fc.record({
        poolId: fc.constantFrom(...poolIds),
        productId: fc.constantFrom("3", "7", "12"),
        category: fc.constantFrom(...categories),
        day: fc.integer({ min: 0, max: 160 }),
        hour: fc.nat(23),
        cost: fc.option(fc.constantFrom(12.5, 30, 7.25), { nil: null }),
      }),
      { maxLength: 14 },
    ),
    tests: fc.array(
      fc.record({
        poolId: fc.constantFrom(...poolIds),
        day: fc.integer({ min: -10, max: 330 }),
        minute: fc.nat(1439),
        copper: reading,
        iron: reading,
        manganese: reading,
        ph: fc.option(fc.constantFrom(6.9, 7.2, 7.4, 7.6, 8.1), { nil: null }),
      }),
      { maxLength: 40 },
    ),
  });

  type History = typeof history extends fc.Arbitrary<infer H> ? H : never;

  /** Ordered by pool, time and id, as the database reads them. */
  function materialise(h: History): { treatments: TreatmentRecord[]; tests: OutcomeTest[] } {
    const order = <T extends { poolId: string; at: number; id: string }>(a: T, b: T) =>
      Number(a.poolId) - Number(b.poolId) || a.at - b.at || Number(a.id) - Number(b.id);
    const treatments = h.treatments
      .map((t, i) => ({ id: String(i + 1), poolId: t.poolId, productId: t.productId, category: t.category, at: day(t.day) + t.hour * 3_600_000, cost: t.cost }))
      .sort(order)
      .map(({ at, ...t }) => ({ ...t, appliedAt: at }));
    const tests = h.tests
      .map((t, i) => ({ id: String(i + 1), poolId: t.poolId, at: day(t.day) + t.minute * 60_000, copper: t.copper, iron: t.iron, manganese: t.manganese, ph: t.ph }))
      .sort(order)
      .map(({ at, ...t }) => ({ ...t, takenAt: at }));
    return { treatments, tests };
  }

  const byMetalAndCourse = (rows: KeptCourse[]) =>
    [...rows].sort((a, b) => METALS.indexOf(a.metal) - METALS.indexOf(b.metal) || courseOrder(a, b));

  it("kept pool by pool are the rows worked out for every pool at once", () => {
    fc.assert(
      fc.property(history, (h) => {
        const { treatments, tests } = materialise(h);
        const atOnce = keptCoursesOf(treatments, tests, DEFAULT_METAL_THRESHOLDS);
        const poolByPool = poolIds.flatMap((p) =>
          keptCoursesOf(treatments.filter((t) => t.poolId === p), tests.filter((t) => t.poolId === p), DEFAULT_METAL_THRESHOLDS),
        );
        expect(byMetalAndCourse(poolByPool)).toEqual(byMetalAndCourse(atOnce));
      }),
      { numRuns: 300 },
    );
  });

  it("summarise to the same arms and escalation hints as the outcomes worked out from the tests", () => {
    fc.assert(
      fc.property(history, (h) => {
        const { treatments, tests } = materialise(h);
        const rows = keptCoursesOf(treatments, tests, DEFAULT_METAL_THRESHOLDS);
        for (const metal of METALS) {
          const direct = recomputed(treatments, tests, metal);
          const kept = keptOutcomes(rows, metal);
          expect(kept).toEqual(direct);
          for (const arm of ARMS) expect(summariseOutcomes(kept, arm)).toEqual(summariseOutcomes(direct, arm));
          expect(escalationDue(kept.map((o) => armCourseOf(o, "combination")))).toEqual(escalationDue(direct.map((o) => armCourseOf(o, "combination"))));
        }
      }),
      { numRuns: 300 },
    );
  });
});
