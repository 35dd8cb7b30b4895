import { data, Form, Link } from "react-router";
import { type Metal, METALS } from "@analysis/metals/reading";
import { requireArea } from "~/.server/guard";
import { companyPreferences } from "~/.server/settings/queries/company-settings";
import { poolMetalPanel } from "~/.server/analytics/queries/pool-evidence";
import { poolPage } from "~/.server/routebook/queries/pool-page";
import { poolTestHistory } from "~/.server/routebook/queries/pool-history";
import { CautionNote } from "~/components/caution-note";
import { BalanceHistoryChart, MetalHistoryChart, type MetalPoint } from "~/components/charts/metal-history-chart";
import { PoolMetalPanel } from "~/components/pool-metal-panel";
import { ReadingTable } from "~/components/reading-table";
import { equipmentAge } from "~/components/routebook/equipment-panel";
import { todayIn } from "~/lib/dates";
import { formatDate, formatDateTime, formatMgL, formatMoney } from "~/lib/format";
import {
  ENDPOINT_LABELS,
  EQUIPMENT_KIND_LABELS,
  EXCHANGER_METAL_LABELS,
  labelOf,
  PAD_TINT_LABELS,
  PRODUCT_CATEGORY_LABELS,
  SANITISER_LABELS,
  SOURCE_KIND_LABELS,
  STAIN_COLOUR_LABELS,
  STAIN_LABELS,
  SURFACE_LABELS,
} from "~/lib/labels";
import { DEFAULT_ANALYTE_RANGES } from "@analysis/chemistry/ranges";
import { readPoolHistoryQuery } from "~/lib/pool-history";
import { roleMayOpen } from "~/lib/roles";
import { idParam, notFoundPage } from "~/lib/route-params";
import { judgeTest, testSaturationIndex } from "@analysis/chemistry/test-judgements";
import { formatTemperature, formatVolume } from "~/lib/units";
import type { Route } from "./+types/pools.$poolId";
import { StateMark } from "~/components/state-mark";
import { Pager } from "~/components/pager";

export const meta: Route.MetaFunction = ({ loaderData }) => [{ title: `${loaderData?.detail.pool.street ?? "Pool"} · Patina` }];

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const scope = requireArea(context, "pools");
  const poolId = idParam(params, "poolId", "pool");
  const filter = readPoolHistoryQuery(new URL(request.url));
  if (!filter.ok) throw data(filter.message, { status: 400 });
  const [detail, prefs, metalEvidence, history] = await Promise.all([
    poolPage(scope, poolId),
    companyPreferences(scope),
    poolMetalPanel(scope, poolId),
    poolTestHistory(scope, poolId, filter.query),
  ]);
  if (!detail) notFoundPage("No pool with that number is on your routes.");
  const saved = Number(new URL(request.url).searchParams.get("saved"));
  return {
    detail,
    prefs,
    metalEvidence,
    history,
    filter: filter.query,
    today: todayIn(prefs.timeZone),
    justSaved: detail.tests.some((t) => t.id === saved),
    mayEdit: roleMayOpen(scope.role, "routebookEdit"),
    mayLogVisit: roleMayOpen(scope.role, "visit"),
  };
}

const RECENT_TREATMENTS = 10;

type HistoryFilterValues = { page: number; year: number | undefined; metalOnly: boolean };

function historyHref(filter: HistoryFilterValues, page: number) {
  const search = new URLSearchParams();
  if (filter.year) search.set("year", String(filter.year));
  if (filter.metalOnly) search.set("metal", "only");
  if (page > 1) search.set("page", String(page));
  const text = search.toString();
  return `?${text}#tests`;
}

/** Year and "metal tests only": a plain GET form, so the filter lives in the URL and works without the script. */
function HistoryFilter({ years, filter }: { years: number[]; filter: HistoryFilterValues }) {
  return (
    <Form method="get" className="mb-3 flex flex-wrap items-end gap-3 text-sm" preventScrollReset>
      <label className="flex flex-col gap-1">
        <span>Year</span>
        <select name="year" defaultValue={filter.year ?? ""} className="rounded-lg border border-line bg-white px-2 py-2">
          <option value="">All years</option>
          {years.map((y) => (
            <option key={y} value={y}>
              {y}
            </option>
          ))}
        </select>
      </label>
      <label className="flex min-h-10 items-center gap-2">
        <input type="checkbox" name="metal" value="only" defaultChecked={filter.metalOnly} className="size-5 accent-verdigris-700" />
        Metal tests only
      </label>
      <button type="submit" className="rounded-lg border border-verdigris-700 px-4 py-2 font-medium text-verdigris-900">
        Show
      </button>
    </Form>
  );
}

