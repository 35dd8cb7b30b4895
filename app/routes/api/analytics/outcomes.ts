import { readAnalyticsRequest } from "~/.server/analytics-request";
import { treatmentOutcomes } from "~/.server/queries/analytics/treatment-outcomes";
import { outcomesQuery } from "~/lib/analytics/params";
import type { Route } from "./+types/outcomes";

export async function loader({ request, context }: Route.LoaderArgs) {
  const { scope, query, window, thresholds } = await readAnalyticsRequest(request, context, "outcomes", outcomesQuery, "api");
  return Response.json(await treatmentOutcomes(scope, { window, thresholds, metal: query.metal, arm: query.arm }));
}
