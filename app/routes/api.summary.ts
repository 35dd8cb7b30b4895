import { companyPreferences } from "~/.server/settings/queries/company-settings";
import { requireArea } from "~/.server/guard";
import { homeSummary } from "~/.server/routebook/queries/home-summary";
import type { Route } from "./+types/api.summary";

export async function loader({ context }: Route.LoaderArgs) {
  const scope = requireArea(context, "home");
  const summary = await homeSummary(scope, (await companyPreferences(scope)).thresholds);
  return Response.json(summary);
}
