import { sql, type SQL } from "drizzle-orm";
import { keptRowsOf, type KeptEpisode, type KeptInputTest, type KeptSpan } from "@analysis/metals/kept-history";
import {
  keptMonthsOf,
  metalsOfMonth,
  monthValueChanges,
  summedMonthValueChanges,
  type KeptPoolMonth,
  type MonthValueChange,
} from "@analysis/metals/kept-months";
import type { MetalThresholds } from "@analysis/metals/reading";
import type { SqlValue } from "mysql2";
import type { PoolConnection } from "mysql2/promise";
import { idList } from "../../db/id-list";
import { rowValues } from "../../db/row-values";
import { utcDate } from "../../db/values";
import { metalReading } from "../queries/metal-readings";
import { replaceKeptCourses } from "./keep-courses";
import { KEPT_MONTH_COLUMNS, keptMonthOf, keptMonthRow } from "./kept-month-rows";
import { balanceInputsOfTests, balanceValues, SPAN_BALANCE_COLUMNS } from "./span-balance";
import type { LiveVersion, Writer } from "./writer";

export type { LiveVersion, Writer };

type Row = Record<string, unknown>;

async function rowsOf(writer: Writer, statement: SQL): Promise<Row[]> {
  const [rows] = (await writer.execute(statement)) as unknown as [Row[]];
  return rows;
}

/**
 * Locks the pools a write is about to change, in id order, before it changes
 * any test: two writes on one pool then keep its results one after the other,
 * each seeing the other's tests, and never deadlock on each other.
 */
export async function lockPoolsForKeeping(writer: Writer, poolIds: readonly number[]): Promise<void> {
  const ids = [...new Set(poolIds)].sort((a, b) => a - b);
  for (let from = 0; from < ids.length; from += 1000) {
    await writer.execute(sql`SELECT id FROM pools WHERE id IN (${idList(ids.slice(from, from + 1000))}) ORDER BY id FOR UPDATE`);
  }
}

/**
 * The company's versions that writes keep in step: the one answers come from
 * and any being built. A locking read, so a version whose build started after
 * this transaction began is seen too.
 */
export async function liveVersions(writer: Writer, companyId: number): Promise<LiveVersion[]> {
  const rows = await rowsOf(
    writer,
    sql`SELECT id, levels, time_zone FROM kept_versions WHERE company_id = ${companyId} AND state IN ('building', 'ready') ORDER BY id LOCK IN SHARE MODE`,
  );
  return rows.map((r) => ({
    id: Number(r.id),
    levels: (typeof r.levels === "string" ? JSON.parse(r.levels) : r.levels) as MetalThresholds,
    timeZone: String(r.time_zone),
  }));
}

/** The driver's own connection (or pool), for the large reads: rows as arrays, dates and decimals parsed by the driver. */
export type RawReader = Pick<PoolConnection, "query">;

type TestRow = [
  id: number,
  poolId: number,
  sampledAt: Date | string,
  copper: number | null,
  copperBelow: number,
  iron: number | null,
  ironBelow: number,
  manganese: number | null,
  manganeseBelow: number,
  balanceComplete: number,
  ph: number | string | null,
];

/**
 * Every test of the pools (any analyte) with its metals, ordered by pool, time
 * and id: the order the analysis reads them in. A locking read, so it sees the
 * latest committed tests whatever the transaction's snapshot.
 */
