import { Link, useSearchParams } from "react-router";
import { METALS, metalStatus, type MetalThresholds } from "@analysis/metals/reading";
import { readAnalyticsRequest } from "~/.server/analytics/request";
import { sourceHealth, type PoolMetalState, type SourceHealth } from "~/.server/analytics/queries/source-health";
import { FilterBar, QueryState, useSearchObject } from "~/components/analytics/filter-bar";
import { SourceTestChart } from "~/components/analytics/source-test-chart";
import { TextLink } from "~/components/text-link";
import { analyticsQueries, loaderSearch, onlyOnNewPath, useSeededQuery } from "~/hooks/analytics-queries";
import { sourceHealthQuery } from "~/lib/analytics/params";
import { formatDate } from "~/lib/format";
import { SOURCE_KIND_LABELS, labelOf } from "~/lib/labels";
import { METAL_LABELS } from "@analysis/metals/names";
import type { Route } from "./+types/sources.health";
import { StateMark, type StateLevel } from "~/components/state-mark";
import { Pager } from "~/components/pager";

export const meta: Route.MetaFunction = () => [{ title: "Source health · Patina" }];

const PARAMS = ["from", "to", "route", "metal"] as const;

export async function loader({ request, context }: Route.LoaderArgs) {
  const { scope, query, window, thresholds } = await readAnalyticsRequest(request, context, "sources", sourceHealthQuery, "page");
  const report = await sourceHealth(scope, { window, thresholds, metal: query.metal ?? null });
  return {
    search: loaderSearch(request, PARAMS),
    timeZone: scope.timeZone,
    technician: scope.role === "technician",
    thresholds,
    report,
  };
}

/** Sources shown in full per page; the ones needing attention come first. */
const SOURCES_PER_PAGE = 4;

/** Why a source needs a look, one phrase each: a wave of episodes, pools with an open episode, fill water at or above the elevated level. */
function attentionReasons(source: SourceHealth, thresholds: MetalThresholds): string[] {
  const reasons = METALS.flatMap((metal) => {
    const waves = source.alerts.filter((a) => a.metal === metal);
    if (waves.length === 0) return [];
    const latest = waves.reduce((a, b) => (b.lastOpeningAt > a.lastOpeningAt ? b : a));
    const name = METAL_LABELS[metal].toLowerCase();
    return [`${waves.length} ${waves.length === 1 ? "wave" : "waves"} of ${name} episodes (the latest: ${latest.poolCount} pools by ${latest.lastOpeningAt.slice(0, 10)})`];
  });
  const open = source.pools.filter((p) => METALS.some((m) => p.metals[m].state === "open")).length;
  if (open > 0) reasons.push(`${open} ${open === 1 ? "pool has" : "pools have"} an open episode`);
  const elevatedTest = [...source.sourceTests]
    .reverse()
    .flatMap((t) => METALS.flatMap((m) => (t[m] && metalStatus(t[m], thresholds[m]) === "elevated" ? [{ metal: m, value: t[m].value, on: t.sampledOn }] : [])))[0];
  if (elevatedTest) reasons.push(`fill water ${METAL_LABELS[elevatedTest.metal].toLowerCase()} ${elevatedTest.value} mg/L on ${elevatedTest.on}`);
  return reasons;
}

export const shouldRevalidate = onlyOnNewPath;

const STATE_WORDS: Record<PoolMetalState, string> = { open: "episode open", clear: "no open episode", "not-tested": "not tested" };
const STATE_LEVEL: Record<PoolMetalState, StateLevel> = { open: "above", clear: "fine", "not-tested": "fine" };

