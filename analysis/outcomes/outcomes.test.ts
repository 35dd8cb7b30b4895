import { describe, expect, it } from "vitest";
import { DAY_MS } from "../metals/episodes";
import type { MetalReading } from "../metals/reading";
import { kaplanMeier } from "../stats/survival";
import { armCourseOf, compareArms, escalationDue, summariseOutcomes } from "./summary";
import { buildCourses, courseOutcomes, type OutcomeTest, type TreatmentRecord } from "./treatments";

const T0 = Date.UTC(2024, 5, 3, 9);
const day = (n: number) => T0 + n * DAY_MS;
const cu = (value: number, belowDetection = false): MetalReading => ({ value, belowDetection });
let seq = 0;
const test = (poolId: string, at: number, copper: MetalReading | null, ph: number | null = null): OutcomeTest => ({ id: `t${seq++}`, poolId, takenAt: at, copper, ph });
const treat = (poolId: string, at: number, productId: string, category: TreatmentRecord["category"], cost: number | null = 30): TreatmentRecord => ({
  id: `${poolId}-${productId}-${at}`, poolId, productId, category, appliedAt: at, cost,
});

// Scenario, copper, thresholds 0.3 elevated / 0.1 clear (common practice, no published source):
// p1: test day 0 -1h 0.6 pH 7.4 (same visit) | seq S1 day 0 ($30) + pad P1 day 1 ($20): one course "P1 + S1", $50
//     day 2 0.5 (too early for the reduction), day 5 0.3 -> reduction (0.6 - 0.3) / 0.6 = 50 %
//     day 12 <0.05 -> clear after 12 days; day 60 0.35 elevated within 90 days -> recurred
// p2: test day -3 0.4 pH 8.0 (baseline, 3 days before) | S1 day 0 ($30)
//     day 7 0.35 -> reduction 12.5 %; day 14 0.3; pad P1 day 20 -> S1 censored at day 14 by a different treatment
//     P1 course: baseline day 14 0.3 (6 days before) pH unknown; day 30 0.05 -> 10 days, reduction 83.3 %, clear
//     day 130 0.08 -> no elevated reading within 90 days of day 30 and followed past day 120 -> stayed clear
// p3: test day 0 -1h 0.05 (clear) | S1 day 0 -> baseline already clear: not eligible
// p4: test day -8 0.5 | S1 day 0 -> no baseline within 7 days
// p5: test day 0 -1h 0.45 pH 7.3 | S1 day 0, no later tests -> censored at 0 days, end of data
// p6: acid on its own day 0 -> not a metal course
const tests: OutcomeTest[] = [
  test("p1", day(0) - 3_600_000, cu(0.6), 7.4), test("p1", day(2), cu(0.5)), test("p1", day(5), cu(0.3)),
  test("p1", day(12), cu(0.05, true)), test("p1", day(60), cu(0.35)),
  test("p2", day(-3), cu(0.4), 8.0), test("p2", day(7), cu(0.35)), test("p2", day(14), cu(0.3)),
  test("p2", day(30), cu(0.05)), test("p2", day(130), cu(0.08)),
  test("p3", day(0) - 3_600_000, cu(0.05)),
  test("p4", day(-8), cu(0.5)),
  test("p5", day(0) - 3_600_000, cu(0.45), 7.3),
];
const treatments: TreatmentRecord[] = [
  treat("p1", day(0), "S1", "sequestrant"), treat("p1", day(1), "P1", "metal-collector-pad", 20),
  treat("p2", day(0), "S1", "sequestrant"), treat("p2", day(20), "P1", "metal-collector-pad", 20),
  treat("p3", day(0), "S1", "sequestrant"), treat("p4", day(0), "S1", "sequestrant"), treat("p5", day(0), "S1", "sequestrant"),
  treat("p6", day(0), "A1", "ph-decreaser", 5),
];

