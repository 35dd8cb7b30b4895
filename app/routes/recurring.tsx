import { useQuery } from "@tanstack/react-query";
import { useEffect, useMemo, useState } from "react";
import type { MetalTest } from "@analysis/metals/episodes";
import { METALS, type Metal, type MetalThresholds } from "@analysis/metals/reading";
import { readAnalyticsRequest } from "~/.server/analytics/request";
import { recurringReadings } from "~/.server/analytics/queries/recurring-pools";
import { FilterBar, QueryState, useSearchObject } from "~/components/analytics/filter-bar";
import { RecurringPoolChart } from "~/components/analytics/recurring-pool-chart";
import { RecurringTable } from "~/components/analytics/recurring-table";
import { Stat } from "~/components/stat";
import { TextLink } from "~/components/text-link";
import { analyticsQueries, loaderSearch, onlyOnNewPath } from "~/hooks/analytics-queries";
import { recurringQuery, toSearch } from "~/lib/analytics/params";
import { decodeReadingColumns, decodeTreatmentColumns } from "~/lib/analytics/reading-columns";
import { findRecurring } from "@analysis/metals/recurring-finder";
import { formatCount } from "~/lib/format";
import { METAL_LABELS } from "@analysis/metals/names";
import type { Route } from "./+types/recurring";

export const meta: Route.MetaFunction = () => [{ title: "Recurring metal · Patina" }];

const PARAMS = ["from", "to", "route", "metal"] as const;
const PAGE = 12;

export async function loader({ request, context }: Route.LoaderArgs) {
  const { scope, query, window, companyThresholds } = await readAnalyticsRequest(request, context, "recurring", recurringQuery, "page");
  // The first paint draws only the first pools listed at the company's levels, so only their readings
  // come with it (and the counts of the whole list); the hook fetches the readings of every pool that
  // could recur once the levels or filters move or more pools are asked for.
  const data = await recurringReadings(scope, { window, thresholds: companyThresholds, metal: query.metal ?? null }, { firstListed: PAGE });
  return { search: loaderSearch(request, PARAMS), company: companyThresholds, data };
}

export const shouldRevalidate = onlyOnNewPath;

/**
 * The elevated levels the readings are fetched for, sent with the company's
 * clear levels (kept at or below them so the request stays valid).
 */
function floorParams(floor: Record<Metal, number>, company: MetalThresholds) {
  return Object.fromEntries(
    METALS.flatMap((m) => [
      [`${m}Elevated`, floor[m]],
      [`${m}Clear`, Math.min(company[m].clear, floor[m])],
    ]),
  );
}

function LevelInputs({
  metals,
  levels,
  onChange,
}: {
  metals: readonly Metal[];
  levels: MetalThresholds;
  onChange: (next: MetalThresholds) => void;
}) {
  return (
    <fieldset className="rounded-xl border border-line bg-white p-4">
      <legend className="px-1 text-sm font-medium">Levels used on this page (mg/L)</legend>
      <div className="grid grid-cols-2 gap-3 sm:grid-cols-6">
        {metals.flatMap((metal) =>
          (["elevated", "clear"] as const).map((kind) => {
            const min = 0.001;
            const max = kind === "clear" ? levels[metal].elevated : 10;
            return (
              <label key={`${metal}-${kind}`} className="text-sm font-medium">
                {METAL_LABELS[metal]} {kind === "elevated" ? "elevated at or above" : "clear below"}
                <input
                  type="number"
                  inputMode="decimal"
                  step="0.01"
                  min={min}
                  max={max}
                  value={levels[metal][kind]}
                  onChange={(event) => {
                    const value = Number(event.target.value);
                    if (!Number.isFinite(value) || value < min || value > max) return;
                    onChange({ ...levels, [metal]: { ...levels[metal], [kind]: value } });
                  }}
                  className="mt-1 block w-full rounded-lg border border-line px-3 py-2 text-base tabular-nums"
                />
              </label>
            );
          }),
        )}
      </div>
      <p className="mt-2 text-xs text-muted">
        Recomputed here in the browser with the same episode rules as the server. Lowering an elevated level below the one the page was loaded
        with also fetches the readings of the pools that then reach it.
      </p>
    </fieldset>
  );
}

