import { Link } from "react-router";
import { METALS } from "@analysis/metals/reading";
import { companyPreferences } from "~/.server/settings/queries/company-settings";
import { requireArea } from "~/.server/guard";
import { homeSummary, stopsForWeekday } from "~/.server/routebook/queries/home-summary";
import { metalMarks } from "~/.server/visits/queries/metal-marks";
import { Stat } from "~/components/stat";
import { MetalBadge } from "~/components/visit/metal-badge";
import { TextLink } from "~/components/text-link";
import { formatCount, formatDate, formatMgL, isoWeekdayIn, weekdayName } from "~/lib/format";
import { METAL_LABELS } from "@analysis/metals/names";
import type { Route } from "./+types/_index";

export const meta: Route.MetaFunction = () => [{ title: "Home · Patina" }];

const GREETING: Record<string, string> = {
  owner: "The company at a glance",
  manager: "Your routes at a glance",
  technician: "Today on your routes",
  analyst: "The record at a glance",
};

export async function loader({ context }: Route.LoaderArgs) {
  const scope = requireArea(context, "home");
  const now = new Date();
  const thresholds = (await companyPreferences(scope)).thresholds;
  const weekday = isoWeekdayIn(now, scope.timeZone);
  const [summary, stops] = await Promise.all([
    homeSummary(scope, thresholds, now),
    scope.role === "technician" ? stopsForWeekday(scope, weekday) : Promise.resolve([]),
  ]);
  const marks = await metalMarks(scope, stops.map((stop) => stop.poolId), thresholds);
  return {
    role: scope.role,
    userName: scope.userName,
    timeZone: scope.timeZone,
    weekday,
    summary,
    stops,
    marks,
  };
}

export default function Home({ loaderData }: Route.ComponentProps) {
  const { role, userName, timeZone, weekday, summary, stops, marks } = loaderData;
  const openTotal = summary.openCases.length;
  return (
    <div className="space-y-8">
      <section>
        <p className="text-sm text-muted">Hello, {userName.split(" ")[0]}</p>
        <h1 className="text-2xl font-semibold tracking-tight">{GREETING[role]}</h1>
      </section>

      {role === "technician" ? (
        <section aria-labelledby="today">
          <h2 id="today" className="mb-3 text-lg font-semibold">
            {weekdayName(weekday)}: {stops.length} {stops.length === 1 ? "pool" : "pools"} to visit
          </h2>
          {stops.length === 0 ? (
            <p className="rounded-xl border border-line bg-white p-4 text-muted">
              None of your routes is served on {weekdayName(weekday)}.
            </p>
          ) : (
            <ul className="divide-y divide-line overflow-hidden rounded-xl border border-line bg-white">
              {stops.map((stop) => (
                <li key={stop.poolId}>
                  <Link to={`/pools/${stop.poolId}`} className="flex items-center justify-between gap-3 px-4 py-3 hover:bg-verdigris-50">
                    <span>
                      <span className="block font-medium">{stop.street}</span>
                      <span className="block text-sm text-muted">
                        {stop.customerName} · {stop.neighbourhood ?? "—"} · {stop.routeName}
                      </span>
                      <MetalBadge mark={marks[stop.poolId]} />
                    </span>
                    <span className="text-right text-xs text-muted">last visit {formatDate(stop.lastVisitAt, timeZone)}</span>
                  </Link>
                </li>
              ))}
            </ul>
          )}
        </section>
      ) : null}

      <section aria-labelledby="figures">
        <h2 id="figures" className="sr-only">
          Figures
        </h2>
        <dl className="grid grid-cols-2 gap-3 sm:grid-cols-4">
          <Stat label={role === "technician" ? "Pools on your routes" : "Active pools"} value={formatCount(summary.pools)} />
          <Stat label="Routes" value={formatCount(summary.routes)} />
          <Stat label="Water tests on record" value={formatCount(summary.tests)} hint={`last ${formatDate(summary.lastTestAt, timeZone)}`} />
          <Stat label="Tests in the last 30 days" value={formatCount(summary.testsLast30Days)} />
        </dl>
      </section>

      <section aria-labelledby="metal-episodes">
        <h2 id="metal-episodes" className="mb-3 text-lg font-semibold">
          Open metal episodes
        </h2>
        <dl className="mb-4 grid grid-cols-3 gap-3">
          {METALS.map((metal) => (
            <Stat
              key={metal}
              label={METAL_LABELS[metal]}
              value={formatCount(summary.openCasesByMetal[metal])}
              tone={summary.openCasesByMetal[metal] > 0 ? "alert" : "calm"}
            />
          ))}
        </dl>
        {openTotal === 0 ? (
          <p className="rounded-xl border border-line bg-white p-4 text-muted">
            No pool has an open metal episode: every elevated reading has been followed by a clear one.
          </p>
        ) : (
          <div className="overflow-x-auto rounded-xl border border-line bg-white">
            <table className="w-full text-left text-sm">
              <caption className="sr-only">Pools with an open metal episode, latest elevated reading first</caption>
              <thead className="border-b border-line text-muted">
                <tr>
                  <th scope="col" className="px-4 py-2 font-medium">Pool</th>
                  <th scope="col" className="px-4 py-2 font-medium">Metal</th>
                  <th scope="col" className="px-4 py-2 font-medium">Last elevated reading</th>
                </tr>
              </thead>
              <tbody className="divide-y divide-line">
                {summary.openCases.slice(0, 12).map((c) => (
                  <tr key={`${c.poolId}-${c.metal}`}>
                    <td className="px-4 py-2">
                      <TextLink to={`/pools/${c.poolId}`}>{c.street}</TextLink>
                      <span className="block text-xs text-muted">{c.customerName}</span>
                    </td>
                    <td className="px-4 py-2">{METAL_LABELS[c.metal]}</td>
                    <td className="px-4 py-2 tabular-nums">
                      {formatMgL(c.lastElevatedValue)} on {formatDate(c.lastElevatedAt, timeZone)}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
            {openTotal > 12 ? <p className="px-4 py-2 text-xs text-muted">and {openTotal - 12} more</p> : null}
          </div>
        )}
        <p className="mt-2 text-xs text-muted">
          Elevated and clear levels are the company's settings (staining levels from common practice, not health limits).
        </p>
      </section>
    </div>
  );
}

export { ErrorPanel as ErrorBoundary } from "~/components/error-panel";
