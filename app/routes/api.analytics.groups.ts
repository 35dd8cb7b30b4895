import type { GroupingKey } from "@analysis/stats/groups";
import { readAnalyticsRequest } from "~/.server/analytics/request";
import { groupFigures } from "~/.server/analytics/queries/group-figures";
import { groupsQuery } from "~/lib/analytics/params";
import type { Route } from "./+types/api.analytics.groups";

export async function loader({ request, context }: Route.LoaderArgs) {
  const { scope, query, window, thresholds } = await readAnalyticsRequest(request, context, "risk", groupsQuery, "api");
  const metal = query.metal ?? null;
  return Response.json(await groupFigures(scope, { window, thresholds, metal, grouping: query.grouping as GroupingKey }));
}
