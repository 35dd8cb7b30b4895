import { data } from "react-router";
import { requireMember } from "~/.server/guard";
import { poolDetail } from "~/.server/queries/pools";
import { ErrorPanel } from "~/components/error-panel";
import { formatDate, formatDateTime, formatMgL } from "~/lib/format";
import { poolIdParams } from "~/lib/params";
import type { Route } from "./+types/pool";

export const meta: Route.MetaFunction = ({ loaderData }) => [
  { title: `${loaderData?.detail.pool.street ?? "Pool"} · Patina` },
];

export async function loader({ request, params }: Route.LoaderArgs) {
  const scope = await requireMember(request, "pools");
  const parsed = poolIdParams.safeParse(params);
  if (!parsed.success) throw data("That is not a pool address.", { status: 404 });
  const detail = await poolDetail(scope, parsed.data.poolId);
  if (!detail) throw data("No pool with that number is on your routes.", { status: 404 });
  return { detail, timeZone: scope.timeZone };
}

function value(v: number | null, digits = 1) {
  return v === null ? "—" : v.toFixed(digits);
}

export default function PoolPage({ loaderData }: Route.ComponentProps) {
  const { detail, timeZone } = loaderData;
  const { pool } = detail;
  return (
    <div className="space-y-6">
      <section>
        <p className="text-sm text-muted">
          {pool.accountCode} · {detail.routeName ?? "no route"}
        </p>
        <h1 className="text-2xl font-semibold tracking-tight">{pool.street}</h1>
        <p className="text-muted">
          {pool.customerName} · {pool.neighbourhood ?? "—"} {pool.postalCode ?? ""}
        </p>
      </section>
      <dl className="grid grid-cols-2 gap-3 rounded-xl border border-line bg-white p-4 text-sm sm:grid-cols-4">
        <div>
          <dt className="text-muted">Fill water</dt>
          <dd className="font-medium">{detail.fillSourceName ?? "unknown"}</dd>
        </div>
        <div>
          <dt className="text-muted">Surface</dt>
          <dd className="font-medium">{pool.surface ?? "—"}</dd>
        </div>
        <div>
          <dt className="text-muted">Sanitiser</dt>
          <dd className="font-medium">{pool.sanitiser?.replace("_", " ") ?? "—"}</dd>
        </div>
        <div>
          <dt className="text-muted">Volume</dt>
          <dd className="font-medium">{pool.volumeLitres ? `${Math.round(pool.volumeLitres / 3.785411784).toLocaleString("en")} gal` : "—"}</dd>
        </div>
      </dl>

      <section aria-labelledby="equipment">
        <h2 id="equipment" className="mb-2 text-lg font-semibold">Equipment</h2>
        {detail.equipment.length === 0 ? (
          <p className="text-muted">No equipment recorded.</p>
        ) : (
          <ul className="divide-y divide-line rounded-xl border border-line bg-white text-sm">
            {detail.equipment.map((item) => (
              <li key={item.id} className="flex justify-between gap-3 px-4 py-2">
                <span>
                  <span className="font-medium">{item.kind.replace("_", " ")}</span>
                  {item.exchangerMetal ? <span className="text-muted"> · {item.exchangerMetal} exchanger</span> : null}
                  {item.removedOn ? <span className="text-muted"> · removed {item.removedOn}</span> : null}
                </span>
                <span className="text-muted">installed {item.installedOn ?? "unknown"}</span>
              </li>
            ))}
          </ul>
        )}
      </section>

      <section aria-labelledby="tests">
        <h2 id="tests" className="mb-2 text-lg font-semibold">Latest water tests</h2>
        {detail.tests.length === 0 ? (
          <p className="text-muted">No water tests yet.</p>
        ) : (
          <div className="overflow-x-auto rounded-xl border border-line bg-white">
            <table className="w-full text-left text-sm tabular-nums">
              <thead className="border-b border-line text-muted">
                <tr>
                  <th scope="col" className="px-3 py-2 font-medium">Sampled</th>
                  <th scope="col" className="px-3 py-2 font-medium">pH</th>
                  <th scope="col" className="px-3 py-2 font-medium">Free Cl</th>
                  <th scope="col" className="px-3 py-2 font-medium">Alk.</th>
                  <th scope="col" className="px-3 py-2 font-medium">Hardness</th>
                  <th scope="col" className="px-3 py-2 font-medium">Copper</th>
                  <th scope="col" className="px-3 py-2 font-medium">Iron</th>
                  <th scope="col" className="px-3 py-2 font-medium">Manganese</th>
                </tr>
              </thead>
              <tbody className="divide-y divide-line">
                {detail.tests.map((t) => (
                  <tr key={t.id}>
                    <td className="px-3 py-2 whitespace-nowrap">{formatDateTime(t.sampledAt, timeZone)}</td>
                    <td className="px-3 py-2">{value(t.ph, 2)}</td>
                    <td className="px-3 py-2">{value(t.freeChlorine)}</td>
                    <td className="px-3 py-2">{value(t.totalAlkalinity, 0)}</td>
                    <td className="px-3 py-2">{value(t.calciumHardness, 0)}</td>
                    <td className="px-3 py-2">{t.copper === null ? "—" : formatMgL(t.copper, t.copperBelowDetection)}</td>
                    <td className="px-3 py-2">{t.iron === null ? "—" : formatMgL(t.iron, t.ironBelowDetection)}</td>
                    <td className="px-3 py-2">{t.manganese === null ? "—" : formatMgL(t.manganese, t.manganeseBelowDetection)}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
        <p className="mt-2 text-xs text-muted">Since {formatDate(pool.createdAt, timeZone)} on Patina.</p>
      </section>
    </div>
  );
}

export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  return <ErrorPanel error={error} />;
}
