import { sql } from "drizzle-orm";
import { keptRowsOf, type KeptEpisode, type KeptSpan } from "@analysis/metals/kept-history";
import { keptMonthsOf, metalsOfMonth, type KeptPoolMonth } from "@analysis/metals/kept-months";
import { keptCoursesOf } from "@analysis/outcomes/kept-courses";
import type { MetalThresholds } from "@analysis/metals/reading";
import { db, pool } from "../../db/client";
import { utcDate } from "../../db/values";
import { courseInputs, courseKey, courseLine, keptCourses } from "./keep-courses";
import { poolTests } from "./keep-pools";
import { KEPT_MONTH_COLUMNS, keptMonthRow } from "./kept-month-rows";
import { balanceInputsOfTests, balanceValues, SPAN_BALANCE_COLUMNS } from "./span-balance";

export type KeptDifference = {
  table: "kept_episodes" | "kept_pool_spans" | "kept_pool_months" | "kept_month_values" | "kept_treatment_courses";
  key: string;
  kept: string | null;
  recomputed: string | null;
};

export type KeptCheck = {
  companyId: number;
  versionId: number | null;
  pools: number;
  tests: number;
  episodes: number;
  spans: number;
  months: number;
  courses: number;
  differences: KeptDifference[];
};

const ms = (value: unknown) => (value === null || value === undefined ? null : utcDate(value)!.getTime());

function episodeLine(
  e: Pick<
    KeptEpisode,
    "metal" | "openedAt" | "openedByTestId" | "closedAt" | "closedByTestId" | "endAt" | "peak" | "testCount" | "chronic" | "recurrence" | "alone"
  >,
) {
  return [e.metal, e.openedAt, e.openedByTestId, e.closedAt, e.closedByTestId, e.endAt, e.peak, e.testCount, e.chronic, e.recurrence, e.alone].join(" ");
}

/** A span as one line; an "any" span's with the balance inputs it keeps. */
const spanLine = (s: Pick<KeptSpan, "firstTestAt" | "lastTestAt" | "tests" | "latestBalanceAt">, balance: readonly unknown[] = []) =>
  [s.firstTestAt, s.lastTestAt, s.tests, s.latestBalanceAt ?? null, ...balance.map((v) => (v === null ? null : Number(v)))].join(" ");

function compare(table: KeptDifference["table"], kept: Map<string, string>, recomputed: Map<string, string>, into: KeptDifference[]) {
  for (const [key, line] of recomputed) {
    if (kept.get(key) !== line) into.push({ table, key, kept: kept.get(key) ?? null, recomputed: line });
  }
  for (const [key, line] of kept) if (!recomputed.has(key)) into.push({ table, key, kept: line, recomputed: null });
}

/** A pool-month row's stored values after its key, as one line: the counts, the elevated metals and the reading counts. */
const monthLine = (values: readonly unknown[]) => values.map((v) => (typeof v === "string" ? JSON.stringify(JSON.parse(v)) : String(v))).join(" ");
const MONTH_VALUES = KEPT_MONTH_COLUMNS.split(", ").slice(3);

/** The version's month rows and month histogram against those counted from the tests; returns how many month rows are kept. */
async function compareMonths(versionId: number, expected: readonly KeptPoolMonth[], into: KeptDifference[]): Promise<number> {
  const [monthRows] = (await db().execute(
    sql`SELECT ${sql.raw(KEPT_MONTH_COLUMNS)} FROM kept_pool_months WHERE version_id = ${versionId}`,
  )) as unknown as [Array<Record<string, unknown>>];
  const [valueRows] = (await db().execute(
    sql`SELECT metal, month, value, below_detection, n FROM kept_month_values WHERE version_id = ${versionId} AND n <> 0`,
  )) as unknown as [Array<Record<string, unknown>>];
  const keptMonths = new Map(monthRows.map((r) => [`${String(r.pool_id)}/${String(r.month)}`, monthLine(MONTH_VALUES.map((column) => r[column]))]));
  // The row as a write would store it, less the version, pool, month and company.
  const recomputed = new Map(expected.map((m) => [`${m.poolId}/${m.month}`, monthLine(keptMonthRow(versionId, 0, m).slice(4))]));
  compare("kept_pool_months", keptMonths, recomputed, into);
  const valueKey = (metal: unknown, month: unknown, value: unknown, below: unknown) =>
    `${String(metal)}/${String(month)}/${Number(value)}${below ? "<" : ""}`;
  const keptValues = new Map(valueRows.map((r) => [valueKey(r.metal, r.month, r.value, Number(r.below_detection) === 1), String(r.n)]));
  const counted = new Map<string, number>();
  for (const m of expected)
    for (const [metal, counts] of metalsOfMonth(m))
      for (const v of counts.values) {
        const key = valueKey(metal, m.month, v.value, v.belowDetection);
        counted.set(key, (counted.get(key) ?? 0) + v.n);
      }
  compare("kept_month_values", keptValues, new Map([...counted].map(([key, n]) => [key, String(n)])), into);
  return keptMonths.size;
}

