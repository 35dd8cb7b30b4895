import { and, asc, eq, sql, type SQL } from "drizzle-orm";
import { DAY_MS } from "@analysis/metals/episodes";
import { keptCoursesOf, type KeptCourse } from "@analysis/outcomes/kept-courses";
import { courseArms, type ArmCourse, type ArmDimension } from "@analysis/outcomes/summary";
import type { KeptInputTest } from "@analysis/metals/kept-history";
import type { Metal } from "@analysis/metals/reading";
import { percentFall, type CensoringCause, type Ineligible, type OutcomeTest, type PhStratum, type RecurrenceOutcome, type TreatmentRecord } from "@analysis/outcomes/treatments";
import { arrayRows, exactArrayRows } from "../../db/array-rows";
import { db } from "../../db/client";
import { idList } from "../../db/id-list";
import { rowValues } from "../../db/row-values";
import { keptTreatmentCourses, type KeptCourseTreatment } from "../../db/schema";
import { epochMs, utcDate } from "../../db/values";
import { PRODUCT_CATEGORY } from "../queries/metal-readings";
import { rowsOfTenantPools, type Tenant } from "../queries/tenant-and-window";
import type { LiveVersion, Writer } from "./writer";

type Row = Record<string, unknown>;

async function rowsOf(reader: Writer, statement: SQL): Promise<Row[]> {
  const [rows] = (await reader.execute(statement)) as unknown as [Row[]];
  return rows;
}

const number = (value: unknown) => (value === null || value === undefined ? null : Number(value));
const ms = (value: unknown) => utcDate(value)?.getTime() ?? null;

