// The demo scenario as plain rows, with no database involved. Ids are assigned
// here so rows can reference each other; the same seed always gives the same
// rows.
import { isoDay, LocalClock } from "./calendar";
import { simulatePoolHistory, type IdCounter, type PoolHistory, type TreatmentRow, type WaterTestRow } from "./history";
import { Random } from "./random";
import { buildRouteBook, FRESH_IDS, type IdBase, type PoolProfile, type RouteBook, type ScenarioOptions } from "./routebook";

export type { IdBase, RouteBook, ScenarioOptions } from "./routebook";
export type { TreatmentRow, WaterTestRow } from "./history";

export const DEFAULT_OPTIONS: ScenarioOptions = { seed: 20261127, pools: 120, years: 3, endDate: "2026-11-27" };

export type Scenario = RouteBook & { waterTests: WaterTestRow[]; treatments: TreatmentRow[] };

export function resolveOptions(options: Partial<ScenarioOptions> = {}): ScenarioOptions {
  const resolved = { ...DEFAULT_OPTIONS, ...options };
  if (!Number.isInteger(resolved.pools) || resolved.pools < 10) throw new Error("pools must be a whole number of at least 10");
  if (!Number.isInteger(resolved.years) || resolved.years < 1) throw new Error("years must be a whole number of at least 1");
  if (!/^\d{4}-\d{2}-\d{2}$/.test(resolved.endDate)) throw new Error("endDate must be YYYY-MM-DD");
  return resolved;
}

/** The whole scenario in memory; fine for the demo size. Large runs use poolHistories(). */
export function buildScenario(options: Partial<ScenarioOptions> = {}, ids: IdBase = FRESH_IDS): Scenario {
  const book = buildRouteBook(resolveOptions(options), ids);
  const waterTests: WaterTestRow[] = [];
  const treatments: TreatmentRow[] = [];
  for (const history of poolHistories(book)) {
    for (const row of history.waterTests) waterTests.push(row);
    for (const row of history.treatments) treatments.push(row);
  }
  return { ...book, waterTests, treatments };
}

/**
 * Water tests and treatments pool by pool, in pool order. Each pool draws from
 * its own random stream, so the result does not depend on how it is consumed.
 */
export function* poolHistories(book: RouteBook): Generator<PoolHistory & { pool: PoolProfile }> {
  const ids: IdCounter = { waterTest: book.ids.waterTest, treatment: book.ids.treatment };
  const clock = new LocalClock(book.timeZone);
  const root = new Random(book.options.seed).fork("history");
  for (const pool of book.profiles) {
    yield { pool, ...simulatePoolHistory(book, pool, root.fork(pool.index), ids, clock) };
  }
}

/** Where the causes were planted, for checking analytics against the scenario. */
export function plantedCauses(book: RouteBook) {
  const codes = (filter: (pool: PoolProfile) => boolean) => book.profiles.filter(filter).map((p) => p.accountCode);
  const ironWell = book.profiles.find((p) => p.source.kind === "shared_well" && p.source.iron > 0.2)?.source;
  const heaterPools = book.profiles.flatMap((pool) =>
    pool.heaters
      .filter((h) => h.exchangerMetal === "copper" || h.exchangerMetal === "cupronickel")
      .map((h) => ({
        accountCode: pool.accountCode,
        exchangerMetal: h.exchangerMetal,
        installedOn: isoDay(h.installedDay),
        removedOn: h.removedDay === null ? null : isoDay(h.removedDay),
        ageAtStartYears: Number(((book.startDay - h.installedDay) / 365.25).toFixed(1)),
      })),
  );
  return {
    ironWell: ironWell ? { source: ironWell.name, pools: codes((p) => p.source === ironWell) } : null,
    copperExchangers: heaterPools.filter((h) => h.ageAtStartYears >= 8),
    copperAlgaecide: codes((p) => p.usesCopperAlgaecide),
    ionisers: codes((p) => p.hasIoniser),
    manganeseWells: book.profiles
      .filter((p) => p.source.kind === "private_well" && p.source.manganese >= 0.05)
      .map((p) => ({ source: p.source.name, pool: p.accountCode })),
    ironPrivateWells: book.profiles
      .filter((p) => p.source.kind === "private_well" && p.source.iron >= 0.1)
      .map((p) => ({ source: p.source.name, pool: p.accountCode })),
    stainSetsIn: codes((p) => p.stainSetsIn),
  };
}
