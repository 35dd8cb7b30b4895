import { eq } from "drizzle-orm";
import { DEFAULT_BALANCE_BAND, type BalanceBand } from "@analysis/chemistry/saturation";
import { DEFAULT_METAL_THRESHOLDS, METALS, type MetalThresholds } from "@analysis/metals/reading";
import { DEFAULT_CURRENCY } from "~/lib/format";
import type { UnitSystem } from "~/lib/units";
import { db } from "../../db/client";
import { type CompanySettings, companies } from "../../db/schema";
import type { Scope } from "../../scope";

/** A company's own settings with the defaults filled in: what pages, analytics and mail read. */
export type CompanyPreferences = {
  name: string;
  town: string | null;
  units: UnitSystem;
  timeZone: string;
  thresholds: MetalThresholds;
  balanceBand: BalanceBand;
  /** Owners also receive alerts (managers always do). */
  alertOwners: boolean;
  /** ISO 4217 code every cost is shown in. */
  currency: string;
};

function metalThresholdsFrom(settings: CompanySettings | null | undefined): MetalThresholds {
  const merged = { ...DEFAULT_METAL_THRESHOLDS };
  for (const metal of METALS) {
    const own = settings?.metalThresholds?.[metal];
    if (own) merged[metal] = { ...own };
  }
  return merged;
}

/** The one read of a company's settings; null when there is no such company. */
export async function companySettings(companyId: number): Promise<CompanyPreferences | null> {
  const [row] = await db()
    .select({ name: companies.name, town: companies.town, unitSystem: companies.unitSystem, timeZone: companies.timeZone, settings: companies.settings })
    .from(companies)
    .where(eq(companies.id, companyId));
  if (!row) return null;
  return {
    name: row.name,
    town: row.town,
    units: row.unitSystem,
    timeZone: row.timeZone,
    thresholds: metalThresholdsFrom(row.settings),
    balanceBand: row.settings?.balanceBand ?? DEFAULT_BALANCE_BAND,
    alertOwners: row.settings?.alertOwners === true,
    currency: row.settings?.currency ?? DEFAULT_CURRENCY,
  };
}

/** The signed-in member's company settings (its row cannot be missing while they are signed in). */
export async function companyPreferences(scope: Scope): Promise<CompanyPreferences> {
  const settings = await companySettings(scope.companyId);
  if (!settings) throw new Error(`company ${scope.companyId} vanished while signed in`);
  return settings;
}