describe("treatment courses and outcomes", () => {
  const courses = buildCourses(treatments);
  const outcomes = courseOutcomes(courses, tests, "copper");
  const of = (poolId: string, combination: string) => outcomes.find((o) => o.course.poolId === poolId && o.course.combination === combination)!;

  it("combines treatments within 3 days and drops acid on its own", () => {
    expect(courses.map((c) => [c.poolId, c.combination, c.cost])).toEqual([
      ["p1", "P1 + S1", 50], ["p2", "S1", 30], ["p2", "P1", 20], ["p3", "S1", 30], ["p4", "S1", 30], ["p5", "S1", 30],
    ]);
    expect(courses[0]!.categoryCombination).toBe("metal-collector-pad + sequestrant");
  });

  it("p1: same-visit baseline, 50 % reduction, clear at 12 days, recurred", () => {
    const o = of("p1", "P1 + S1");
    expect(o.baseline).toMatchObject({ value: 0.6, status: "elevated" });
    expect(o.phStratum).toBe("inside");
    expect(o.firstFollowUp?.daysAfter).toBe(5);
    expect(o.percentReduction).toBeCloseTo(50, 10);
    expect(o.timeToClear).toEqual({ days: 12, cleared: true, censoredBy: null });
    expect(o.recurrence).toBe("recurred");
  });

  it("p2: censored by a different treatment, then the pad clears and stays clear", () => {
    const s1 = of("p2", "S1");
    expect(s1.phAtTreatment).toBe(8.0);
    expect(s1.phStratum).toBe("outside");
    expect(s1.percentReduction).toBeCloseTo(12.5, 10);
    expect(s1.timeToClear).toEqual({ days: 14, cleared: false, censoredBy: "different-treatment" });
    const p1 = of("p2", "P1");
    expect(p1.baseline).toMatchObject({ value: 0.3 });
    expect(p1.phStratum).toBe("unknown");
    expect(p1.percentReduction).toBeCloseTo((0.25 / 0.3) * 100, 10);
    expect(p1.timeToClear).toEqual({ days: 10, cleared: true, censoredBy: null });
    expect(p1.recurrence).toBe("stayed-clear");
  });

  it("p3, p4, p5: clear baseline, no baseline, end of data", () => {
    expect(of("p3", "S1").ineligible).toBe("baseline-clear");
    expect(of("p4", "S1").ineligible).toBe("no-baseline");
    expect(of("p5", "S1")).toMatchObject({ ineligible: null, timeToClear: { days: 0, cleared: false, censoredBy: "end-of-data" } });
  });

  it("acid given first belongs to the course but is no product or category arm of its own", () => {
    // p7: acid then sequestrant the next day, one course "A1 + S1"; baseline 0.5 at the visit.
    const withAcid = [treat("p7", day(0), "A1", "ph-decreaser", 5), treat("p7", day(1), "S1", "sequestrant")];
    const acidTests = [test("p7", day(0) - 3_600_000, cu(0.5), 7.9), test("p7", day(6), cu(0.2))];
    const acidOutcomes = courseOutcomes(buildCourses(withAcid), acidTests, "copper");
    expect(acidOutcomes.map((o) => o.course.combination)).toEqual(["A1 + S1"]);
    expect(summariseOutcomes(acidOutcomes, "product").map((a) => a.arm)).toEqual(["S1"]);
    expect(summariseOutcomes(acidOutcomes, "category").map((a) => a.arm)).toEqual(["sequestrant"]);
    expect(summariseOutcomes(acidOutcomes, "combination").map((a) => a.arm)).toEqual(["A1 + S1"]);
  });

  it("summaries by product, combination and pH band", () => {
    const byProduct = summariseOutcomes(outcomes, "product");
    const s1 = byProduct.find((a) => a.arm === "S1")!;
    // S1 eligible courses: p1 (combo, $50, cleared), p2 ($30, censored), p5 ($30, censored): 3 pools.
    expect(s1).toMatchObject({ courses: 3, pools: 3, tooFewToCompare: true, clearedPools: 1, totalCost: 110, costPerClearedPool: 110 });
    // p1 50 % and p2 12.5 %; p5 had no follow-up
    expect(s1.reduction.count).toBe(2);
    expect(s1.reduction.median).toBeCloseTo(31.25, 10);
    expect(s1.reduction.mean).toBeCloseTo(31.25, 10);
    expect(s1.recurrence).toMatchObject({ recurred: 1, followed: 1 });
    expect(s1.byPh.inside.courses).toBe(2); // p1 7.4, p5 7.3
    expect(s1.byPh.outside.courses).toBe(1); // p2 8.0
    expect(s1.timeToClear.steps.map((s) => [s.time, s.survival])).toEqual([[0, 1], [12, 0.5], [14, 0.5]]);
    const byCombination = summariseOutcomes(outcomes, "combination");
    expect(byCombination.map((a) => [a.arm, a.courses])).toEqual([["P1", 1], ["P1 + S1", 1], ["S1", 2]]);
    const byCategory = summariseOutcomes(outcomes, "category-combination");
    expect(byCategory.map((a) => a.arm)).toEqual(["metal-collector-pad", "metal-collector-pad + sequestrant", "sequestrant"]);
  });

  it("five treated pools are enough to compare", () => {
    const many: OutcomeTest[] = [];
    const rx: TreatmentRecord[] = [];
    for (let i = 0; i < 5; i++) {
      many.push(test(`q${i}`, day(-1), cu(0.5)), test(`q${i}`, day(4 + i), cu(0.05)));
      rx.push(treat(`q${i}`, day(0), "S2", "sequestrant"));
    }
    const arm = summariseOutcomes(courseOutcomes(buildCourses(rx), many, "copper"), "product")[0]!;
    expect(arm).toMatchObject({ pools: 5, tooFewToCompare: false, clearedPools: 5 });
    expect(arm.timeToClear.median).toBe(6); // clears at 4,5,6,7,8 days: S drops to 0.4 at day 6
  });
});

