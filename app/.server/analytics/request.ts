import { data, type RouterContextProvider } from "react-router";
import type { z } from "zod";
import type { BalanceBand } from "@analysis/chemistry/saturation";
import type { MetalThresholds } from "@analysis/metals/reading";
import type { Area } from "~/lib/roles";
import { parseQuery, thresholdProblem, withOverrides, type ThresholdOverrides } from "~/lib/analytics/params";
import { analyticsGate, GateRefused } from "./gate";
import { companyPreferences } from "../settings/queries/company-settings";
import { apiError, requireArea } from "../guard";
import { narrowToRoute, resolveWindow, type TimeWindow } from "./queries/tenant-and-window";
import { requestContext } from "../request-context";
import type { Scope } from "../scope";
import { unavailableApiResponse, unavailablePageError } from "../service-unavailable";

export type AnalyticsRequest<T> = {
  /** The member's scope, narrowed to the requested route when one was given. */
  scope: Scope;
  query: T;
  window: TimeWindow;
  thresholds: MetalThresholds;
  /** The company's own levels, before the request's overrides. */
  companyThresholds: MetalThresholds;
  balanceBand: BalanceBand;
  /** The company's currency (ISO 4217), for pages that show costs. */
  currency: string;
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
  const settings = await companyPreferences(member);
  const thresholds = withOverrides(settings.thresholds, query as ThresholdOverrides);
  const problem = thresholdProblem(thresholds);
  if (problem) refuse(mode, problem.field, problem.message);
  await holdAnalyticsSlot(mode);
  return {
    scope: narrowToRoute(member, query.route),
    query,
    window: resolveWindow(member, query),
    thresholds,
    companyThresholds: settings.thresholds,
    balanceBand: settings.balanceBand,
    currency: settings.currency,
  };
}

/**
 * Heavy analytics wait for one of the instance's few slots (a short queue,
 * then 503 with Retry-After); once in, the request's reads carry the statement
 * limit and stop with their client. The slot is given back when the response
 * is produced. Outside a server request (scripts, direct loader calls) there
 * is no gate.
 */
async function holdAnalyticsSlot(mode: Mode) {
  const context = requestContext();
  if (!context || context.heavy) return;
  try {
    const release = await analyticsGate().enter(context.signal);
    context.finishers.push(release);
    context.heavy = true;
  } catch (error) {
    if (!(error instanceof GateRefused)) throw error;
    throw mode === "api" ? unavailableApiResponse("busy") : unavailablePageError("busy");
  }
}
