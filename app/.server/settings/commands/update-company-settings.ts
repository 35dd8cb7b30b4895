import { eq } from "drizzle-orm";
import type { SettingsInput } from "~/lib/forms/settings";
import { keepCompanyCurrent } from "../../analytics/kept/versions";
import { db } from "../../db/client";
import { companies } from "../../db/schema";
import type { Scope } from "../../scope";
import type { ServiceResult } from "../../command-result";

/** Saves thresholds, balance band, units, time zone and currency; other settings keys are kept as they were. */
export async function updateCompanySettings(scope: Scope, input: SettingsInput): Promise<ServiceResult> {
  await db().transaction(async (tx) => {
    const [row] = await tx
      .select({ settings: companies.settings })
      .from(companies)
      .where(eq(companies.id, scope.companyId))
      .for("update");
    const settings = {
      ...(row?.settings ?? {}),
      metalThresholds: {
        copper: { elevated: input.copperElevated, clear: input.copperClear },
        iron: { elevated: input.ironElevated, clear: input.ironClear },
        manganese: { elevated: input.manganeseElevated, clear: input.manganeseClear },
      },
      balanceBand: { low: input.balanceLow, high: input.balanceHigh },
      ...(input.currency ? { currency: input.currency } : {}),
    };
    await tx
      .update(companies)
      .set({ settings, unitSystem: input.unitSystem, timeZone: input.timeZone })
      .where(eq(companies.id, scope.companyId));
  });
  // New levels: the kept results are built again under them, in the background; until then answers are worked out from the tests.
  void keepCompanyCurrent(scope.companyId).catch((error: unknown) => console.error(`[kept] build for company ${scope.companyId} failed`, error));
  return { ok: true, id: scope.companyId };
}