describe("comparing two arms", () => {
  it("log-rank and Mann-Whitney on synthetic arms, too-few flag", () => {
    const fast: OutcomeTest[] = [];
    const slow: OutcomeTest[] = [];
    const rxFast: TreatmentRecord[] = [];
    const rxSlow: TreatmentRecord[] = [];
    for (let i = 0; i < 8; i++) {
      fast.push(test(`f${i}`, day(-1), cu(0.6)), test(`f${i}`, day(4), cu(0.2 - i * 0.01)), test(`f${i}`, day(5 + i), cu(0.05)));
      rxFast.push(treat(`f${i}`, day(0), "F", "metal-collector-pad"));
      slow.push(test(`s${i}`, day(-1), cu(0.6)), test(`s${i}`, day(4), cu(0.5 - i * 0.01)), test(`s${i}`, day(15 + i), i < 4 ? cu(0.05) : cu(0.4)));
      rxSlow.push(treat(`s${i}`, day(0), "S", "sequestrant"));
    }
    const a = courseOutcomes(buildCourses(rxFast), fast, "copper");
    const b = courseOutcomes(buildCourses(rxSlow), slow, "copper");
    const cmp = compareArms(a, b);
    expect(cmp.tooFewToCompare).toBe(false);
    expect(cmp.timeToClear.observed).toEqual([8, 4]);
    expect(cmp.timeToClear.pValue).toBeLessThan(0.01);
    expect(cmp.reduction?.statistic).toBe(64); // every fast reduction beats every slow one: W = 8 x 8
    expect(compareArms(a.slice(0, 4), b).tooFewToCompare).toBe(true);
    // the arm's own curve agrees with a direct Kaplan-Meier on the same times
    expect(kaplanMeier(a.map((o) => ({ time: o.timeToClear.days, event: o.timeToClear.cleared }))).median).toBe(8);
  });

  it("flags pools where three courses in a row did not clear", () => {
    const t: OutcomeTest[] = [];
    const rx: TreatmentRecord[] = [];
    for (let k = 0; k < 3; k++) {
      t.push(test("x", day(k * 40 - 1), cu(0.6)), test("x", day(k * 40 + 7), cu(0.5)), test("x", day(k * 40 + 31), cu(0.5)));
      rx.push(treat("x", day(k * 40), "S1", "sequestrant"));
    }
    t.push(test("x", day(200), cu(0.5)));
    const hints = escalationDue(courseOutcomes(buildCourses(rx), t, "copper").map((o) => armCourseOf(o, "product")));
    expect(hints).toEqual([{ poolId: "x", coursesWithoutClearing: 3, since: day(0) }]);
  });
});
