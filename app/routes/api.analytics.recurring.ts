import { readAnalyticsRequest } from "~/.server/analytics/request";
import { recurringPools, recurringReadings } from "~/.server/analytics/queries/recurring-pools";
import { recurringQuery } from "~/lib/analytics/params";
import type { Route } from "./+types/api.analytics.recurring";

export async function loader({ request, context }: Route.LoaderArgs) {
  const { scope, query, window, thresholds } = await readAnalyticsRequest(request, context, "recurring", recurringQuery, "api");
  const params = {
    window,
    thresholds,
    metal: query.metal ?? null,
    recurrenceWindowDays: query.recurrenceWindowDays,
    chronicAfterDays: query.chronicAfterDays,
  };
  if (query.include === "readings") return Response.json(await recurringReadings(scope, params));
  return Response.json(await recurringPools(scope, params));
}
