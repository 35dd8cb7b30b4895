import { eq } from "drizzle-orm";
import { DEFAULT_METAL_THRESHOLDS, METALS, type MetalThresholds } from "@analysis/metals/reading";
import { db } from "./db/client";
import { type CompanySettings, companies } from "./db/schema";

export function metalThresholdsFrom(settings: CompanySettings | null | undefined): MetalThresholds {
  const merged = { ...DEFAULT_METAL_THRESHOLDS };
  for (const metal of METALS) {
    const own = settings?.metalThresholds?.[metal];
    if (own) merged[metal] = { ...own };
  }
  return merged;
}

export async function companyMetalThresholds(companyId: number): Promise<MetalThresholds> {
  const [row] = await db().select({ settings: companies.settings }).from(companies).where(eq(companies.id, companyId));
  return metalThresholdsFrom(row?.settings);
}
