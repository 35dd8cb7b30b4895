import type { MetalTest } from "./episodes";
import { METALS, type Metal, type MetalThresholds } from "./reading";

/** How many readings of one value a pool-month (or a company's month) holds. */
export type KeptMonthValue = { value: number; belowDetection: boolean; n: number };

/**
 * One metal's readings in a pool-month: how many, how many at or above the
 * elevated level (below-detection readings never are), and the readings
 * themselves as counts of each value.
 */
export type KeptMetalMonth = { readings: number; elevated: number; values: KeptMonthValue[] };

/**
 * One pool's local month: the days with a metal reading, and each metal
 * measured in it (a metal not measured that month is absent).
 */
export type KeptPoolMonth = {
  poolId: string;
  /** "YYYY-MM" in the company's time zone, at the instant of the test. */
  month: string;
  days: number;
  metals: Partial<Record<Metal, KeptMetalMonth>>;
};

const dayFormats = new Map<string, (at: number) => string>();

/**
 * The local calendar day ("YYYY-MM-DD") of an instant in a time zone. Tests
 * cluster in working hours, so the formatted day is cached per UTC hour, and
 * each zone's formatter and cache live as long as the process: a visit save
 * keeps one pool and would otherwise pay for a new formatter every time.
 */
export function localDayOf(timeZone: string): (at: number) => string {
  const kept = dayFormats.get(timeZone);
  if (kept) return kept;
  const format = new Intl.DateTimeFormat("en-CA", { timeZone, year: "numeric", month: "2-digit", day: "2-digit" });
  let byHour = new Map<number, string>();
  const dayOf = (at: number) => {
    const hour = Math.floor(at / 3_600_000);
    let day = byHour.get(hour);
    if (day === undefined) {
      // Every zone's offset is a whole number of quarter hours, so one hour can straddle midnight: format the instant itself then.
      const start = format.format(hour * 3_600_000);
      const end = format.format(hour * 3_600_000 + 3_599_999);
      if (start !== end) return format.format(at);
      day = start;
      // About eleven years of hours; then start again rather than grow without end.
      if (byHour.size >= 100_000) byHour = new Map();
      byHour.set(hour, day);
    }
    return day;
  };
  dayFormats.set(timeZone, dayOf);
  return dayOf;
}

const byValue = (a: KeptMonthValue, b: KeptMonthValue) => a.value - b.value || Number(a.belowDetection) - Number(b.belowDetection);

/** Counts of each reading value, below-detection readings apart: keyed by the number itself, not a string per reading. */
class ValueCounts {
  private readonly measured = new Map<number, KeptMonthValue>();
  private readonly below = new Map<number, KeptMonthValue>();

  add(value: number, belowDetection: boolean, n: number): void {
    const counts = belowDetection ? this.below : this.measured;
    const counted = counts.get(value);
    if (counted) counted.n += n;
    else counts.set(value, { value, belowDetection, n });
  }

  all(): KeptMonthValue[] {
    return [...this.measured.values(), ...this.below.values()];
  }
}

/**
 * What is kept of some pools' metal tests per local month: one row per pool
 * and month with a metal reading. `tests` are ordered by pool; the rows come
 * ordered by pool and month.
 */