async function metalTreatments(reader: Writer, companyId: number, poolIds: readonly number[], lock: boolean): Promise<TreatmentRecord[]> {
  if (poolIds.length === 0) return [];
  const rows = await rowsOf(
    reader,
    // The pools' treatments first, by their index: left to itself the optimizer may start from the few products and
    // read (and under `lock` share-lock) every treatment of the company with those products, tens of milliseconds a save.
    sql`SELECT t.id, t.pool_id, t.product_id, p.category, t.applied_at, t.cost
      FROM treatments t FORCE INDEX (treatments_pool_time_idx) STRAIGHT_JOIN products p ON p.id = t.product_id
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
/** Everything a kept course holds, in a fixed order (the pool, metal and place are its key). */
export function courseLine(c: KeptCourse): string {
  return JSON.stringify([
    c.startAt,
    c.treatments.map((t) => [t.id, t.productId, t.category, t.appliedAt, t.cost ?? null]),
    c.combination,
    c.categoryCombination,
    c.cost,
    c.costComplete,
    c.baseline && [c.baseline.testId, c.baseline.takenAt, c.baseline.value, c.baseline.status],
    c.ineligible,
    c.phAtTreatment,
    c.phStratum,
    c.firstFollowUp && [c.firstFollowUp.testId, c.firstFollowUp.takenAt, c.firstFollowUp.value, c.firstFollowUp.belowDetection],
    c.clockStoppedAt,
    c.cleared,
    c.censoredBy,
    c.clearedAt,
    c.recurrence,
  ]);
}

export const courseKey = (c: KeptCourse) => `${c.metal}/${c.poolId}/${c.seq}`;

/** A kept course as the driver returns its row (snake_case columns). */
function keptCourseOfRaw(r: Row): KeptCourse {
  return keptCourseOfRow({
    metal: r.metal as Metal,
    poolId: Number(r.pool_id),
    seq: Number(r.seq),
    startedAt: utcDate(r.started_at)!,
    treatments: treatmentsOfColumn(r.treatments),
    combination: String(r.combination),
    categoryCombination: String(r.category_combination),
    costComplete: Number(r.cost_complete) === 1,
    baselineTestId: number(r.baseline_test_id),
    baselineAt: utcDate(r.baseline_at),
    baselineValue: number(r.baseline_value),
    baselineStatus: r.baseline_status as CourseRow["baselineStatus"],
    ineligible: r.ineligible as CourseRow["ineligible"],
    phAtTreatment: number(r.ph_at_treatment),
    phStratum: r.ph_stratum as CourseRow["phStratum"],
    followUpTestId: number(r.follow_up_test_id),
    followUpAt: utcDate(r.follow_up_at),
    followUpValue: number(r.follow_up_value),
    followUpBelowDetection: r.follow_up_below_detection === null ? null : Number(r.follow_up_below_detection) === 1,
    clockStoppedAt: utcDate(r.clock_stopped_at)!,
    cleared: Number(r.cleared) === 1,
    censoredBy: r.censored_by as CourseRow["censoredBy"],
    clearedAt: utcDate(r.cleared_at),
    recurrence: r.recurrence as CourseRow["recurrence"],
  });
}

const courseValues = (versionId: number, companyId: number, c: KeptCourse) => [
  versionId,
  c.metal,
  Number(c.poolId),
  c.seq,
  companyId,
  at(c.startAt),
  JSON.stringify(storedTreatments(c.treatments)),
  c.combination,
  c.categoryCombination,
  c.cost,
  c.costComplete,
  c.baseline ? Number(c.baseline.testId) : null,
  at(c.baseline?.takenAt ?? null),
  c.baseline?.value ?? null,
  c.baseline?.status ?? null,
  c.ineligible,
  c.phAtTreatment,
  c.phStratum,
  c.firstFollowUp ? Number(c.firstFollowUp.testId) : null,
  at(c.firstFollowUp?.takenAt ?? null),
  c.firstFollowUp?.value ?? null,
  c.firstFollowUp?.belowDetection ?? null,
  at(c.clockStoppedAt),
  c.cleared,
  c.censoredBy,
  at(c.clearedAt),
  c.recurrence,
];

const COURSE_COLUMNS = `version_id, metal, pool_id, seq, company_id, started_at, treatments,
  combination, category_combination, cost, cost_complete, baseline_test_id, baseline_at, baseline_value, baseline_status,
  ineligible, ph_at_treatment, ph_stratum, follow_up_test_id, follow_up_at, follow_up_value, follow_up_below_detection,
  clock_stopped_at, cleared, censored_by, cleared_at, recurrence`;
const COURSE_UPDATES = COURSE_COLUMNS.split(",")
  .map((c) => c.trim())
  .filter((c) => !["version_id", "metal", "pool_id", "seq"].includes(c))
  .map((c) => `${c} = VALUES(${c})`)
  .join(", ");

/**
 * Replaces one version's kept treatment courses of these pools with those
 * worked out from their treatments and tests (read with a locking read, in
 * the caller's transaction, after lockPoolsForKeeping). Only courses that
 * changed are written: a visit changes one or two of a pool's many.
 */
export async function replaceKeptCourses(
  writer: Writer,
  companyId: number,
  version: LiveVersion,
  poolIds: readonly number[],
  poolTests: readonly KeptInputTest[],
): Promise<void> {
  const before = new Map<string, string>();
  for (let from = 0; from < poolIds.length; from += 1000) {
    // A locking read: it sees what the write before this one kept, whatever this transaction's snapshot.
    const rows = await rowsOf(
      writer,
      sql`SELECT * FROM kept_treatment_courses FORCE INDEX (kept_treatment_courses_pool_idx) WHERE pool_id IN (${idList(poolIds.slice(from, from + 1000))}) AND version_id = ${version.id} FOR UPDATE`,
    );
    for (const row of rows) {
      const course = keptCourseOfRaw(row);
      before.set(courseKey(course), courseLine(course));
    }
  }
  const { treatments, tests } = await courseInputs(writer, companyId, poolIds, poolTests, true);
  const courses = keptCoursesOf(treatments, tests, version.levels);
  const now = new Set(courses.map(courseKey));
  const gone = [...before.keys()].filter((key) => !now.has(key));
  for (let from = 0; from < gone.length; from += 500) {
    const keys = gone.slice(from, from + 500).map((key) => {
      const [metal, poolId, seq] = key.split("/");
      return [metal, Number(poolId), Number(seq)];
    });
    await writer.execute(sql`DELETE FROM kept_treatment_courses WHERE version_id = ${version.id} AND (metal, pool_id, seq) IN (${rowValues(keys)})`);
  }
  const changed = courses.filter((c) => before.get(courseKey(c)) !== courseLine(c));
  for (let from = 0; from < changed.length; from += 500) {
    const values = changed.slice(from, from + 500).map((c) => courseValues(version.id, companyId, c));
    await writer.execute(
      sql`INSERT INTO kept_treatment_courses (${sql.raw(COURSE_COLUMNS)}) VALUES ${rowValues(values)} ON DUPLICATE KEY UPDATE ${sql.raw(COURSE_UPDATES)}`,
    );
  }
}

/** What the full course read takes, in this order; the treatments come last. */
const COURSE_KEYS = {
  metal: keptTreatmentCourses.metal,
  poolId: keptTreatmentCourses.poolId,
  seq: keptTreatmentCourses.seq,
  startedAt: keptTreatmentCourses.startedAt,
  combination: keptTreatmentCourses.combination,
  categoryCombination: keptTreatmentCourses.categoryCombination,
  costComplete: keptTreatmentCourses.costComplete,
  baselineTestId: keptTreatmentCourses.baselineTestId,
  baselineAt: keptTreatmentCourses.baselineAt,
  baselineValue: keptTreatmentCourses.baselineValue,
  baselineStatus: keptTreatmentCourses.baselineStatus,
  ineligible: keptTreatmentCourses.ineligible,
  phAtTreatment: keptTreatmentCourses.phAtTreatment,
  phStratum: keptTreatmentCourses.phStratum,
  followUpTestId: keptTreatmentCourses.followUpTestId,
  followUpAt: keptTreatmentCourses.followUpAt,
  followUpValue: keptTreatmentCourses.followUpValue,
  followUpBelowDetection: keptTreatmentCourses.followUpBelowDetection,
  clockStoppedAt: keptTreatmentCourses.clockStoppedAt,
  cleared: keptTreatmentCourses.cleared,
  censoredBy: keptTreatmentCourses.censoredBy,
  clearedAt: keptTreatmentCourses.clearedAt,
  recurrence: keptTreatmentCourses.recurrence,
};
const LAST = Object.keys(COURSE_KEYS).length;

type CourseRow = Omit<typeof keptTreatmentCourses.$inferSelect, "versionId" | "companyId" | "cost">;
type CourseKeysRow = Omit<CourseRow, "treatments">;
type CourseFacts = Omit<KeptCourse, "treatments" | "cost">;

function courseFacts(r: CourseKeysRow): CourseFacts {
  return {
    poolId: String(r.poolId),
    metal: r.metal,
    seq: r.seq,
    startAt: r.startedAt.getTime(),
    combination: r.combination,
    categoryCombination: r.categoryCombination,
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

function keptCourseOfRow(r: CourseRow): KeptCourse {
  const facts = courseFacts(r);
  const stored = treatmentsOfColumn(r.treatments);
  return {
    ...facts,
    treatments: stored.map((t) => ({ ...t, poolId: facts.poolId })),
    // Summed again from the treatments' own costs, in the course's order: a DOUBLE read back through the
    // driver's text protocol can lose the last binary digit of a sum such as 8.6 + 57.66 + 24.5.
    cost: stored.reduce((sum, t) => sum + (t.cost ?? 0), 0),
  };
}

const flag = (value: unknown) => value === 1 || value === true;

/** A course's treatments as read: the driver gives the JSON column as text. */
const treatmentsOfColumn = (value: unknown) => (typeof value === "string" ? JSON.parse(value) : value) as KeptCourseTreatment[];

/** A course row read as an array in COURSE_KEYS' order (flags as 0 or 1). */
function courseKeysOfArray(v: readonly unknown[]): CourseKeysRow {
  return {
    metal: v[0] as Metal,
    poolId: v[1] as number,
    seq: v[2] as number,
    startedAt: v[3] as Date,
    combination: v[4] as string,
    categoryCombination: v[5] as string,
    costComplete: flag(v[6]),
    baselineTestId: v[7] as number | null,
    baselineAt: v[8] as Date | null,
    baselineValue: v[9] as number | null,
    baselineStatus: v[10] as CourseRow["baselineStatus"],
    ineligible: v[11] as CourseRow["ineligible"],
    phAtTreatment: v[12] as number | null,
    phStratum: v[13] as CourseRow["phStratum"],
    followUpTestId: v[14] as number | null,
    followUpAt: v[15] as Date | null,
    followUpValue: v[16] as number | null,
    followUpBelowDetection: v[17] === null ? null : flag(v[17]),
    clockStoppedAt: v[18] as Date,
    cleared: flag(v[19]),
    censoredBy: v[20] as CourseRow["censoredBy"],
    clearedAt: v[21] as Date | null,
    recurrence: v[22] as CourseRow["recurrence"],
  };
}

function coursesOfTenant(tenant: Tenant, versionId: number, metal?: Metal) {
  return db()
    .select({ ...COURSE_KEYS, treatments: keptTreatmentCourses.treatments })
    .from(keptTreatmentCourses)
    .where(and(eq(keptTreatmentCourses.versionId, versionId), metal ? eq(keptTreatmentCourses.metal, metal) : undefined, rowsOfTenantPools(tenant, keptTreatmentCourses)))
    .orderBy(asc(keptTreatmentCourses.metal), asc(keptTreatmentCourses.poolId), asc(keptTreatmentCourses.seq));
}

/**
 * The kept courses of the tenant's pools (a member's Scope: their routes'
 * pools, as the recomputed answer reads them), on one metal or all, ordered
 * by pool and course. Read as arrays: tens of thousands of rows on a large company.
 */
export async function keptCourses(tenant: Tenant, versionId: number, metal?: Metal): Promise<KeptCourse[]> {
  const rows = await arrayRows<unknown[]>(coursesOfTenant(tenant, versionId, metal));
  return rows.map((v) => keptCourseOfRow({ ...courseKeysOfArray(v), treatments: v[LAST] as CourseRow["treatments"] }));
}

const ARM_COURSE = {
  poolId: keptTreatmentCourses.poolId,
  startAt: epochMs(keptTreatmentCourses.startedAt),
  // Whole milliseconds to the clock's stop, as the recomputation subtracts the two instants.
  msToClear: sql<number>`(TIMESTAMPDIFF(MICROSECOND, ${keptTreatmentCourses.startedAt}, ${keptTreatmentCourses.clockStoppedAt}) DIV 1000)`,
  combination: keptTreatmentCourses.combination,
  categoryCombination: keptTreatmentCourses.categoryCombination,
  cost: keptTreatmentCourses.cost,
  costComplete: keptTreatmentCourses.costComplete,
  ineligible: keptTreatmentCourses.ineligible,
  phStratum: keptTreatmentCourses.phStratum,
  baselineValue: keptTreatmentCourses.baselineValue,
  followUpValue: keptTreatmentCourses.followUpValue,
  cleared: keptTreatmentCourses.cleared,
  censoredBy: keptTreatmentCourses.censoredBy,
  recurrence: keptTreatmentCourses.recurrence,
};

/**
 * The kept courses of the tenant's pools on one metal, put into arms on one
 * dimension: one flat object per row, in the order buildCourses makes them
 * (pool id as text, then start), so every sum adds as a recomputation does.
 * Only product arms read the treatments, most of a row's bytes. Read through
 * the binary protocol: every DOUBLE (cost, baseline, follow-up) to the last bit.
 */
export async function keptArmCourses(tenant: Tenant, versionId: number, metal: Metal, dimension: ArmDimension): Promise<ArmCourse[]> {
  const treatments = dimension === "product" ? keptTreatmentCourses.treatments : sql<null>`NULL`;
  const rows = await exactArrayRows<unknown[]>(
    db()
      .select({ ...ARM_COURSE, treatments })
      .from(keptTreatmentCourses)
      .where(and(eq(keptTreatmentCourses.versionId, versionId), eq(keptTreatmentCourses.metal, metal), rowsOfTenantPools(tenant, keptTreatmentCourses)))
      .orderBy(sql`CAST(${keptTreatmentCourses.poolId} AS BINARY)`, asc(keptTreatmentCourses.seq)),
  );
  return rows.map((v) => {
    const ineligible = v[7] as Ineligible | null;
    const keys = { combination: v[3] as string, categoryCombination: v[4] as string, treatments: ineligible === null && v[14] !== null ? treatmentsOfColumn(v[14]) : undefined };
    return {
      poolId: String(v[0]),
      startAt: Number(v[1]),
      arms: ineligible === null ? courseArms(dimension, keys) : [],
      ineligible,
      phStratum: v[8] as PhStratum,
      percentReduction: percentFall(ineligible, v[9] as number | null, v[10] as number | null),
      daysToClear: Number(v[2]) / DAY_MS,
      cleared: flag(v[11]),
      censoredBy: v[12] as CensoringCause | null,
      recurrence: v[13] as RecurrenceOutcome | null,
      cost: v[5] as number,
      costComplete: flag(v[6]),
    };
  });
}
