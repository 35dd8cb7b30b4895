import { TZDate } from "@date-fns/tz";
import { eq } from "drizzle-orm";
import { DEFAULT_BALANCE_BAND, type BalanceBand } from "@analysis/chemistry/saturation";
import type { Metal, MetalThresholds } from "@analysis/metals/reading";
import { metalThresholdsFrom } from "../../company-settings";
import { db } from "../../db/client";
import { companies } from "../../db/schema";
import type { Scope } from "../../scope";

/** Instants bounding the tests an analytics question reads; null = open-ended. */
export type AnalyticsWindow = { from: Date | null; to: Date | null };

/** The typed parameters every analytics question takes besides the Scope. */
export type AnalyticsParams = {
  window: AnalyticsWindow;
  thresholds: MetalThresholds;
  /** null: every metal. */
  metal: Metal | null;
};

/** Whole local days in the company's time zone: from its first instant to the end of `to`. */
export function resolveWindow(scope: Scope, days: { from?: string; to?: string }): AnalyticsWindow {
  const startOf = (text: string) => {
    const [y, m, d] = text.split("-").map(Number) as [number, number, number];
    return new Date(new TZDate(y, m - 1, d, scope.timeZone).getTime());
  };
  return {
    from: days.from ? startOf(days.from) : null,
    to: days.to ? new Date(startOf(days.to).getTime() + 86_400_000 - 1) : null,
  };
}

/**
 * A member's scope narrowed to one route. A route outside the member's
 * routes (or company) leaves nothing in scope, so it reveals nothing.
 */
export function narrowToRoute(scope: Scope, routeId: number | undefined): Scope {
  if (routeId === undefined) return scope;
  if (scope.routeIds !== null && !scope.routeIds.includes(routeId)) return { ...scope, routeIds: [] };
  return { ...scope, routeIds: [routeId] };
}

export type AnalyticsSettings = { thresholds: MetalThresholds; balanceBand: BalanceBand };

export async function companyAnalyticsSettings(companyId: number): Promise<AnalyticsSettings> {
  const [row] = await db().select({ settings: companies.settings }).from(companies).where(eq(companies.id, companyId));
  return {
    thresholds: metalThresholdsFrom(row?.settings),
    balanceBand: row?.settings?.balanceBand ?? DEFAULT_BALANCE_BAND,
  };
}
