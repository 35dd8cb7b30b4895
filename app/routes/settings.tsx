import { METALS } from "@analysis/metals/reading";
import { metalThresholdsFrom } from "~/.server/company-settings";
import { requireMember } from "~/.server/guard";
import { companySettingsRow } from "~/.server/queries/company";
import { ErrorPanel } from "~/components/error-panel";
import { METAL_LABELS } from "~/lib/metals";
import type { Route } from "./+types/settings";

export const meta: Route.MetaFunction = () => [{ title: "Settings · Patina" }];

export async function loader({ request }: Route.LoaderArgs) {
  const scope = await requireMember(request, "settings");
  const company = await companySettingsRow(scope);
  return {
    name: company.name,
    town: company.town,
    timeZone: company.timeZone,
    unitSystem: company.unitSystem,
    thresholds: metalThresholdsFrom(company.settings),
  };
}

export default function Settings({ loaderData }: Route.ComponentProps) {
  const { name, town, timeZone, unitSystem, thresholds } = loaderData;
  return (
    <div className="space-y-6">
      <h1 className="text-2xl font-semibold tracking-tight">Company settings</h1>
      <dl className="grid grid-cols-2 gap-3 rounded-xl border border-line bg-white p-4 text-sm">
        <div><dt className="text-muted">Company</dt><dd className="font-medium">{name}</dd></div>
        <div><dt className="text-muted">Town</dt><dd className="font-medium">{town ?? "—"}</dd></div>
        <div><dt className="text-muted">Time zone</dt><dd className="font-medium">{timeZone}</dd></div>
        <div><dt className="text-muted">Units</dt><dd className="font-medium">{unitSystem === "us" ? "US (gallons, °F)" : "Metric (litres, °C)"}</dd></div>
      </dl>
      <section aria-labelledby="thresholds">
        <h2 id="thresholds" className="mb-2 text-lg font-semibold">Metal levels (mg/L)</h2>
        <table className="w-full rounded-xl border border-line bg-white text-left text-sm tabular-nums">
          <thead className="text-muted">
            <tr><th className="px-4 py-2 font-medium">Metal</th><th className="px-4 py-2 font-medium">Elevated at or above</th><th className="px-4 py-2 font-medium">Clear below</th></tr>
          </thead>
          <tbody className="divide-y divide-line">
            {METALS.map((metal) => (
              <tr key={metal}>
                <td className="px-4 py-2">{METAL_LABELS[metal]}</td>
                <td className="px-4 py-2">{thresholds[metal].elevated}</td>
                <td className="px-4 py-2">{thresholds[metal].clear}</td>
              </tr>
            ))}
          </tbody>
        </table>
        <p className="mt-2 text-xs text-muted">Staining levels from common practice, not health limits.</p>
      </section>
    </div>
  );
}

export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  return <ErrorPanel error={error} />;
}

