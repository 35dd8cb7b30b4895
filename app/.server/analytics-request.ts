import { data, type RouterContextProvider } from "react-router";
import type { z } from "zod";
import type { BalanceBand } from "@analysis/chemistry/saturation";
import type { MetalThresholds } from "@analysis/metals/reading";
import type { Area } from "~/lib/roles";
import { parseQuery, thresholdProblem, withOverrides, type ThresholdOverrides } from "~/lib/analytics/params";
import { apiError, requireArea } from "./guard";
import type { Scope } from "./scope";
import { companyAnalyticsSettings, narrowToRoute, resolveWindow, type AnalyticsWindow } from "./queries/analytics/window";

export type AnalyticsRequest<T> = {
  /** The member's scope, narrowed to the requested route when one was given. */
  scope: Scope;
  query: T;
  window: AnalyticsWindow;
  thresholds: MetalThresholds;
  /** The company's own levels, before the request's overrides. */
  companyThresholds: MetalThresholds;
  balanceBand: BalanceBand;
};

type Mode = "api" | "page";

function refuse(mode: Mode, field: string, message: string): never {
  if (mode === "api") throw apiError(400, "invalid_parameter", message, field);
  throw data(message, { status: 400 });
}

/**
 * The edge of every analytics loader: the member's role (the scope itself was
 * resolved by the request's middleware), then the query parameters (zod), then
 * the company's levels with any overrides.
 */
export async function readAnalyticsRequest<S extends z.ZodType>(
  request: Request,
  context: Readonly<RouterContextProvider>,
  area: Area,
  schema: S,
  mode: Mode,
): Promise<AnalyticsRequest<z.output<S>>> {
  const member = requireArea(context, area);
  const parsed = parseQuery(new URL(request.url).searchParams, schema);
  if (!parsed.ok) refuse(mode, parsed.field, parsed.message);
  const query = parsed.data as z.output<S> & { from?: string; to?: string; route?: number };
  const settings = await companyAnalyticsSettings(member.companyId);
  const thresholds = withOverrides(settings.thresholds, query as ThresholdOverrides);
  const problem = thresholdProblem(thresholds);
  if (problem) refuse(mode, problem.field, problem.message);
  return {
    scope: narrowToRoute(member, query.route),
    query,
    window: resolveWindow(member, query),
    thresholds,
    companyThresholds: settings.thresholds,
    balanceBand: settings.balanceBand,
  };
}
