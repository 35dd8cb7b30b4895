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

/** Whole calendar years from one instant to another, counted on UTC dates. */
export function wholeYearsBetween(from: number, to: number): number {
  const a = new Date(from);
  const b = new Date(to);
  let years = b.getUTCFullYear() - a.getUTCFullYear();
  const beforeAnniversary =
    b.getUTCMonth() < a.getUTCMonth() || (b.getUTCMonth() === a.getUTCMonth() && b.getUTCDate() < a.getUTCDate());
  if (beforeAnniversary) years--;
  return years;
}

/** Heaters on the pool at a given date, oldest first; undated ones last. */
export function heatersAt(pool: PoolProfile, at: number, kinds: readonly EquipmentKind[] = HEATING_KINDS): Equipment[] {
  return (pool.equipment ?? [])
    .filter((item) => kinds.includes(item.kind) && isInstalledAt(item, at))
    .sort((a, b) => (a.installedAt ?? Infinity) - (b.installedAt ?? Infinity));
}

/** Lower edges of the age buckets in years: 0-4, 5-9, 10-14, 15+. */
export const DEFAULT_HEATER_AGE_EDGES: readonly number[] = [5, 10, 15];

export function ageBucketLabel(ageYears: number, edges: readonly number[] = DEFAULT_HEATER_AGE_EDGES): string {
  let lower = 0;
  for (const edge of edges) {
    if (ageYears < edge) return `${lower}-${edge - 1}`;
    lower = edge;
  }
  return `${lower}+`;
}

/**
 * Heater age bucket at the date of a test: "none" without a heater, "unknown"
 * when any heater present lacks an install date (its age could be anything),
 * otherwise the bucket of the oldest heater.
 */
export function heaterAgeBucketAt(pool: PoolProfile, at: number, edges: readonly number[] = DEFAULT_HEATER_AGE_EDGES): string {
  const heaters = heatersAt(pool, at);
  if (heaters.length === 0) return "none";
  if (heaters.some((h) => h.installedAt === null)) return "unknown";
  return ageBucketLabel(wholeYearsBetween(heaters[0]!.installedAt!, at), edges);
}

const EXCHANGER_RISK_ORDER: readonly ExchangerMetal[] = ["copper", "cupronickel", "titanium", "none-unknown"];

/** The exchanger metal of the heaters present, the most corrodible one when several are fitted. */
export function exchangerMetalAt(pool: PoolProfile, at: number): ExchangerMetal | "no-heater" {
  const heaters = heatersAt(pool, at);
  if (heaters.length === 0) return "no-heater";
  const metals = new Set(heaters.map((h) => h.exchangerMetal ?? "none-unknown"));
  return EXCHANGER_RISK_ORDER.find((m) => metals.has(m)) ?? "none-unknown";
}

export function daysBetween(from: number, to: number): number {
  return (to - from) / DAY_MS;
}