const STATE_OF_TONE = { ok: "fine", watch: "between", alert: "above" } as const;

function observationText(t: {
  hardnessEndpoint: string | null;
  stain: string | null;
  stainColour: string | null;
  padTint: string | null;
  note: string | null;
}) {
  return [
    t.hardnessEndpoint ? `endpoint ${labelOf(ENDPOINT_LABELS, t.hardnessEndpoint).toLowerCase()}` : null,
    t.stain && t.stain !== "none" ? `${labelOf(STAIN_LABELS, t.stain).toLowerCase()} stain${t.stainColour ? ` (${labelOf(STAIN_COLOUR_LABELS, t.stainColour).toLowerCase()})` : ""}` : null,
    t.padTint ? `pad ${labelOf(PAD_TINT_LABELS, t.padTint).toLowerCase()}` : null,
    t.note,
  ]
    .filter(Boolean)
    .join(" · ");
}

export default function PoolPage({ loaderData }: Route.ComponentProps) {
  const { detail, prefs, metalEvidence, history, filter, today, justSaved, mayEdit, mayLogVisit } = loaderData;
  const { pool, tests, treatments } = detail;
  const { units, timeZone, thresholds, balanceBand, currency } = prefs;
  const latest = tests[0];
  const judged = latest ? judgeTest(latest, thresholds, balanceBand) : [];
  const chronological = [...tests].reverse();
  const metalPoints: MetalPoint[] = chronological.flatMap((t) =>
    METALS.flatMap((metal: Metal) =>
      t[metal] === null ? [] : [{ at: new Date(t.sampledAt), metal, value: t[metal]!, belowDetection: t[`${metal}BelowDetection`] }],
    ),
  );
  const balancePoints = chronological.map((t) => ({ at: new Date(t.sampledAt), ph: t.ph, index: testSaturationIndex(t) }));
  const phHigh = latest?.ph != null && latest.ph > DEFAULT_ANALYTE_RANGES.ph.high;
  const acidLogged = treatments.some((t) => t.category === "ph_decreaser");

  return (
    <div className="space-y-8">
      {justSaved ? (
        <p role="status" className="rounded-xl border border-verdigris-500 bg-verdigris-50 px-4 py-3 font-medium">
          Visit saved.
        </p>
      ) : null}
      <section className="flex flex-wrap items-start justify-between gap-3">
        <div>
          <p className="text-sm text-muted">
            {pool.accountCode} · {detail.routeName ?? "no route"}
            {pool.active ? "" : " · archived"}
          </p>
          <h1 className="text-2xl font-semibold tracking-tight">{pool.street}</h1>
          <p className="text-muted">
            {pool.customerName} · {pool.neighbourhood ?? "—"} {pool.postalCode ?? ""}
          </p>
          {detail.metalSuspectedSince ? (
            <p className="mt-2 inline-block rounded-full border border-alert px-3 py-1 text-sm font-semibold text-alert">
              Metal suspected since {formatDate(detail.metalSuspectedSince, timeZone)}: blurred hardness endpoint, no metal test yet
            </p>
          ) : null}
        </div>
        <div className="flex gap-2">
          {mayLogVisit ? (
            <Link to={`/visit/${pool.id}`} className="rounded-lg bg-verdigris-700 px-4 py-2.5 font-semibold text-white">
              Log a visit
            </Link>
          ) : null}
          {mayEdit ? (
            <Link to={`/pools/${pool.id}/edit`} className="rounded-lg border border-line bg-white px-4 py-2.5 font-medium">
              Edit
            </Link>
          ) : null}
        </div>
      </section>

      <dl className="grid grid-cols-2 gap-3 rounded-xl border border-line bg-white p-4 text-sm sm:grid-cols-4">
        <div>
          <dt className="text-muted">Fill water</dt>
          <dd className="font-medium">
            {pool.fillSourceId ? (
              <Link to={`/sources/${pool.fillSourceId}`} className="underline">
                {detail.fillSourceName}
              </Link>
            ) : (
              "unknown"
            )}
            {detail.fillSourceKind ? <span className="block text-muted">{labelOf(SOURCE_KIND_LABELS, detail.fillSourceKind)}</span> : null}
          </dd>
        </div>
        <div>
          <dt className="text-muted">Surface</dt>
          <dd className="font-medium">{labelOf(SURFACE_LABELS, pool.surface)}</dd>
        </div>
        <div>
          <dt className="text-muted">Sanitiser</dt>
          <dd className="font-medium">{labelOf(SANITISER_LABELS, pool.sanitiser)}</dd>
        </div>
        <div>
          <dt className="text-muted">Volume</dt>
          <dd className="font-medium">{formatVolume(pool.volumeLitres, units)}</dd>
        </div>
        <div>
          <dt className="text-muted">Customer phone</dt>
          <dd className="font-medium">{pool.customerPhone ?? "—"}</dd>
        </div>
        <div>
          <dt className="text-muted">Customer e-mail</dt>
          <dd className="font-medium break-all">{pool.customerEmail ?? "—"}</dd>
        </div>
      </dl>

      <section aria-labelledby="equipment">
        <h2 id="equipment" className="mb-2 text-lg font-semibold">Equipment</h2>
        {detail.equipment.length === 0 ? (
          <p className="text-muted">No equipment recorded.</p>
        ) : (
          <ul className="divide-y divide-line rounded-xl border border-line bg-white text-sm">
            {detail.equipment.map((item) => (
              <li key={item.id} className={`flex flex-wrap justify-between gap-2 px-4 py-2 ${item.removedOn ? "text-muted" : ""}`}>
                <span>
                  <span className="font-medium">{labelOf(EQUIPMENT_KIND_LABELS, item.kind)}</span>
                  {item.exchangerMetal ? ` · ${labelOf(EXCHANGER_METAL_LABELS, item.exchangerMetal)} exchanger` : ""}
                  {item.description ? ` · ${item.description}` : ""}
                </span>
                <span>
                  installed {item.installedOn ?? "on an unknown date"}
                  {item.removedOn ? `, removed ${item.removedOn} (in service ${equipmentAge(item, today)})` : ` · ${equipmentAge(item, today)} old today`}
                </span>
              </li>
            ))}
          </ul>
        )}
      </section>

      <section aria-labelledby="latest">
        <h2 id="latest" className="mb-2 text-lg font-semibold">
          Latest test {latest ? <span className="font-normal text-muted">· {formatDateTime(latest.sampledAt, timeZone)}</span> : null}
        </h2>
        {!latest ? (
          <p className="text-muted">No water tests yet.</p>
        ) : judged.length === 0 ? (
          <p className="text-muted">The latest visit logged observations only.</p>
        ) : (
          <ReadingTable caption="Latest test, each value judged" headings={["Reading", "Value", "Expected", "Verdict"]}>
            {judged.map((j) => (
              <tr key={j.label}>
                <td className="px-3 py-2">{j.label}</td>
                <td className="px-3 py-2">{j.value}</td>
                <td className="px-3 py-2 text-muted">{j.expected}</td>
                <td className="px-3 py-2">
                  <StateMark level={STATE_OF_TONE[j.tone]}>{j.verdict}</StateMark>
                </td>
              </tr>
            ))}
            {latest.temperatureC !== null ? (
              <tr>
                <td className="px-3 py-2">Temperature</td>
                <td className="px-3 py-2">{formatTemperature(latest.temperatureC, units)}</td>
                <td className="px-3 py-2 text-muted">—</td>
                <td className="px-3 py-2 text-muted">not judged</td>
              </tr>
            ) : null}
          </ReadingTable>
        )}
        <p className="mt-2 text-xs text-muted">
          Ranges from public pool codes (Montana pool rules, ANSI/APSP/ICC-11, CDC guidance); metal levels are the company's
          staining levels from common practice, not health limits.
        </p>
        {phHigh || acidLogged ? (
          <div className="mt-3">
            <CautionNote topics={["acid"]}>
              {phHigh ? `pH ${latest?.ph} is above ${DEFAULT_ANALYTE_RANGES.ph.high}; lowering it means adding acid.` : "A pH decreaser (an acid) has been used on this pool."}
            </CautionNote>
          </div>
        ) : null}
      </section>

      {metalEvidence ? <PoolMetalPanel evidence={metalEvidence} timeZone={prefs.timeZone} /> : null}

      <section aria-labelledby="history" className="space-y-4">
        <h2 id="history" className="text-lg font-semibold">Chemistry history</h2>
        <MetalHistoryChart points={metalPoints} thresholds={thresholds} />
        <BalanceHistoryChart points={balancePoints} band={balanceBand} />
      </section>

      <section aria-labelledby="tests">
        <h2 id="tests" className="mb-2 text-lg font-semibold">Water tests ({history.total})</h2>
        <HistoryFilter years={history.years} filter={filter} />
        {history.tests.length === 0 ? (
          <p className="text-muted">{tests.length === 0 ? "No water tests yet." : "No water test matches this filter."}</p>
        ) : (
          <>
          <ReadingTable
            caption="Water tests, newest first"
            headings={["Sampled", "pH", "Free Cl", "Alk.", "Hardness", "Temp.", "SI", "Copper", "Iron", "Manganese", "Seen"]}
          >
            {history.tests.map((t) => {
              const index = testSaturationIndex(t);
              return (
                <tr key={t.id}>
                  <td className="px-3 py-1 whitespace-nowrap">
                    {formatDateTime(t.sampledAt, timeZone)}
                    {t.technicianName ? <span className="text-xs text-muted"> · {t.technicianName}</span> : null}
                  </td>
                  <td className="px-3 py-1">{t.ph?.toFixed(2) ?? "—"}</td>
                  <td className="px-3 py-1">{t.freeChlorine?.toFixed(1) ?? "—"}</td>
                  <td className="px-3 py-1">{t.totalAlkalinity?.toFixed(0) ?? "—"}</td>
                  <td className="px-3 py-1">{t.calciumHardness?.toFixed(0) ?? "—"}</td>
                  <td className="px-3 py-1 whitespace-nowrap">{formatTemperature(t.temperatureC, units)}</td>
                  <td className="px-3 py-1">{index === null ? "—" : index.toFixed(2)}</td>
                  <td className="px-3 py-1 whitespace-nowrap">{t.copper === null ? "—" : formatMgL(t.copper, t.copperBelowDetection)}</td>
                  <td className="px-3 py-1 whitespace-nowrap">{t.iron === null ? "—" : formatMgL(t.iron, t.ironBelowDetection)}</td>
                  <td className="px-3 py-1 whitespace-nowrap">{t.manganese === null ? "—" : formatMgL(t.manganese, t.manganeseBelowDetection)}</td>
                  <td className="min-w-72 px-3 py-1">{observationText(t)}</td>
                </tr>
              );
            })}
          </ReadingTable>
          <Pager label="Water test pages" page={history.page} pages={history.pages} href={(n) => historyHref(filter, n)} earlier="Newer" later="Older" />
          </>
        )}
        <p className="mt-2 text-xs text-muted">
          SI: saturation index, pool-code factor-table form with alkalinity corrected for cyanuric acid. Since {formatDate(pool.createdAt, timeZone)} on Patina.
        </p>
      </section>

      <section aria-labelledby="treatments">
        <h2 id="treatments" className="mb-2 text-lg font-semibold">Treatments ({treatments.length})</h2>
        {treatments.length > RECENT_TREATMENTS ? <p className="mb-2 text-sm text-muted">The {RECENT_TREATMENTS} most recent.</p> : null}
        {treatments.length === 0 ? (
          <p className="text-muted">No treatments logged.</p>
        ) : (
          <ul className="divide-y divide-line rounded-xl border border-line bg-white text-sm">
            {treatments.slice(0, RECENT_TREATMENTS).map((t) => (
              <li key={t.id} className="flex flex-wrap justify-between gap-2 px-4 py-2">
                <span>
                  <span className="font-medium">{t.productName}</span>{" "}
                  <span className="text-muted">({labelOf(PRODUCT_CATEGORY_LABELS, t.category)})</span> · {t.amount} {t.unit}
                  {t.cost !== null ? ` · cost ${formatMoney(t.cost, currency)}` : ""}
                </span>
                <span className="text-muted">
                  {formatDateTime(t.appliedAt, timeZone)}
                  {t.appliedByName ? ` · ${t.appliedByName}` : ""}
                </span>
              </li>
            ))}
          </ul>
        )}
      </section>
    </div>
  );
}

export { ErrorPanel as ErrorBoundary } from "~/components/error-panel";