export function keptMonthsOf(tests: readonly MetalTest[], thresholds: MetalThresholds, timeZone: string): KeptPoolMonth[] {
  const dayOf = localDayOf(timeZone);
  const rows: KeptPoolMonth[] = [];
  type Open = { row: KeptPoolMonth; days: Set<string>; values: Array<ValueCounts | undefined> };
  // The pool's months so far, by month.
  let open = new Map<string, Open>();
  let pool: string | null = null;
  const flush = () => {
    const months = [...open.values()].sort((a, b) => (a.row.month < b.row.month ? -1 : a.row.month > b.row.month ? 1 : 0));
    for (const o of months) {
      o.row.days = o.days.size;
      // Listed in METALS order, whichever metal the month's first test had.
      const metals: KeptPoolMonth["metals"] = {};
      METALS.forEach((metal, m) => {
        const counts = o.row.metals[metal];
        if (!counts) return;
        counts.values = o.values[m]!.all().sort(byValue);
        metals[metal] = counts;
      });
      o.row.metals = metals;
      rows.push(o.row);
    }
    open = new Map();
  };
  for (const t of tests) {
    if (t.poolId !== pool) {
      flush();
      pool = t.poolId;
    }
    let o: Open | undefined;
    for (let m = 0; m < METALS.length; m++) {
      const metal = METALS[m]!;
      const reading = t[metal];
      if (!reading) continue;
      if (!o) {
        const day = dayOf(t.takenAt);
        const month = day.slice(0, 7);
        o = open.get(month);
        if (!o) open.set(month, (o = { row: { poolId: t.poolId, month, days: 0, metals: {} }, days: new Set(), values: [] }));
        o.days.add(day);
      }
      const counts = o.row.metals[metal] ?? (o.row.metals[metal] = { readings: 0, elevated: 0, values: [] });
      counts.readings++;
      if (!reading.belowDetection && reading.value >= thresholds[metal].elevated) counts.elevated++;
      const { value, belowDetection } = reading;
      (o.values[m] ??= new ValueCounts()).add(value, belowDetection, 1);
    }
  }
  flush();
  return rows;
}

/** The metals measured in a pool-month, in METALS order, with their counts. */
export function metalsOfMonth(row: KeptPoolMonth): Array<[Metal, KeptMetalMonth]> {
  const measured: Array<[Metal, KeptMetalMonth]> = [];
  for (const metal of METALS) {
    const counts = row.metals[metal];
    if (counts) measured.push([metal, counts]);
  }
  return measured;
}

/** A change to a company's month histogram: add n readings of a value (n may be negative). */
export type MonthValueChange = KeptMonthValue & { metal: Metal; month: string };

/**
 * What replacing some pools' month rows does to the company's month
 * histogram: the new rows' readings counted in, the old rows' counted out,
 * only the values whose count changes, ordered by metal, month and value
 * (the order writes take their row locks in).
 */
export function monthValueChanges(before: readonly KeptPoolMonth[], after: readonly KeptPoolMonth[]): MonthValueChange[] {
  const changes = new MonthChanges();
  for (const row of before) for (const [metal, counts] of metalsOfMonth(row)) changes.add(metal, row.month, counts.values, -1);
  for (const row of after) for (const [metal, counts] of metalsOfMonth(row)) changes.add(metal, row.month, counts.values, 1);
  return changes.inLockOrder();
}

/**
 * Several sets of changes summed into one (the slices of pools one write
 * keeps), so the histogram is written once, in the order writes take its locks.
 */
export function summedMonthValueChanges(parts: readonly (readonly MonthValueChange[])[]): MonthValueChange[] {
  const changes = new MonthChanges();
  for (const part of parts) for (const c of part) changes.add(c.metal, c.month, [c], 1);
  return changes.inLockOrder();
}

/** Changes summed per metal and month, then per value: it runs for every value of every kept month. */
class MonthChanges {
  /** Per metal (in METALS order), per month. */
  private readonly byMetal = METALS.map(() => new Map<string, ValueCounts>());

  add(metal: Metal, month: string, values: readonly KeptMonthValue[], sign: 1 | -1): void {
    const byMonth = this.byMetal[METALS.indexOf(metal)]!;
    let counts = byMonth.get(month);
    if (!counts) byMonth.set(month, (counts = new ValueCounts()));
    for (const v of values) counts.add(v.value, v.belowDetection, sign * v.n);
  }

  inLockOrder(): MonthValueChange[] {
    const changes: MonthValueChange[] = [];
    METALS.forEach((metal, m) => {
      const months = [...this.byMetal[m]!.entries()].sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
      for (const [month, counts] of months) {
        for (const c of counts.all().sort(byValue)) if (c.n !== 0) changes.push({ metal, month, ...c });
      }
    });
    return changes;
  }
}