export async function poolTests(source: Writer | RawReader, companyId: number, poolIds: readonly number[], lock = true): Promise<KeptInputTest[]> {
  if (poolIds.length === 0) return [];
  const statement = `SELECT id, pool_id, sampled_at, copper, copper_below_detection, iron, iron_below_detection, manganese, manganese_below_detection,
      (ph IS NOT NULL AND temperature_c IS NOT NULL AND calcium_hardness IS NOT NULL AND total_alkalinity IS NOT NULL) AS balance_complete, ph
    FROM water_tests WHERE company_id = ? AND pool_id IN (${poolIds.map(() => "?").join(", ")})
    ORDER BY pool_id, sampled_at, id${lock ? " LOCK IN SHARE MODE" : ""}`;
  const params = [companyId, ...poolIds];
  let rows: TestRow[];
  // A drizzle database has a `query` object of its own (relational queries); the driver's is a function.
  if (typeof (source as Partial<RawReader>).query === "function") {
    [rows] = (await (source as RawReader).query({ sql: statement, rowsAsArray: true }, params)) as unknown as [TestRow[]];
  } else {
    const [objects] = (await (source as Writer).execute(sql.raw(statement.replace(/\?/g, () => String(Number(params.shift())))))) as unknown as [
      Row[],
    ];
    rows = objects.map((r) => Object.values(r) as TestRow);
  }
  return rows.map(([id, poolId, sampledAt, copper, copperBelow, iron, ironBelow, manganese, manganeseBelow, balanceComplete, ph]) => ({
    id: String(id),
    poolId: String(poolId),
    takenAt: utcDate(sampledAt)!.getTime(),
    copper: metalReading(copper === null ? null : Number(copper), Number(copperBelow) === 1),
    iron: metalReading(iron === null ? null : Number(iron), Number(ironBelow) === 1),
    manganese: metalReading(manganese === null ? null : Number(manganese), Number(manganeseBelow) === 1),
    balanceComplete: Number(balanceComplete) === 1,
    ph: ph === null ? null : Number(ph),
  }));
}

const at = (ms: number | null) => (ms === null ? null : new Date(ms));

async function insertEpisodes(writer: Writer, versionId: number, companyId: number, episodes: readonly KeptEpisode[]) {
  for (let from = 0; from < episodes.length; from += 1000) {
    const values = episodes
      .slice(from, from + 1000)
      .map((e) => [
        versionId,
        companyId,
        Number(e.poolId),
        e.readAs,
        e.seq,
        e.metal,
        at(e.openedAt),
        Number(e.openedByTestId),
        at(e.closedAt),
        e.closedByTestId === null ? null : Number(e.closedByTestId),
        at(e.endAt),
        e.peak,
        e.testCount,
        e.chronic,
        e.recurrence,
        e.alone,
      ]);
    await writer.execute(sql`INSERT INTO kept_episodes (version_id, company_id, pool_id, read_as, seq, metal, opened_at, opened_by_test_id,
      closed_at, closed_by_test_id, end_at, peak, test_count, chronic, recurrence, alone) VALUES ${rowValues(values)}
      ON DUPLICATE KEY UPDATE metal = VALUES(metal), opened_at = VALUES(opened_at), opened_by_test_id = VALUES(opened_by_test_id),
        closed_at = VALUES(closed_at), closed_by_test_id = VALUES(closed_by_test_id), end_at = VALUES(end_at), peak = VALUES(peak),
        test_count = VALUES(test_count), chronic = VALUES(chronic), recurrence = VALUES(recurrence), alone = VALUES(alone)`);
  }
}

const episodeKey = (poolId: unknown, readAs: unknown, seq: unknown) => `${String(poolId)}/${String(readAs)}/${String(seq)}`;
const episodeLine = (e: KeptEpisode) =>
  [e.metal, e.openedAt, e.openedByTestId, e.closedAt, e.closedByTestId, e.endAt, e.peak, e.testCount, e.chronic, e.recurrence, e.alone].join("|");
const instantOf = (value: unknown) => (value === null ? null : utcDate(value)!.getTime());

type EpisodeKey = [readAs: KeptEpisode["readAs"], poolId: number, seq: number];
type KeptEpisodeLines = Map<string, { key: EpisodeKey; line: string }>;

/** Every way a pool's episodes are read: a write's locking read names them all, so it runs on the primary key. */
const ALL_READINGS = sql.raw(`'all', 'copper', 'iron', 'manganese'`);