export default function SourceHealthPage({ loaderData }: Route.ComponentProps) {
  const params = useSearchObject(PARAMS);
  const query = useSeededQuery(analyticsQueries.sources(params), { search: loaderData.search, data: loaderData.report });
  const report = query.data;
  const { timeZone, technician, thresholds } = loaderData;
  const flagged = report.sources.filter((s) => s.flagged);
  const attention = report.sources.map((s) => ({ source: s, reasons: attentionReasons(s, thresholds) }));
  const ordered = [...attention.filter((a) => a.reasons.length > 0), ...attention.filter((a) => a.reasons.length === 0)];
  const [search] = useSearchParams();
  const pages = Math.max(1, Math.ceil(ordered.length / SOURCES_PER_PAGE));
  const page = Math.min(pages, Math.max(1, Number.parseInt(search.get("page") ?? "1", 10) || 1));
  const shown = ordered.slice((page - 1) * SOURCES_PER_PAGE, page * SOURCES_PER_PAGE);
  const pageHref = (n: number) => {
    const next = new URLSearchParams(search);
    if (n > 1) next.set("page", String(n));
    else next.delete("page");
    return `?${next.toString()}#sources`;
  };

  return (
    <div className="space-y-6">
      <header>
        <h1 className="text-2xl font-semibold tracking-tight">Source health</h1>
        <p className="text-muted">
          {technician
            ? "The fill sources of the pools on your routes, and which of your pools share a source that set off an alert."
            : "Each fill source with its pools, their metal state, the source's own water tests and its alerts."}
        </p>
      </header>
      <FilterBar metal />
      <QueryState isFetching={query.isFetching} error={query.error} />

      <p role="status" className={`rounded-xl border p-4 ${flagged.length ? "border-alert/50 bg-white" : "border-line bg-white"}`}>
        {flagged.length === 0
          ? "No fill source set off a shared-source alert in this window."
          : `${flagged.length} flagged ${flagged.length === 1 ? "source" : "sources"}: ${flagged.map((s) => s.name).join(", ")}. ${
              technician ? "Your pools on them" : "Pools you can see on them"
            }: ${report.flaggedPoolsInScope}.`}
      </p>

      {report.sources.length === 0 ? (
        <p className="rounded-xl border border-line bg-white p-4 text-muted">
          {technician ? "No pool on your routes is linked to a fill source yet." : "No fill source is recorded in the route book yet."}
        </p>
      ) : (
        <>
        <section aria-labelledby="attention" className="space-y-2">
          <h2 id="attention" className="text-lg font-semibold">Needs a look</h2>
          {ordered[0]?.reasons.length ? (
            <ul className="divide-y divide-line rounded-xl border border-line bg-white text-sm">
              {ordered
                .filter((a) => a.reasons.length > 0)
                .map(({ source, reasons }, i) => (
                  <li key={source.fillSourceId} className="px-4 py-2">
                    <Link to={pageHref(Math.floor(i / SOURCES_PER_PAGE) + 1).replace("#sources", `#source-${source.fillSourceId}`)} className="font-medium text-verdigris-700 underline">
                      {source.name}
                    </Link>
                    <span className="text-muted"> · {reasons.join("; ")}</span>
                  </li>
                ))}
            </ul>
          ) : (
            <p className="rounded-xl border border-line bg-white p-4 text-muted">No source has a wave of episodes, a pool with an open episode or a fill-water test at or above the elevated level.</p>
          )}
        </section>
        <h2 id="sources" className="text-lg font-semibold">
          Every source ({ordered.length}){pages > 1 ? `, page ${page} of ${pages}` : ""}
        </h2>
        <ul className="space-y-4">
          {shown.map(({ source }) => (
            <li key={source.fillSourceId} id={`source-${source.fillSourceId}`} className="rounded-xl border border-line bg-white p-4">
              {/* Details on demand: a flagged source opens by itself, the others on a tap. */}
              <details open={source.flagged} className="group space-y-3">
              <summary className="flex cursor-pointer flex-wrap items-baseline justify-between gap-2">
                <h2 className="text-lg font-semibold">
                  {source.name}
                  {source.flagged ? <span className="ml-2 rounded bg-alert px-2 py-0.5 text-xs font-semibold text-white">flagged</span> : null}
                </h2>
                <span className="text-sm text-muted">
                  {labelOf(SOURCE_KIND_LABELS, source.kind)} · {source.activePools} active pools in the company
                </span>
              </summary>
              {source.alerts.length > 0 ? (
                <ul className="space-y-1 text-sm">
                  {source.alerts.map((a) => (
                    <li key={`${a.metal}-${a.firstOpeningAt}`}>
                      <span className="font-medium">{METAL_LABELS[a.metal]}</span>: {a.poolCount} pools opened an episode between{" "}
                      {formatDate(a.firstOpeningAt, timeZone)} and {formatDate(a.lastOpeningAt, timeZone)}
                      {a.pools.length > 0 ? ` (${technician ? "on your routes" : "pools"}: ${a.pools.map((p) => p.street).join(", ")})` : ""}
                      {a.poolsOutsideScope > 0 ? `, ${a.poolsOutsideScope} on other routes` : ""}.
                    </li>
                  ))}
                </ul>
              ) : null}
              {source.pools.length === 0 ? (
                <p className="text-sm text-muted">No active pool in your view draws from this source.</p>
              ) : (
                <div className="overflow-x-auto">
                  <table className="w-full text-left text-sm">
                    <caption className="sr-only">Pools on {source.name} and their metal state</caption>
                    <thead className="border-b border-line text-muted">
                      <tr>
                        <th scope="col" className="py-1 pr-3 font-medium">Pool</th>
                        {METALS.map((m) => (
                          <th key={m} scope="col" className="py-1 pr-3 font-medium">
                            {METAL_LABELS[m]}
                          </th>
                        ))}
                      </tr>
                    </thead>
                    <tbody className="divide-y divide-line">
                      {source.pools.map((p) => (
                        <tr key={p.poolId}>
                          <td className="py-1 pr-3">
                            <TextLink to={`/pools/${p.poolId}`}>{p.street}</TextLink>
                            <span className="block text-xs text-muted">{p.routeName ?? "no route"}</span>
                          </td>
                          {METALS.map((m) => (
                            <td key={m} className={`py-1 pr-3 ${p.metals[m].state === "not-tested" ? "text-muted" : ""}`}>
                              <StateMark level={STATE_LEVEL[p.metals[m].state]}>{STATE_WORDS[p.metals[m].state]}</StateMark>
                            </td>
                          ))}
                        </tr>
                      ))}
                    </tbody>
                  </table>
                </div>
              )}
              {source.sourceTests.length > 0 || source.flagged || source.kind !== "municipal" ? (
                <SourceTestChart name={source.name} tests={source.sourceTests} thresholds={thresholds} />
              ) : null}
              </details>
            </li>
          ))}
        </ul>
        <Pager label="Source pages" page={page} pages={pages} href={pageHref} earlier="Previous sources" later="Next sources" />
        </>
      )}
      <p className="text-xs text-muted">
        A shared-source alert: at least 3 pools, and at least a quarter of the source's active pools, opened an episode of the same metal within
        21 days (common practice).
      </p>
    </div>
  );
}

export { ErrorPanel as ErrorBoundary } from "~/components/error-panel";
