import { and, asc, eq, sql, type SQL } from "drizzle-orm";
import { keptCoursesOf, type KeptCourse } from "@analysis/outcomes/kept-courses";
import type { KeptInputTest } from "@analysis/metals/kept-history";
import type { Metal } from "@analysis/metals/reading";
import type { OutcomeTest, TreatmentRecord } from "@analysis/outcomes/treatments";
import { db } from "../../db/client";
import { keptTreatmentCourses, pools, type KeptCourseTreatment } from "../../db/schema";
import { utcDate } from "../../db/values";
import { PRODUCT_CATEGORY } from "../queries/metal-readings";
import { tenantCondition, type Tenant } from "../queries/tenant-and-window";
import type { LiveVersion, Writer } from "./keep-pools";

type Row = Record<string, unknown>;

async function rowsOf(reader: Writer, statement: SQL): Promise<Row[]> {
  const [rows] = (await reader.execute(statement)) as unknown as [Row[]];
  return rows;
}

const idList = (ids: readonly number[]) => sql.join(ids.map((id) => sql`${id}`), sql`, `);
const number = (value: unknown) => (value === null || value === undefined ? null : Number(value));
const ms = (value: unknown) => utcDate(value)?.getTime() ?? null;

async function metalTreatments(reader: Writer, companyId: number, poolIds: readonly number[], lock: boolean): Promise<TreatmentRecord[]> {
  if (poolIds.length === 0) return [];
  const rows = await rowsOf(
    reader,
    sql`SELECT t.id, t.pool_id, t.product_id, p.category, t.applied_at, t.cost FROM treatments t JOIN products p ON p.id = t.product_id
      WHERE t.company_id = ${companyId} AND t.pool_id IN (${idList(poolIds)}) AND p.category IN ('sequestrant', 'collector_pad', 'ph_decreaser')
      ORDER BY t.pool_id, t.applied_at, t.id${lock ? sql` LOCK IN SHARE MODE` : sql``}`,
  );
  return rows.map((r) => ({
    id: String(r.id),
    poolId: String(r.pool_id),
    productId: String(r.product_id),
    category: PRODUCT_CATEGORY[r.category as keyof typeof PRODUCT_CATEGORY],
    appliedAt: ms(r.applied_at)!,
    cost: number(r.cost),
  }));
}

/** The tests the courses read: those of treated pools with a metal or the pH, in the order they came (pool, time, id). */
function courseTests(tests: readonly KeptInputTest[], treatments: readonly TreatmentRecord[]): OutcomeTest[] {
  const treated = new Set(treatments.map((t) => t.poolId));
  return tests.filter((t) => treated.has(t.poolId) && (t.copper || t.iron || t.manganese || (t.ph !== null && t.ph !== undefined)));
}

/**
 * What the courses of some pools are worked out from: their metal treatments
 * (the categories that start or join a course, with each product's category
 * as it is now; under `lock` held against a change of category until the
 * write commits) and their tests with a metal or the pH, ordered by pool,
 * time and id as the recomputed answer reads them. `tests` are every test of
 * the pools, as the write has already read them.
 */
export async function courseInputs(
  reader: Writer,
  companyId: number,
  poolIds: readonly number[],
  tests: readonly KeptInputTest[],
  lock: boolean,
): Promise<{ treatments: TreatmentRecord[]; tests: OutcomeTest[] }> {
  const treatments = await metalTreatments(reader, companyId, poolIds, lock);
  return { treatments, tests: treatments.length ? courseTests(tests, treatments) : [] };
}

const at = (value: number | null) => (value === null ? null : new Date(value));

const storedTreatments = (treatments: readonly TreatmentRecord[]): KeptCourseTreatment[] =>
  treatments.map((t) => ({ id: t.id, productId: t.productId, category: t.category, appliedAt: t.appliedAt, cost: t.cost ?? null }));

/**
 * Replaces one version's kept treatment courses of these pools with those
 * worked out from their treatments and tests (read with a locking read, in
 * the caller's transaction, after lockPoolsForKeeping).
 */