/** The pools' kept episodes as comparison lines by key: a locking read, so the write before this one is seen. */
async function episodesKept(writer: Writer, versionId: number, ids: SQL): Promise<KeptEpisodeLines> {
  const rows = await rowsOf(
    writer,
    sql`SELECT pool_id, read_as, seq, metal, opened_at, opened_by_test_id, closed_at, closed_by_test_id, end_at, peak, test_count, chronic, recurrence, alone
      FROM kept_episodes WHERE version_id = ${versionId} AND read_as IN (${ALL_READINGS}) AND pool_id IN (${ids}) FOR UPDATE`,
  );
  const kept: KeptEpisodeLines = new Map();
  for (const r of rows) {
    const line = [
      r.metal,
      instantOf(r.opened_at),
      String(r.opened_by_test_id),
      instantOf(r.closed_at),
      r.closed_by_test_id === null ? null : String(r.closed_by_test_id),
      instantOf(r.end_at),
      Number(r.peak),
      Number(r.test_count),
      Number(r.chronic) === 1,
      Number(r.recurrence) === 1,
      Number(r.alone) === 1,
    ].join("|");
    const key: EpisodeKey = [r.read_as as KeptEpisode["readAs"], Number(r.pool_id), Number(r.seq)];
    kept.set(episodeKey(r.pool_id, r.read_as, r.seq), { key, line });
  }
  return kept;
}

/**
 * Only the episodes that changed are written: a visit changes a pool's last
 * episode or adds one, and a pool can hold a hundred. Returns the keys of the
 * kept rows that are gone and the episodes to write (new or changed).
 */
function changedEpisodes(kept: KeptEpisodeLines, episodes: readonly KeptEpisode[]): { stale: EpisodeKey[]; changed: KeptEpisode[] } {
  const left = new Map(kept);
  const changed: KeptEpisode[] = [];
  for (const e of episodes) {
    const key = episodeKey(e.poolId, e.readAs, e.seq);
    const old = left.get(key);
    if (!old || old.line !== episodeLine(e)) changed.push(e);
    left.delete(key);
  }
  return { stale: [...left.values()].map((k) => k.key), changed };
}

/** Writes the pools' spans, an "any" span with the inputs of the latest complete balance test it names. */
async function insertSpans(writer: Writer, versionId: number, companyId: number, spans: readonly KeptSpan[]) {
  const balanceTests = spans.flatMap((s) => (s.latestBalanceTestId ? [s.latestBalanceTestId] : []));
  const balance = await balanceInputsOfTests(writer, balanceTests);
  for (let from = 0; from < spans.length; from += 1000) {
    const values = spans
      .slice(from, from + 1000)
      .map((s) => [
        versionId,
        Number(s.poolId),
        s.readAs,
        companyId,
        at(s.firstTestAt),
        at(s.lastTestAt),
        s.tests,
        at(s.latestBalanceAt ?? null),
        ...balanceValues(s.latestBalanceTestId ? balance.get(s.latestBalanceTestId) : null),
      ]);
    await writer.execute(
      sql`INSERT INTO kept_pool_spans (version_id, pool_id, read_as, company_id, first_at, last_at, tests, latest_balance_at, ${sql.raw(SPAN_BALANCE_COLUMNS.join(", "))})
        VALUES ${rowValues(values)}`,
    );
  }
}

/** The pools' month rows as last kept: a locking read, so it sees what the write before this one kept. */
async function monthsKept(writer: Writer, versionId: number, ids: SQL): Promise<KeptPoolMonth[]> {
  const rows = await rowsOf(
    writer,
    sql`SELECT ${sql.raw(KEPT_MONTH_COLUMNS)} FROM kept_pool_months WHERE version_id = ${versionId} AND pool_id IN (${ids}) FOR UPDATE`,
  );
  return rows.map(keptMonthOf);
}

async function insertMonths(writer: Writer, versionId: number, companyId: number, months: readonly KeptPoolMonth[]) {
  for (let from = 0; from < months.length; from += 1000) {
    const values = months.slice(from, from + 1000).map((m) => keptMonthRow(versionId, companyId, m));
    await writer.execute(sql`INSERT INTO kept_pool_months (version_id, ${sql.raw(KEPT_MONTH_COLUMNS)}) VALUES ${rowValues(values)}
      ON DUPLICATE KEY UPDATE days = VALUES(days), copper_readings = VALUES(copper_readings), copper_elevated = VALUES(copper_elevated),
        iron_readings = VALUES(iron_readings), iron_elevated = VALUES(iron_elevated), manganese_readings = VALUES(manganese_readings),
        manganese_elevated = VALUES(manganese_elevated), elevated_metals = VALUES(elevated_metals), reading_counts = VALUES(reading_counts)`);
  }
}

