import { eq } from "drizzle-orm";
import { DEFAULT_BALANCE_BAND, type BalanceBand } from "@analysis/chemistry/saturation";
import type { MetalThresholds } from "@analysis/metals/reading";
import type { UnitSystem } from "~/lib/units";
import { metalThresholdsFrom } from "../company-settings";
import { db } from "../db/client";
import { companies } from "../db/schema";
import type { Scope } from "../scope";

export type CompanyPreferences = {
  units: UnitSystem;
  timeZone: string;
  thresholds: MetalThresholds;
  balanceBand: BalanceBand;
};

/** The settings every route-book and visit page reads: units, time zone, thresholds, balance band. */
export async function companyPreferences(scope: Scope): Promise<CompanyPreferences> {
  const [row] = await db()
    .select({ unitSystem: companies.unitSystem, timeZone: companies.timeZone, settings: companies.settings })
    .from(companies)
    .where(eq(companies.id, scope.companyId));
  if (!row) throw new Error(`company ${scope.companyId} vanished while signed in`);
  return {
    units: row.unitSystem,
    timeZone: row.timeZone,
    thresholds: metalThresholdsFrom(row.settings),
    balanceBand: row.settings?.balanceBand ?? DEFAULT_BALANCE_BAND,
  };
}
