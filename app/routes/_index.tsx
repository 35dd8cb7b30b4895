import { Link } from "react-router";
import { METALS } from "@analysis/metals/reading";
import { companyPreferences } from "~/.server/settings/queries/company-settings";
import { requireArea } from "~/.server/guard";
import { homeSummary, stopsForWeekday } from "~/.server/routebook/queries/home-summary";
import { metalOutlookIfReady, type OutlookAnswer } from "~/.server/analytics/queries/metal-outlook";
import { formatChance, OUTLOOK_NAME, OutlookList } from "~/components/analytics/outlook-list";
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
  const { thresholds, balanceBand } = await companyPreferences(scope);
  const weekday = isoWeekdayIn(now, scope.timeZone);
  const showsOutlook = scope.role === "owner" || scope.role === "manager" || scope.role === "technician";
  const [summary, stops, outlook] = await Promise.all([
    homeSummary(scope, thresholds, now),
    scope.role === "technician" ? stopsForWeekday(scope, weekday) : Promise.resolve([]),
    showsOutlook ? metalOutlookIfReady(scope, { thresholds, balanceBand }, OUTLOOK_WAIT_MS) : Promise.resolve(null),
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
    outlook: outlook ? homeOutlook(outlook, scope.role === "technician") : null,
    outlookPending: showsOutlook && !outlook,
  };
}

/** A fresh fit takes seconds; the home page does not wait that long for it. */
const OUTLOOK_WAIT_MS = 1500;

const HOME_OUTLOOK_LENGTH = 8;

/**
 * Owners and managers see the top of the list; a technician sees the pools of
 * their routes in the company's top tenth: the ones to test for metals this week.
 */
function homeOutlook(outlook: OutlookAnswer, technician: boolean) {
  const entries = technician ? outlook.entries.filter((e) => e.flagged) : outlook.entries;
  return { method: outlook.method, methodNote: outlook.methodNote, entries: entries.slice(0, HOME_OUTLOOK_LENGTH), more: Math.max(0, entries.length - HOME_OUTLOOK_LENGTH) };
}

export default function Home({ loaderData }: Route.ComponentProps) {
  const { role, userName, timeZone, weekday, summary, stops, marks, outlook, outlookPending } = loaderData;
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

      {outlook && role === "technician" ? (
        <section aria-labelledby="metal-tests-due">
          <h2 id="metal-tests-due" className="mb-1 text-lg font-semibold">
            Test for metals this week
          </h2>
          <p className="mb-3 text-sm text-muted">
            Pools on your routes in the company's top tenth of the {OUTLOOK_NAME.toLowerCase()}, with the reason.
          </p>
          {outlook.entries.length === 0 ? (
            <p className="rounded-xl border border-line bg-white p-4 text-muted">None of your pools is in the company's top tenth this week.</p>
          ) : (
            <ul className="divide-y divide-line overflow-hidden rounded-xl border border-line bg-white" data-metal-tests-due>
              {outlook.entries.map((e) => (
                <li key={`${e.poolId}-${e.metal}`} className="px-4 py-3">
                  <Link to={`/pools/${e.poolId}`} className="font-medium text-verdigris-700 underline">
                    {e.street}
                  </Link>
                  <span className="ml-2 text-sm">
                    {METAL_LABELS[e.metal]}
                    {outlook.method === "model" ? `, ${formatChance(e.probability)} in 4 weeks` : ""}
                  </span>
                  <span className="block text-sm text-muted">{e.reasons[0]?.text ?? "Near the company's average"}</span>
                </li>
              ))}
            </ul>
          )}
        </section>
      ) : null}

      {outlookPending ? (
        <p className="rounded-xl border border-line bg-white p-4 text-muted" data-outlook-pending>
          The {OUTLOOK_NAME.toLowerCase()} is being worked out from the record; it shows here on your next visit, or open{" "}
          <TextLink to="/outlook">{OUTLOOK_NAME}</TextLink>.
        </p>
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

      {outlook && role !== "technician" ? (
        <section aria-labelledby="outlook">
          <h2 id="outlook" className="mb-1 text-lg font-semibold">
            {OUTLOOK_NAME}: the next four weeks
          </h2>
          <p className="mb-3 text-sm text-muted">{outlook.methodNote}</p>
          <OutlookList entries={outlook.entries} method={outlook.method} timeZone={timeZone} caption={`${OUTLOOK_NAME}: pools most likely to open a metal episode first`} />
          <p className="mt-2 text-sm">
            <TextLink to="/outlook">The whole list and how it did on past seasons</TextLink>
            {outlook.more > 0 ? <span className="text-muted"> ({outlook.more} more)</span> : null}
          </p>
        </section>
      ) : null}
    </div>
  );
}

export { ErrorPanel as ErrorBoundary } from "~/components/error-panel";