const monthKey = (m: KeptPoolMonth) => `${m.poolId}/${m.month}`;
// Metals compared in METALS order: a month worked out from tests lists them in the order they were first read.
const sameMonth = (a: KeptPoolMonth, b: KeptPoolMonth) => a.days === b.days && JSON.stringify(metalsOfMonth(a)) === JSON.stringify(metalsOfMonth(b));

/**
 * Only the month rows that changed are written: a visit touches one month of
 * a pool with years of them, so rewriting them all would cost the save time.
 */
function changedMonths(before: readonly KeptPoolMonth[], after: readonly KeptPoolMonth[]): { gone: KeptPoolMonth[]; changed: KeptPoolMonth[] } {
  const now = new Map(after.map((m) => [monthKey(m), m]));
  const was = new Map(before.map((m) => [monthKey(m), m]));
  return {
    gone: before.filter((m) => !now.has(monthKey(m))),
    changed: after.filter((m) => {
      const old = was.get(monthKey(m));
      return !old || !sameMonth(old, m);
    }),
  };
}

/** Adds the changes to the company's month histogram, in key order so two writes take the rows' locks in one order. */
async function changeMonthValues(writer: Writer, versionId: number, companyId: number, changes: readonly MonthValueChange[]) {
  for (let from = 0; from < changes.length; from += 1000) {
    const values = changes.slice(from, from + 1000).map((c) => [versionId, c.metal, c.month, c.value, c.belowDetection, companyId, c.n]);
    await writer.execute(sql`INSERT INTO kept_month_values (version_id, metal, month, value, below_detection, company_id, n)
      VALUES ${rowValues(values)} ON DUPLICATE KEY UPDATE n = n + VALUES(n)`);
  }
}

/** One version's kept rows of some pools as they stand, read with locking reads before they are replaced. */
type KeptBefore = { months: KeptPoolMonth[]; episodes: KeptEpisodeLines };

async function keptBefore(writer: Writer, versionId: number, poolIds: readonly number[]): Promise<KeptBefore> {
  const months: KeptPoolMonth[] = [];
  for (let from = 0; from < poolIds.length; from += 1000) {
    // Not push(...rows): a thousand pools hold over a hundred thousand month rows, more arguments than a call takes.
    for (const month of await monthsKept(writer, versionId, idList(poolIds.slice(from, from + 1000)))) months.push(month);
  }
  return { months, episodes: await episodesKept(writer, versionId, idList(poolIds)) };
}

/** What replacing one version's kept rows of some pools writes, and what it does to the company's month histogram. */
type KeptChanges = {
  version: LiveVersion;
  staleEpisodes: EpisodeKey[];
  episodes: KeptEpisode[];
  spans: KeptSpan[];
  goneMonths: KeptPoolMonth[];
  months: KeptPoolMonth[];
  monthValues: MonthValueChange[];
};

/** Works out the pools' rows again from their tests (ordered by pool), a pool at a time, and compares them with the kept ones. */
async function keptChanges(
  version: LiveVersion,
  tests: readonly KeptInputTest[],
  before: KeptBefore,
  yieldBetweenPools: boolean,
): Promise<KeptChanges> {
  const episodes: KeptEpisode[] = [];
  const spans: KeptSpan[] = [];
  const months: KeptPoolMonth[] = [];
  for (let from = 0; from < tests.length;) {
    let to = from + 1;
    while (to < tests.length && tests[to]!.poolId === tests[from]!.poolId) to++;
    const poolTests = tests.slice(from, to);
    const rows = keptRowsOf(poolTests, version.levels);
    for (const e of rows.episodes) episodes.push(e);
    for (const span of rows.spans) spans.push(span);
    for (const m of keptMonthsOf(poolTests, version.levels, version.timeZone)) months.push(m);
    from = to;
    // Lets the statements already sent for the slice before this one go on while this one is worked out.
    if (yieldBetweenPools) await new Promise((resolve) => setImmediate(resolve));
  }
  const { stale, changed } = changedEpisodes(before.episodes, episodes);
  const { gone, changed: changedMonthRows } = changedMonths(before.months, months);
  return {
    version,
    staleEpisodes: stale,
    episodes: changed,
    spans,
    goneMonths: gone,
    months: changedMonthRows,
    monthValues: monthValueChanges(before.months, months),
  };
}

