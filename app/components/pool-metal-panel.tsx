import * as Plot from "@observablehq/plot";
import { useMemo } from "react";
import type { PoolEvidence } from "~/.server/analytics/queries/pool-evidence";
import { metalColourScale, metalNames } from "~/components/charts/chart-parts";
import { PlotFigure } from "~/components/charts/plot-figure";
import { formatDate } from "~/lib/format";
import { METAL_LABELS } from "@analysis/metals/names";
import { poolEpisodesReading } from "~/lib/analytics/chart-readings";

const EVIDENCE_TITLES: Record<string, string> = {
  "fill-water-test": "Fill-water test",
  "shared-source-alert": "Shared fill source",
  "ageing-copper-exchanger-with-corrosive-water": "Ageing copper exchanger, corrosive water",
  "copper-algaecide": "Copper-based algaecide",
  ioniser: "Mineral ioniser",
  "iron-with-well-water": "Well water",
};

/** A pool's metal episodes over time, and for each the evidence that points at a cause. */
export function PoolMetalPanel({ evidence, timeZone }: { evidence: PoolEvidence; timeZone: string }) {
  const rows = useMemo(
    () =>
      evidence.episodes.map((e) => ({
        ...e,
        label: METAL_LABELS[e.metal],
        from: new Date(e.openedAt),
        until: new Date(e.endAt),
        state: e.censored ? "still open" : "closed",
      })),
    [evidence],
  );
  const plot = useMemo(
    (): Plot.PlotOptions => ({
      marginLeft: 90,
      x: { type: "utc", label: "Date" },
      y: { label: null, domain: metalNames() },
      color: metalColourScale(),
      marks: [
        Plot.barX(rows, {
          y: "label",
          x1: "from",
          x2: "until",
          fill: "label",
          fillOpacity: 0.75,
          insetTop: 6,
          insetBottom: 6,
          tip: true,
          title: (d: (typeof rows)[number]) =>
            `${d.label}, ${d.state}\nopened ${d.openedAt.slice(0, 10)}, ${d.durationDays.toFixed(0)} days\npeak ${d.peak} mg/L${d.chronic ? ", chronic" : ""}${d.recurrence ? ", came back within a year" : ""}`,
        }),
      ],
    }),
    [rows],
  );
  return (
    <section aria-labelledby="metal-evidence" className="space-y-3">
      <h2 id="metal-evidence" className="text-lg font-semibold">
        Metal episodes and likely sources
      </h2>
      <PlotFigure
        title="When was a metal up on this pool, and for how long? Metal episodes from opening to close"
        reading={poolEpisodesReading(evidence.episodes)}
        caption="A bar runs from the reading that reached the elevated level to the first reading below the clear level; an open episode runs to the latest test."
        plot={plot}
        rows={rows}
        height={160}
        csvName={`metal-episodes-${evidence.poolId}.csv`}
        columns={[
          { label: "Metal", value: (r) => r.label },
          { label: "Opened", value: (r) => r.openedAt.slice(0, 10) },
          { label: "Closed", value: (r) => r.closedAt?.slice(0, 10) ?? "still open" },
          { label: "Days", value: (r) => r.durationDays.toFixed(0) },
          { label: "Peak (mg/L)", value: (r) => String(r.peak) },
        ]}
        empty="No metal episode on record: no copper, iron or manganese reading here has reached the elevated level."
      />
      {evidence.episodes.length > 0 ? (
        <ol className="space-y-3">
          {evidence.episodes.map((e) => (
            <li key={`${e.metal}-${e.openedAt}`} className="rounded-xl border border-line bg-white p-4">
              <p className="font-medium">
                {METAL_LABELS[e.metal]} from {formatDate(e.openedAt, timeZone)}{" "}
                {e.censored ? "(still open)" : `to ${formatDate(e.closedAt, timeZone)}`} · peak {e.peak} mg/L
                {e.chronic ? " · chronic" : ""}
                {e.recurrence ? " · came back within a year" : ""}
              </p>
              {e.evidence.length === 0 ? (
                <p className="mt-1 text-sm text-muted">Nothing on record points at a cause yet: a fill-water test or an equipment check would help.</p>
              ) : (
                <ul className="mt-1 list-disc space-y-1 pl-5 text-sm">
                  {e.evidence.map((ev) => (
                    <li key={ev.kind + ev.reason}>
                      <span className="font-medium">{EVIDENCE_TITLES[ev.kind] ?? ev.kind}:</span> {ev.reason}
                    </li>
                  ))}
                </ul>
              )}
            </li>
          ))}
        </ol>
      ) : null}
      <p className="text-xs text-muted">{evidence.note}</p>
    </section>
  );
}