export async function replaceKeptCourses(
  writer: Writer,
  companyId: number,
  version: LiveVersion,
  poolIds: readonly number[],
  poolTests: readonly KeptInputTest[],
): Promise<void> {
  for (let from = 0; from < poolIds.length; from += 1000) {
    await writer.execute(sql`DELETE FROM kept_treatment_courses WHERE pool_id IN (${idList(poolIds.slice(from, from + 1000))}) AND version_id = ${version.id}`);
  }
  const { treatments, tests } = await courseInputs(writer, companyId, poolIds, poolTests, true);
  const courses = keptCoursesOf(treatments, tests, version.levels);
  for (let from = 0; from < courses.length; from += 500) {
    const values = courses.slice(from, from + 500).map(
      (c) => sql`(${version.id}, ${c.metal}, ${Number(c.poolId)}, ${c.seq}, ${companyId}, ${at(c.startAt)}, ${JSON.stringify(storedTreatments(c.treatments))},
        ${c.combination}, ${c.categoryCombination}, ${c.cost}, ${c.costComplete},
        ${c.baseline ? Number(c.baseline.testId) : null}, ${at(c.baseline?.takenAt ?? null)}, ${c.baseline?.value ?? null}, ${c.baseline?.status ?? null},
        ${c.ineligible}, ${c.phAtTreatment}, ${c.phStratum},
        ${c.firstFollowUp ? Number(c.firstFollowUp.testId) : null}, ${at(c.firstFollowUp?.takenAt ?? null)}, ${c.firstFollowUp?.value ?? null},
        ${c.firstFollowUp?.belowDetection ?? null},
        ${at(c.clockStoppedAt)}, ${c.cleared}, ${c.censoredBy}, ${at(c.clearedAt)}, ${c.recurrence})`,
    );
    await writer.execute(sql`INSERT INTO kept_treatment_courses (version_id, metal, pool_id, seq, company_id, started_at, treatments,
      combination, category_combination, cost, cost_complete, baseline_test_id, baseline_at, baseline_value, baseline_status,
      ineligible, ph_at_treatment, ph_stratum, follow_up_test_id, follow_up_at, follow_up_value, follow_up_below_detection,
      clock_stopped_at, cleared, censored_by, cleared_at, recurrence) VALUES ${sql.join(values, sql`, `)}`);
  }
}

type CourseRow = typeof keptTreatmentCourses.$inferSelect;

function keptCourseOfRow(r: CourseRow): KeptCourse {
  const stored = typeof r.treatments === "string" ? (JSON.parse(r.treatments) as KeptCourseTreatment[]) : r.treatments;
  return {
    poolId: String(r.poolId),
    metal: r.metal,
    seq: r.seq,
    startAt: r.startedAt.getTime(),
    treatments: stored.map((t) => ({ ...t, poolId: String(r.poolId) })),
    combination: r.combination,
    categoryCombination: r.categoryCombination,
    // Summed again from the treatments' own costs, in the course's order: a DOUBLE read back through the
    // driver's text protocol can lose the last binary digit of a sum such as 8.6 + 57.66 + 24.5.
    cost: stored.reduce((sum, t) => sum + (t.cost ?? 0), 0),
    costComplete: r.costComplete,
    baseline:
      r.baselineTestId === null
        ? null
        : { testId: String(r.baselineTestId), takenAt: r.baselineAt!.getTime(), value: r.baselineValue!, status: r.baselineStatus! },
    ineligible: r.ineligible,
    phAtTreatment: r.phAtTreatment,
    phStratum: r.phStratum,
    firstFollowUp:
      r.followUpTestId === null
        ? null
        : { testId: String(r.followUpTestId), takenAt: r.followUpAt!.getTime(), value: r.followUpValue!, belowDetection: r.followUpBelowDetection! },
    clockStoppedAt: r.clockStoppedAt.getTime(),
    cleared: r.cleared,
    censoredBy: r.censoredBy,
    clearedAt: r.clearedAt ? r.clearedAt.getTime() : null,
    recurrence: r.recurrence,
  };
}

/**
 * The kept courses of the tenant's pools (a member's Scope: their routes'
 * pools, as the recomputed answer reads them), on one metal or all, ordered
 * by pool and course.
 */
export async function keptCourses(tenant: Tenant, versionId: number, metal?: Metal): Promise<KeptCourse[]> {
  const rows = await db()
    .select({ course: keptTreatmentCourses })
    .from(keptTreatmentCourses)
    .innerJoin(pools, eq(pools.id, keptTreatmentCourses.poolId))
    .where(and(eq(keptTreatmentCourses.versionId, versionId), metal ? eq(keptTreatmentCourses.metal, metal) : undefined, tenantCondition(tenant)))
    .orderBy(asc(keptTreatmentCourses.metal), asc(keptTreatmentCourses.poolId), asc(keptTreatmentCourses.seq));
  return rows.map((r) => keptCourseOfRow(r.course));
}
