import { Link } from "react-router";
import { type Metal, METALS } from "@analysis/metals/reading";
import { requireArea } from "~/.server/guard";
import { companyPreferences } from "~/.server/settings/queries/company-settings";
import { poolMetalPanel } from "~/.server/analytics/queries/pool-evidence";
import { poolPage } from "~/.server/routebook/queries/pool-page";
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
import { roleMayOpen } from "~/lib/roles";
import { idParam, notFoundPage } from "~/lib/route-params";
import { judgeTest, testSaturationIndex } from "@analysis/chemistry/test-judgements";
import { formatTemperature, formatVolume } from "~/lib/units";
import type { Route } from "./+types/pools.$poolId";
import { StateMark } from "~/components/state-mark";

export const meta: Route.MetaFunction = ({ loaderData }) => [{ title: `${loaderData?.detail.pool.street ?? "Pool"} · Patina` }];

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const scope = requireArea(context, "pools");
  const poolId = idParam(params, "poolId", "pool");
  const [detail, prefs, metalEvidence] = await Promise.all([
    poolPage(scope, poolId),
    companyPreferences(scope),
    poolMetalPanel(scope, poolId),
  ]);
  if (!detail) notFoundPage("No pool with that number is on your routes.");
  const saved = Number(new URL(request.url).searchParams.get("saved"));
  return {
    detail,
    prefs,
    metalEvidence,
    today: todayIn(prefs.timeZone),
    justSaved: detail.tests.some((t) => t.id === saved),
    mayEdit: roleMayOpen(scope.role, "routebookEdit"),
    mayLogVisit: roleMayOpen(scope.role, "visit"),
  };
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
  const { detail, prefs, metalEvidence, today, justSaved, mayEdit, mayLogVisit } = loaderData;
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

      <section aria-labelledby="history" className="space-y-4">
        <h2 id="history" className="text-lg font-semibold">Chemistry history</h2>
        <MetalHistoryChart points={metalPoints} thresholds={thresholds} />
        <BalanceHistoryChart points={balancePoints} band={balanceBand} />
      </section>

      {metalEvidence ? <PoolMetalPanel evidence={metalEvidence} timeZone={prefs.timeZone} /> : null}

      <section aria-labelledby="tests">
        <h2 id="tests" className="mb-2 text-lg font-semibold">Water tests ({tests.length})</h2>
        {tests.length === 0 ? (
          <p className="text-muted">No water tests yet.</p>
        ) : (
          <ReadingTable
            caption="Water tests, newest first"
            headings={["Sampled", "pH", "Free Cl", "Alk.", "Hardness", "Temp.", "SI", "Copper", "Iron", "Manganese", "Seen"]}
          >
            {tests.map((t) => {
              const index = testSaturationIndex(t);
              return (
                <tr key={t.id}>
                  <td className="px-3 py-2 whitespace-nowrap">
                    {formatDateTime(t.sampledAt, timeZone)}
                    {t.technicianName ? <span className="block text-xs text-muted">{t.technicianName}</span> : null}
                  </td>
                  <td className="px-3 py-2">{t.ph?.toFixed(2) ?? "—"}</td>
                  <td className="px-3 py-2">{t.freeChlorine?.toFixed(1) ?? "—"}</td>
                  <td className="px-3 py-2">{t.totalAlkalinity?.toFixed(0) ?? "—"}</td>
                  <td className="px-3 py-2">{t.calciumHardness?.toFixed(0) ?? "—"}</td>
                  <td className="px-3 py-2 whitespace-nowrap">{formatTemperature(t.temperatureC, units)}</td>
                  <td className="px-3 py-2">{index === null ? "—" : index.toFixed(2)}</td>
                  <td className="px-3 py-2 whitespace-nowrap">{t.copper === null ? "—" : formatMgL(t.copper, t.copperBelowDetection)}</td>
                  <td className="px-3 py-2 whitespace-nowrap">{t.iron === null ? "—" : formatMgL(t.iron, t.ironBelowDetection)}</td>
                  <td className="px-3 py-2 whitespace-nowrap">{t.manganese === null ? "—" : formatMgL(t.manganese, t.manganeseBelowDetection)}</td>
                  <td className="min-w-48 px-3 py-2">{observationText(t)}</td>
                </tr>
              );
            })}
          </ReadingTable>
        )}
        <p className="mt-2 text-xs text-muted">
          SI: saturation index, pool-code factor-table form with alkalinity corrected for cyanuric acid. Since {formatDate(pool.createdAt, timeZone)} on Patina.
        </p>
      </section>

      <section aria-labelledby="treatments">
        <h2 id="treatments" className="mb-2 text-lg font-semibold">Treatments ({treatments.length})</h2>
        {treatments.length === 0 ? (
          <p className="text-muted">No treatments logged.</p>
        ) : (
          <ul className="divide-y divide-line rounded-xl border border-line bg-white text-sm">
            {treatments.map((t) => (
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