/**
 * Compares a company's kept results (the version answers come from) with the
 * same rows worked out again from every one of its tests. No differences is
 * the promise writes keep.
 */
export async function verifyKeptResults(companyId: number): Promise<KeptCheck> {
  const [versions] = (await db().execute(
    sql`SELECT id, levels, time_zone FROM kept_versions WHERE company_id = ${companyId} AND state = 'ready' ORDER BY id DESC LIMIT 1`,
  )) as unknown as [Array<{ id: number; levels: string | MetalThresholds; time_zone: string }>];
  const version = versions[0];
  if (!version) return { companyId, versionId: null, pools: 0, tests: 0, episodes: 0, spans: 0, months: 0, courses: 0, differences: [] };
  const levels = typeof version.levels === "string" ? (JSON.parse(version.levels) as MetalThresholds) : version.levels;
  const [poolRows] = (await db().execute(sql`SELECT id FROM pools WHERE company_id = ${companyId} ORDER BY id`)) as unknown as [
    Array<{ id: number }>,
  ];
  const poolIds = poolRows.map((p) => p.id);
  const tests = await poolTests(pool(), companyId, poolIds, false);
  const expected = keptRowsOf(tests, levels);

  const [episodeRows] = (await db().execute(
    sql`SELECT read_as, pool_id, seq, metal, opened_at, opened_by_test_id, closed_at, closed_by_test_id, end_at, peak, test_count, chronic, recurrence, alone
      FROM kept_episodes WHERE version_id = ${version.id}`,
  )) as unknown as [Array<Record<string, unknown>>];
  const [spanRows] = (await db().execute(
    sql`SELECT read_as, pool_id, first_at, last_at, tests, latest_balance_at, ${sql.raw(SPAN_BALANCE_COLUMNS.join(", "))} FROM kept_pool_spans WHERE version_id = ${version.id}`,
  )) as unknown as [Array<Record<string, unknown>>];

  const keptEpisodes = new Map(
    episodeRows.map((r) => [
      `${String(r.read_as)}/${String(r.pool_id)}/${String(r.seq)}`,
      episodeLine({
        metal: r.metal as KeptEpisode["metal"],
        openedAt: ms(r.opened_at)!,
        openedByTestId: String(r.opened_by_test_id),
        closedAt: ms(r.closed_at),
        closedByTestId: r.closed_by_test_id === null ? null : String(r.closed_by_test_id),
        endAt: ms(r.end_at)!,
        peak: Number(r.peak),
        testCount: Number(r.test_count),
        chronic: Number(r.chronic) === 1,
        recurrence: Number(r.recurrence) === 1,
        alone: Number(r.alone) === 1,
      }),
    ]),
  );
  const recomputedEpisodes = new Map(expected.episodes.map((e) => [`${e.readAs}/${e.poolId}/${e.seq}`, episodeLine(e)]));
  const keptSpans = new Map(
    spanRows.map((r) => [
      `${String(r.read_as)}/${String(r.pool_id)}`,
      spanLine(
        {
          firstTestAt: ms(r.first_at)!,
          lastTestAt: ms(r.last_at)!,
          tests: Number(r.tests),
          latestBalanceAt: r.read_as === "any" ? ms(r.latest_balance_at) : undefined,
        },
        r.read_as === "any" ? SPAN_BALANCE_COLUMNS.map((column) => r[column]) : [],
      ),
    ]),
  );
  const balance = await balanceInputsOfTests(db(), expected.spans.flatMap((s) => (s.latestBalanceTestId ? [s.latestBalanceTestId] : [])));
  const recomputedSpans = new Map(
    expected.spans.map((s) => [
      `${s.readAs}/${s.poolId}`,
      s.readAs === "any"
        ? spanLine(s, balanceValues(s.latestBalanceTestId ? balance.get(s.latestBalanceTestId) : null))
        : spanLine({ ...s, latestBalanceAt: undefined }),
    ]),
  );
  const differences: KeptDifference[] = [];
  compare("kept_episodes", keptEpisodes, recomputedEpisodes, differences);
  compare("kept_pool_spans", keptSpans, recomputedSpans, differences);
  const months = await compareMonths(version.id, keptMonthsOf(tests, levels, version.time_zone), differences);

  const courseSources = await courseInputs(db(), companyId, poolIds, tests, false);
  const recomputedCourses = new Map(keptCoursesOf(courseSources.treatments, courseSources.tests, levels).map((c) => [courseKey(c), courseLine(c)]));
  const keptCourseLines = new Map((await keptCourses({ companyId }, version.id)).map((c) => [courseKey(c), courseLine(c)]));
  compare("kept_treatment_courses", keptCourseLines, recomputedCourses, differences);
  return {
    companyId,
    versionId: version.id,
    pools: poolIds.length,
    tests: tests.length,
    episodes: keptEpisodes.size,
    spans: keptSpans.size,
    months,
    courses: keptCourseLines.size,
    differences,
  };
}
