import { companyPreferences } from "~/.server/company-settings";
import { requireApiMember } from "~/.server/guard";
import { homeSummary } from "~/.server/queries/home-summary";
import type { Route } from "./+types/summary";

export async function loader({ request }: Route.LoaderArgs) {
  const scope = await requireApiMember(request, "home");
  const summary = await homeSummary(scope, (await companyPreferences(scope)).thresholds);
  return Response.json(summary);
}
