import { DAY_MS } from "./episodes";

export type FillSourceKind = "municipal" | "private-well" | "shared-well" | "trucked" | "other";
export type SurfaceFinish = "plaster" | "pebble" | "quartz" | "vinyl" | "fibreglass" | "tile";
export type SanitiserSystem = "chlorine" | "salt-chlorine-generator" | "mineral-ioniser-assist" | "other";
export type EquipmentKind = "heater" | "heat-pump" | "salt-cell" | "pump" | "filter" | "ioniser" | "other";
export type ExchangerMetal = "copper" | "cupronickel" | "titanium" | "none-unknown";

export interface Equipment {
  id: string;
  kind: EquipmentKind;
  exchangerMetal?: ExchangerMetal | null;
  /** Epoch ms; null when the install date was never recorded. */
  installedAt: number | null;
  removedAt?: number | null;
}

/** What the analysis needs to know about a pool from the route book. */
export interface PoolProfile {
  poolId: string;
  fillSourceId?: string | null;
  fillSourceKind?: FillSourceKind | null;
  neighbourhood?: string | null;
  routeId?: string | null;
  surface?: SurfaceFinish | null;
  sanitiser?: SanitiserSystem | null;
  equipment?: readonly Equipment[];
}

export const HEATING_KINDS: readonly EquipmentKind[] = ["heater", "heat-pump"];

export function isInstalledAt(item: Equipment, at: number): boolean {
  if (item.installedAt !== null && item.installedAt > at) return false;
  return item.removedAt === null || item.removedAt === undefined || item.removedAt > at;
}

/**
 * The UTC calendar date of an instant as one comparable number, year * 10000
 * + month * 100 + day (month 1-12), by the days-to-civil conversion of the
 * proleptic Gregorian calendar (H. Hinnant, "chrono-compatible low-level date
 * algorithms"), without a Date: group comparisons ask it for every instant of
 * every pool.
 */
export function utcDateNumber(instant: number): number {
  const days = Math.floor(instant / DAY_MS) + 719_468;
  const era = Math.floor(days / 146_097);
  const dayOfEra = days - era * 146_097;
  const yearOfEra = Math.floor((dayOfEra - Math.floor(dayOfEra / 1460) + Math.floor(dayOfEra / 36_524) - Math.floor(dayOfEra / 146_096)) / 365);
  const dayOfYear = dayOfEra - (365 * yearOfEra + Math.floor(yearOfEra / 4) - Math.floor(yearOfEra / 100));
  const shiftedMonth = Math.floor((5 * dayOfYear + 2) / 153);
  const day = dayOfYear - Math.floor((153 * shiftedMonth + 2) / 5) + 1;
  const month = shiftedMonth < 10 ? shiftedMonth + 3 : shiftedMonth - 9;
  const year = yearOfEra + era * 400 + (month <= 2 ? 1 : 0);
  return year * 10_000 + month * 100 + day;
}

/** Whole calendar years from one instant to another, counted on UTC dates. */
export function wholeYearsBetween(from: number, to: number): number {
  const a = utcDateNumber(from);
  const b = utcDateNumber(to);
  const years = Math.floor(b / 10_000) - Math.floor(a / 10_000);
  // Before the anniversary: the month and day of `to` come before those of `from`.
  return b % 10_000 < a % 10_000 ? years - 1 : years;
}

/** Heaters on the pool at a given date, oldest first; undated ones last. */
export function heatersAt(pool: PoolProfile, at: number, kinds: readonly EquipmentKind[] = HEATING_KINDS): Equipment[] {
  return (pool.equipment ?? [])
    .filter((item) => kinds.includes(item.kind) && isInstalledAt(item, at))
    .sort((a, b) => (a.installedAt ?? Infinity) - (b.installedAt ?? Infinity));
}

/** Lower edges of the age buckets in years: 0-4, 5-9, 10-14, 15+. */
export const DEFAULT_HEATER_AGE_EDGES: readonly number[] = [5, 10, 15];

/** Each set of edges' labels, made once: the same strings every time, not a new one per instant. */
const bucketLabels = new WeakMap<readonly number[], string[]>();

function labelsOf(edges: readonly number[]): string[] {
  let labels = bucketLabels.get(edges);
  if (!labels) {
    labels = edges.map((edge, i) => `${i === 0 ? 0 : edges[i - 1]!}-${edge - 1}`);
    labels.push(`${edges.length === 0 ? 0 : edges[edges.length - 1]!}+`);
    bucketLabels.set(edges, labels);
  }
  return labels;
}

export function ageBucketLabel(ageYears: number, edges: readonly number[] = DEFAULT_HEATER_AGE_EDGES): string {
  const labels = labelsOf(edges);
  for (let i = 0; i < edges.length; i++) if (ageYears < edges[i]!) return labels[i]!;
  return labels[edges.length]!;
}

/**
 * Heater age bucket at the date of a test: "none" without a heater, "unknown"
 * when any heater present lacks an install date (its age could be anything),
 * otherwise the bucket of the oldest heater.
 */
export function heaterAgeBucketAt(pool: PoolProfile, at: number, edges: readonly number[] = DEFAULT_HEATER_AGE_EDGES): string {
  // The oldest heater present decides; one without an install date makes the age unknown.
  // A loop, not heatersAt: the group comparison asks this at every instant of every pool.
  let present = false;
  let oldest = Infinity;
  for (const item of pool.equipment ?? []) {
    if (!HEATING_KINDS.includes(item.kind) || !isInstalledAt(item, at)) continue;
    if (item.installedAt === null) return "unknown";
    present = true;
    if (item.installedAt < oldest) oldest = item.installedAt;
  }
  return present ? ageBucketLabel(wholeYearsBetween(oldest, at), edges) : "none";
}

const EXCHANGER_RISK_ORDER: readonly ExchangerMetal[] = ["copper", "cupronickel", "titanium", "none-unknown"];

/** The exchanger metal of the heaters present, the most corrodible one when several are fitted. */
export function exchangerMetalAt(pool: PoolProfile, at: number): ExchangerMetal | "no-heater" {
  let mostCorrodible = EXCHANGER_RISK_ORDER.length;
  for (const item of pool.equipment ?? []) {
    if (!HEATING_KINDS.includes(item.kind) || !isInstalledAt(item, at)) continue;
    const rank = EXCHANGER_RISK_ORDER.indexOf(item.exchangerMetal ?? "none-unknown");
    mostCorrodible = Math.min(mostCorrodible, rank < 0 ? EXCHANGER_RISK_ORDER.length - 1 : rank);
  }
  return mostCorrodible === EXCHANGER_RISK_ORDER.length ? "no-heater" : EXCHANGER_RISK_ORDER[mostCorrodible]!;
}

export function daysBetween(from: number, to: number): number {
  return (to - from) / DAY_MS;
}
