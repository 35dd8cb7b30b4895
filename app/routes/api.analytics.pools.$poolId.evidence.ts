import { readAnalyticsRequest } from "~/.server/analytics/request";
import { apiError } from "~/.server/guard";
import { poolEvidence } from "~/.server/analytics/queries/pool-evidence";
import { evidenceQuery } from "~/lib/analytics/params";
import { poolIdParams } from "~/lib/params";
import type { Route } from "./+types/api.analytics.pools.$poolId.evidence";

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { scope, window, thresholds, balanceBand } = await readAnalyticsRequest(request, context, "pools", evidenceQuery, "api");
  const id = poolIdParams.safeParse(params);
  if (!id.success) throw apiError(400, "invalid_parameter", `poolId "${params.poolId}": ${id.error.issues[0]?.message}`, "poolId");
  const evidence = await poolEvidence(scope, id.data.poolId, { window, thresholds, metal: null, balanceBand });
  if (!evidence) throw apiError(404, "not_found", `No pool ${id.data.poolId} in your scope.`);
  return Response.json(evidence);
}