/**
 * Rows of one version by their keys (after the version), as a condition
 * MariaDB reads through the primary key: the keys grouped by all but their
 * last part, each group a prefix and a list. A long list of whole keys
 * (`(pool_id, month) IN (...)`) is not read by the key: it scanned far more
 * of the version than it deleted, about 80 ms a statement when an import was undone.
 */
function keyCondition(prefix: readonly string[], last: string, keys: readonly (readonly SqlValue[])[]): SQL {
  const groups = new Map<string, { head: readonly SqlValue[]; lasts: SqlValue[] }>();
  for (const key of keys) {
    const head = key.slice(0, -1);
    const name = head.join("/");
    let group = groups.get(name);
    if (!group) groups.set(name, (group = { head, lasts: [] }));
    group.lasts.push(key[key.length - 1]!);
  }
  return sql.join(
    [...groups.values()].map(({ head, lasts }) => {
      const prefixMatches = sql.join(
        prefix.map((name, i) => sql`${sql.raw(name)} = ${head[i]}`),
        sql` AND `,
      );
      return sql`(${prefixMatches} AND ${sql.raw(last)} IN (${sql.join(
        lasts.map((value) => sql`${value}`),
        sql`, `,
      )}))`;
    }),
    sql` OR `,
  );
}

/** Writes one version's changes to the pools' kept rows, all but the company's month histogram, and keeps their treatment courses. */
async function writeKeptChanges(
  writer: Writer,
  companyId: number,
  poolIds: readonly number[],
  tests: readonly KeptInputTest[],
  changes: KeptChanges,
) {
  const versionId = changes.version.id;
  for (let from = 0; from < changes.staleEpisodes.length; from += 500) {
    const keys = changes.staleEpisodes.slice(from, from + 500);
    await writer.execute(sql`DELETE FROM kept_episodes WHERE version_id = ${versionId} AND (${keyCondition(["read_as", "pool_id"], "seq", keys)})`);
  }
  await insertEpisodes(writer, versionId, companyId, changes.episodes);
  for (let from = 0; from < poolIds.length; from += 1000) {
    await writer.execute(
      sql`DELETE FROM kept_pool_spans WHERE pool_id IN (${idList(poolIds.slice(from, from + 1000))}) AND version_id = ${versionId}`,
    );
  }
  await insertSpans(writer, versionId, companyId, changes.spans);
  for (let from = 0; from < changes.goneMonths.length; from += 500) {
    const keys = changes.goneMonths.slice(from, from + 500).map((m) => [Number(m.poolId), m.month]);
    await writer.execute(sql`DELETE FROM kept_pool_months WHERE version_id = ${versionId} AND (${keyCondition(["pool_id"], "month", keys)})`);
  }
  await insertMonths(writer, versionId, companyId, changes.months);
  await replaceKeptCourses(writer, companyId, changes.version, poolIds, tests);
}

/**
 * Replaces one version's kept rows of these pools with those worked out from
 * their tests, all but the company's month histogram: returns the changes
 * to it, for the caller to write once for all the pools it keeps.
 */
async function replacePoolRows(
  writer: Writer,
  companyId: number,
  version: LiveVersion,
  poolIds: readonly number[],
  tests: readonly KeptInputTest[],
): Promise<MonthValueChange[]> {
  const changes = await keptChanges(version, tests, await keptBefore(writer, version.id, poolIds), false);
  await writeKeptChanges(writer, companyId, poolIds, tests, changes);
  return changes.monthValues;
}

