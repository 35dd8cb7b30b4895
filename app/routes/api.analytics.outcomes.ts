import { readAnalyticsRequest } from "~/.server/analytics/request";
import { treatmentOutcomes } from "~/.server/analytics/queries/treatment-outcomes";
import { outcomesQuery } from "~/lib/analytics/params";
import type { Route } from "./+types/api.analytics.outcomes";

export async function loader({ request, context }: Route.LoaderArgs) {
  const { scope, query, window, thresholds } = await readAnalyticsRequest(request, context, "outcomes", outcomesQuery, "api");
  return Response.json(await treatmentOutcomes(scope, { window, thresholds, metal: query.metal, arm: query.arm }));
}
