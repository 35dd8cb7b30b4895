import { requireArea } from "~/.server/guard";
import { DATASETS } from "~/.server/exports/datasets";
import type { Route } from "./+types/exports";

export const meta: Route.MetaFunction = () => [{ title: "Exports · Patina" }];

const DESCRIPTIONS: Record<keyof typeof DATASETS, string> = {
  "water-tests": "Every water test with its pool, time (UTC) and readings in canonical units (mg/L, °C).",
  treatments: "Every treatment with its pool, product, amount, unit and cost.",
  pools: "Pools with customer, address, route, fill source, volume in litres, surface and sanitiser.",
  products: "Your product list with label dose and unit cost.",
  "fill-sources": "Fill-water sources and their kind.",
};

export async function loader({ context }: Route.LoaderArgs) {
  const scope = requireArea(context, "exports");
  return {
    datasets: (Object.keys(DATASETS) as Array<keyof typeof DATASETS>).map((key) => ({
      key,
      label: DATASETS[key],
      description: DESCRIPTIONS[key],
    })),
    limitedToRoutes: scope.routeIds !== null,
  };
}

export default function Exports({ loaderData }: Route.ComponentProps) {
  return (
    <div className="max-w-3xl space-y-6">
      <div>
        <h1 className="text-2xl font-semibold tracking-tight">Exports</h1>
        <p className="text-muted">
          Download your company's records as CSV files that open in any spreadsheet. Text that a spreadsheet would run as a
          formula (starting with =, +, -, @) is written with a leading apostrophe, so it shows as plain text.
        </p>
        {loaderData.limitedToRoutes ? <p className="mt-1 text-sm text-muted">Only the pools on your routes are included.</p> : null}
      </div>
      <ul className="divide-y divide-line rounded-xl border border-line bg-white">
        {loaderData.datasets.map((d) => (
          <li key={d.key} className="flex flex-wrap items-center justify-between gap-3 px-4 py-3">
            <span>
              <span className="block font-medium">{d.label}</span>
              <span className="block text-sm text-muted">{d.description}</span>
            </span>
            <a
              href={`/api/exports/${d.key}.csv`}
              download
              className="rounded-lg border border-line px-3 py-2 text-sm font-medium hover:bg-verdigris-50"
              aria-label={`Download ${d.label} as CSV`}
            >
              Download CSV
            </a>
          </li>
        ))}
      </ul>
    </div>
  );
}

export { ErrorPanel as ErrorBoundary } from "~/components/error-panel";