/** Replaces one version's kept rows of these pools with those worked out from their tests. */
export async function replaceKeptRows(
  writer: Writer,
  companyId: number,
  version: LiveVersion,
  poolIds: readonly number[],
  tests: readonly KeptInputTest[],
) {
  await changeMonthValues(writer, version.id, companyId, await replacePoolRows(writer, companyId, version, poolIds, tests));
}

/**
 * How many pools' tests and kept rows a write holds in memory at once: an
 * import of a thousand pools is kept slice by slice in its transaction.
 */
export const POOLS_PER_SLICE = 200;

export type KeepOptions = {
  /** The connection the pools' tests are read on (as arrays); the writer by default. */
  reader?: RawReader;
  /**
   * The caller locked the pools (lockPoolsForKeeping) before its transaction's
   * first consistent read. Every writer of a pool's tests holds that lock until
   * it commits, so the transaction's snapshot, taken after the lock, already
   * holds every committed test of the pools and a plain read is enough. An
   * import reads back hundreds of thousands of its own rows; locking them
   * again nearly doubled that read.
   */
  poolsLockedBeforeFirstRead?: boolean;
  poolsPerSlice?: number;
};

/** A slice of pools with their tests and, per live version, their kept rows as they stand. */
type SliceRead = { poolIds: number[]; tests: KeptInputTest[]; before: KeptBefore[] };

async function readSlice(
  writer: Writer,
  reader: Writer | RawReader,
  companyId: number,
  versions: readonly LiveVersion[],
  poolIds: number[],
  lockingRead: boolean,
): Promise<SliceRead> {
  const tests = await poolTests(reader, companyId, poolIds, lockingRead);
  const before: KeptBefore[] = [];
  for (const version of versions) before.push(await keptBefore(writer, version.id, poolIds));
  return { poolIds, tests, before };
}

/**
 * Keeps the results of the pools a write changed in step with their tests, in
 * the write's own transaction (after lockPoolsForKeeping): each pool is worked
 * out again from its own tests, for every live version of the levels. The
 * pools are kept a slice at a time; the company's month histogram is written
 * once at the end, in key order, so two writes take its locks in one order.
 *
 * Slices overlap: while one slice's rows are written, the next one's (already
 * read) are worked out, so the database and this process work side by side.
 * The connection runs one statement at a time, so the next slice is read
 * before this one's writes are sent; the slices hold different pools.
 */
export async function keepPoolsInStep(writer: Writer, companyId: number, poolIds: readonly number[], options: KeepOptions = {}): Promise<void> {
  const { reader, poolsPerSlice = POOLS_PER_SLICE } = options;
  const lockingRead = !options.poolsLockedBeforeFirstRead;
  const ids = [...new Set(poolIds)].sort((a, b) => a - b);
  if (ids.length === 0) return;
  const versions = await liveVersions(writer, companyId);
  if (versions.length === 0) return;
  const slices: number[][] = [];
  for (let from = 0; from < ids.length; from += poolsPerSlice) slices.push(ids.slice(from, from + poolsPerSlice));
  const monthValues = versions.map((): MonthValueChange[][] => []);
  let next = await readSlice(writer, reader ?? writer, companyId, versions, slices[0]!, lockingRead);
  let writing: Promise<void> | null = null;
  for (let s = 0; s < slices.length; s++) {
    const slice = next;
    const changes: KeptChanges[] = [];
    for (const [v, version] of versions.entries()) changes.push(await keptChanges(version, slice.tests, slice.before[v]!, writing !== null));
    if (writing) await writing;
    if (s + 1 < slices.length) next = await readSlice(writer, reader ?? writer, companyId, versions, slices[s + 1]!, lockingRead);
    changes.forEach((c, v) => monthValues[v]!.push(c.monthValues));
    writing = (async () => {
      for (const c of changes) await writeKeptChanges(writer, companyId, slice.poolIds, slice.tests, c);
    })();
    // Handled here so a failure while the next slice is worked out is not reported as unhandled; it is thrown when awaited.
    writing.catch(() => undefined);
  }
  await writing;
  for (const [v, version] of versions.entries()) await changeMonthValues(writer, version.id, companyId, summedMonthValueChanges(monthValues[v]!));
}
