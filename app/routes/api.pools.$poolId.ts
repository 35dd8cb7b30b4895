import { apiError, requireArea } from "~/.server/guard";
import { poolDetail } from "~/.server/routebook/queries/pool-detail";
import { poolIdParams } from "~/lib/params";
import type { Route } from "./+types/api.pools.$poolId";

export async function loader({ params, context }: Route.LoaderArgs) {
  const scope = requireArea(context, "pools");
  const parsed = poolIdParams.safeParse(params);
  if (!parsed.success) {
    throw apiError(400, "invalid_parameter", parsed.error.issues[0]?.message ?? "poolId is not valid", "poolId");
  }
  const detail = await poolDetail(scope, parsed.data.poolId);
  if (!detail) throw apiError(404, "not_found", `No pool ${parsed.data.poolId} in your scope.`);
  return Response.json(detail);
}
