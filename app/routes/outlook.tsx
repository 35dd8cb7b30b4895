import { Form } from "react-router";
import { METALS } from "@analysis/metals/reading";
import { METAL_LABELS } from "@analysis/metals/names";
import { readAnalyticsRequest } from "~/.server/analytics/request";
import { metalOutlookFor } from "~/.server/analytics/queries/metal-outlook";
import { CalibrationChart } from "~/components/analytics/calibration-chart";
import { formatChance, OUTLOOK_NAME, OutlookList } from "~/components/analytics/outlook-list";
import { Stat } from "~/components/stat";
import { formatCount, formatDate } from "~/lib/format";
import { outlookQuery } from "~/lib/analytics/params";
import type { Route } from "./+types/outlook";

export const meta: Route.MetaFunction = () => [{ title: `${OUTLOOK_NAME} · Patina` }];

const LIST_LENGTH = 30;

export async function loader({ request, context }: Route.LoaderArgs) {
  const { scope, query, thresholds, balanceBand } = await readAnalyticsRequest(request, context, "outlook", outlookQuery, "page");
  const outlook = await metalOutlookFor(scope, { thresholds, balanceBand }, { metal: query.metal, limit: query.limit ?? LIST_LENGTH });
  return { outlook, metal: query.metal ?? null, timeZone: scope.timeZone };
}

const pct = (share: number) => `${(share * 100).toFixed(0)}%`;

export default function Outlook({ loaderData }: Route.ComponentProps) {
  const { outlook, metal, timeZone } = loaderData;
  const bt = outlook.backtest;
  return (
    <div className="space-y-6">
      <header>
        <h1 className="text-2xl font-semibold tracking-tight">{OUTLOOK_NAME}</h1>
        <p className="text-muted">
          Which pools are likely to open a metal episode in the next {outlook.horizonDays} days, from what the record shows
          {outlook.asOf ? ` up to ${formatDate(outlook.asOf, timeZone)}` : ""}. Each pool's number is explained by its three largest reasons.
        </p>
      </header>

      <p className="rounded-xl border border-line bg-white p-4" data-outlook-method={outlook.method}>
        <span className="font-medium">{outlook.method === "model" ? "Ranked by the company's own model. " : "Ranked by the latest reading. "}</span>
        {outlook.methodNote}
      </p>

      <section aria-labelledby="outlook-list">
        <div className="mb-3 flex flex-wrap items-end justify-between gap-3">
          <h2 id="outlook-list" className="text-lg font-semibold">
            Pools to watch {metal ? `for ${METAL_LABELS[metal].toLowerCase()}` : ""}
          </h2>
          <Form method="get" className="flex items-end gap-2">
            <label className="text-sm">
              <span className="block text-muted">Metal</span>
              <select name="metal" defaultValue={metal ?? ""} className="rounded-lg border border-line bg-white px-2 py-1">
                <option value="">All metals</option>
                {METALS.map((m) => (
                  <option key={m} value={m}>
                    {METAL_LABELS[m]}
                  </option>
                ))}
              </select>
            </label>
            <button type="submit" className="rounded-lg border border-line px-3 py-1 text-sm font-medium hover:bg-verdigris-50">
              Show
            </button>
          </Form>
        </div>
        <OutlookList entries={outlook.entries} method={outlook.method} timeZone={timeZone} caption={`${OUTLOOK_NAME}: pools most likely to open a metal episode first`} />
        {outlook.total > outlook.entries.length ? (
          <p className="mt-2 text-xs text-muted">
            The first {outlook.entries.length} of {formatCount(outlook.total)} pool-metals; ◆ marks the company's top tenth.
          </p>
        ) : null}
        <p className="mt-2 text-xs text-muted">
          Pools with an open episode of a metal are left out for that metal (they are on the home page's open episodes). A chance is an estimate from
          past seasons, not a test result: test the water before treating.
        </p>
      </section>

      <section aria-labelledby="outlook-backtest" className="space-y-4">
        <h2 id="outlook-backtest" className="text-lg font-semibold">
          How it did on past seasons
        </h2>
        {bt ? (
          <>
            <p className="text-sm text-muted">
              Rolling origin over {bt.origins} weeks ({formatDate(bt.firstOrigin, timeZone)} to {formatDate(bt.lastOrigin, timeZone)}): at each week the model
              was fitted on everything whose four weeks had ended before it, then forecast the next {outlook.horizonDays} days.
            </p>
            <dl className="grid grid-cols-2 gap-3 sm:grid-cols-4" data-backtest>
              <Stat label="Forecasts tested" value={formatCount(bt.forecasts)} hint={`${formatCount(bt.openings)} openings, base rate ${formatChance(bt.baseRate)}`} />
              <Stat label="Brier score" value={bt.brier.toFixed(4)} hint={`base rate alone ${bt.baseRateBrier.toFixed(4)}; skill ${(bt.skill * 100).toFixed(0)}%`} />
              <Stat label={`Openings in the model's top ${pct(bt.topShare)}`} value={pct(bt.model.share)} hint={`${bt.model.caught.toFixed(1)} of ${bt.model.openings}`} />
              <Stat
                label={`Openings in the top ${pct(bt.topShare)} by latest reading`}
                value={pct(bt.latestReading.share)}
                hint={`${bt.latestReading.caught.toFixed(1)} of ${bt.latestReading.openings}`}
              />
            </dl>
            <CalibrationChart bins={bt.calibration} />
          </>
        ) : (
          <p className="rounded-xl border border-line bg-white p-4 text-muted">Not enough history for a backtest yet: it needs weeks of tests with at least five openings of a metal before them.</p>
        )}
      </section>
    </div>
  );
}

export { ErrorPanel as ErrorBoundary } from "~/components/error-panel";