export default function Recurring({ loaderData }: Route.ComponentProps) {
  const params = useSearchObject(PARAMS);
  const { company } = loaderData;
  const companyElevated = useMemo(() => Object.fromEntries(METALS.map((m) => [m, company[m].elevated])) as Record<Metal, number>, [company]);
  const [levels, setLevels] = useState<MetalThresholds>(company);
  const [floor, setFloor] = useState(companyElevated);
  const [shown, setShown] = useState(PAGE);
  const moved = METALS.some((m) => levels[m].elevated !== company[m].elevated || levels[m].clear !== company[m].clear);
  // The loader's answer holds the first page of pools at the company's levels: enough until something moves.
  const loaderView = !moved && shown <= PAGE && toSearch(params) === loaderData.search;
  const query = useQuery({ ...analyticsQueries.recurringReadings({ ...params, ...floorParams(floor, company) }), enabled: !loaderView });
  // The loader's first page stays drawn until the full answer arrives.
  const data = loaderView ? loaderData.data : (query.data ?? loaderData.data);

  // A lower elevated level needs the readings of pools that only reach it: ask once the typing settles.
  useEffect(() => {
    const lower = METALS.some((m) => levels[m].elevated < floor[m]);
    if (!lower) return;
    const timer = setTimeout(() => setFloor((f) => Object.fromEntries(METALS.map((m) => [m, Math.min(f[m], levels[m].elevated)])) as Record<Metal, number>), 600);
    return () => clearTimeout(timer);
  }, [levels, floor]);

  const readings = useMemo(() => decodeReadingColumns(data.readings, data.metals), [data.readings, data.metals]);
  const treatments = useMemo(() => decodeTreatmentColumns(data.products, data.treatments), [data.products, data.treatments]);
  const names = useMemo(() => new Map(data.pools.map((p) => [p.poolId, p])), [data.pools]);
  const findings = useMemo(
    () => findRecurring(readings, names, { thresholds: levels, metals: data.metals, ...data.rules }),
    [readings, names, levels, data.metals, data.rules],
  );
  // A first page counts the whole list at the company's levels; a full answer is counted here.
  const counts =
    data.firstListed && !moved
      ? data.firstListed
      : { recurringPools: findings.recurringPools, chronicPools: findings.chronicPools, listedPools: findings.pools.length };
  const readingsByPool = useMemo(() => {
    const map = new Map<number, MetalTest[]>();
    for (const r of readings) {
      const list = map.get(Number(r.poolId));
      if (list) list.push(r);
      else map.set(Number(r.poolId), [r]);
    }
    return map;
  }, [readings]);
  const changed = data.metals.some((m) => levels[m].elevated !== company[m].elevated || levels[m].clear !== company[m].clear);

  return (
    <div className="space-y-6">
      <header>
        <h1 className="text-2xl font-semibold tracking-tight">Recurring metal</h1>
        <p className="text-muted">
          Pools where a metal came back within {data.rules.recurrenceWindowDays} days (recurring) or stayed up for more than{" "}
          {data.rules.chronicAfterDays} days (chronic). Find the cause before dosing again.
        </p>
      </header>
      <FilterBar metal />
      <QueryState isFetching={query.isFetching} error={query.error} />
      <LevelInputs metals={data.metals} levels={levels} onChange={setLevels} />
      {changed ? (
        <button type="button" onClick={() => setLevels(company)} className="text-sm font-medium text-verdigris-700 underline">
          Back to the company's levels
        </button>
      ) : null}

      <dl className="grid grid-cols-3 gap-3">
        <Stat label="Recurring pools" value={formatCount(counts.recurringPools)} tone={counts.recurringPools > 0 ? "alert" : "calm"} />
        <Stat label="Chronic pools" value={formatCount(counts.chronicPools)} tone={counts.chronicPools > 0 ? "alert" : "calm"} />
        <Stat label="Pools listed" value={formatCount(counts.listedPools)} />
      </dl>

      {findings.pools.length === 0 ? (
        <p className="rounded-xl border border-line bg-white p-4 text-muted">
          No pool shows a recurring or chronic episode at these levels in this window: every episode cleared within {data.rules.chronicAfterDays} days
          and none came back within a year.
        </p>
      ) : (
        <>
          <section aria-labelledby="listed-pools" className="space-y-2">
            <h2 id="listed-pools" className="text-lg font-semibold">
              Listed pools{counts.listedPools > findings.pools.length ? ` (first ${findings.pools.length} of ${counts.listedPools})` : ""}
            </h2>
            <RecurringTable pools={findings.pools} />
          </section>
          <h2 className="text-lg font-semibold">Each pool's readings and treatments</h2>
          <ol className="grid gap-4 lg:grid-cols-2">
            {findings.pools.slice(0, shown).map((pool) => (
              <li key={pool.poolId} className="space-y-1">
                <RecurringPoolChart
                  pool={pool}
                  readings={readingsByPool.get(pool.poolId) ?? []}
                  treatments={treatments.filter((t) => t.poolId === pool.poolId)}
                  thresholds={levels}
                  metals={data.metals}
                />
                <p className="text-sm">
                  <TextLink to={`/pools/${pool.poolId}`}>Open {pool.street}</TextLink>{" "}
                  <span className="text-muted">
                    · {pool.routeName ?? "no route"} · {pool.fillSourceName ?? "fill source not recorded"}
                  </span>
                </p>
              </li>
            ))}
          </ol>
        </>
      )}
      {counts.listedPools > shown ? (
        <button type="button" onClick={() => setShown((n) => n + PAGE)} className="rounded-lg border border-line bg-white px-4 py-2 font-medium">
          Show {Math.min(PAGE, counts.listedPools - shown)} more pools
        </button>
      ) : null}
    </div>
  );
}

export { ErrorPanel as ErrorBoundary } from "~/components/error-panel";
