import * as Plot from "@observablehq/plot";
import { useMemo } from "react";
import type { MetalTest } from "@analysis/metals/episodes";
import type { Metal, MetalThresholds } from "@analysis/metals/reading";
import { isoDay, metalColourScale, metalLevels, metalSymbolScale, readingText, readingTip } from "~/components/charts/chart-parts";
import { PlotFigure } from "~/components/charts/plot-figure";
import type { RecurringPool } from "@analysis/metals/recurring-finder";
import { METAL_LABELS } from "@analysis/metals/names";
import { recurringPoolReading } from "~/lib/analytics/chart-readings";

const CHART_HEIGHT = 220;
const FRAME_HEIGHT = CHART_HEIGHT - 20 - 30;

type Point = { at: Date; metal: string; value: number; belowDetection: boolean };
type Treatment = { poolId: number; appliedAt: string; productName: string; category: string };

/** One pool's metal readings over time, with its levels drawn, episodes shaded and treatments marked. */
export function RecurringPoolChart({
  pool,
  readings,
  treatments,
  thresholds,
  metals,
}: {
  pool: RecurringPool;
  readings: readonly MetalTest[];
  treatments: readonly Treatment[];
  thresholds: MetalThresholds;
  metals: readonly Metal[];
}) {
  const shown = useMemo(() => metals.filter((m) => pool.metals.some((f) => f.metal === m)), [metals, pool]);
  const points: Point[] = useMemo(
    () =>
      readings.flatMap((r) =>
        shown.flatMap((metal) => {
          const reading = r[metal];
          return reading ? [{ at: new Date(r.takenAt), metal: METAL_LABELS[metal], value: reading.value, belowDetection: reading.belowDetection }] : [];
        }),
      ),
    [readings, shown],
  );
  const episodes = useMemo(
    () =>
      pool.episodes
        .filter((e) => shown.includes(e.metal))
        .map((e) => ({ ...e, label: METAL_LABELS[e.metal], from: new Date(e.openedAt), until: new Date(e.endAt) })),
    [pool, shown],
  );
  const plot = useMemo((): Plot.PlotOptions => {
    const levels = metalLevels(shown, thresholds);
    const marks = treatments.map((t) => ({ ...t, at: new Date(t.appliedAt) }));
    return {
      marginLeft: 44,
      marginTop: 20,
      marginBottom: 30,
      x: { type: "utc", label: "Date" },
      y: { label: "mg/L", grid: true, zero: true },
      color: metalColourScale(shown),
      symbol: metalSymbolScale(shown),
      marks: [
        Plot.rectX(episodes, { x1: "from", x2: "until", fill: "label", fillOpacity: 0.12 }),
        Plot.ruleY(levels.filter((l) => l.kind === "elevated"), { y: "level", stroke: "label", strokeDasharray: "6,3" }),
        Plot.ruleY(levels.filter((l) => l.kind === "clear"), { y: "level", stroke: "label", strokeDasharray: "2,3" }),
        Plot.lineY(points, { x: "at", y: "value", z: "metal", stroke: "metal" }),
        Plot.dot(points, {
          x: "at",
          y: "value",
          stroke: "metal",
          symbol: "metal",
          fill: (d: Point) => (d.belowDetection ? "white" : d.metal),
          r: 3,
          tip: true,
          title: (d: Point) => readingTip(d.metal, d, isoDay(d.at)),
        }),
        Plot.tickX(marks, {
          x: "at",
          stroke: "#22604f",
          strokeWidth: 2,
          // A short tick at the foot of the frame (the chart less its 20 px top and 30 px bottom margins), above the date labels.
          insetTop: FRAME_HEIGHT - 14,
          tip: true,
          title: (d: (typeof marks)[number]) => `${d.productName}\n${d.appliedAt.slice(0, 10)}`,
        }),
      ],
    };
  }, [points, episodes, treatments, thresholds, shown]);
  const summary = pool.metals
    .map((m) => `${METAL_LABELS[m.metal]}: ${m.openings} openings${m.recurrent ? ", recurring" : ""}${m.chronic ? ", chronic" : ""}`)
    .join("; ");
  return (
    <PlotFigure
      title={`Did the metal come back at ${pool.street}? The pool's metal readings (mg/L) and treatments`}
      reading={recurringPoolReading(pool.episodes, shown)}
      caption={`${summary}. Shaded: open episodes; dashed: elevated level, dotted: clear level; green ticks at the foot: treatments.`}
      plot={plot}
      rows={points}
      height={CHART_HEIGHT}
      csvName={`metal-readings-${pool.poolId}.csv`}
      columns={[
        { label: "Date", value: (r) => isoDay(r.at) },
        { label: "Metal", value: (r) => r.metal },
        { label: "mg/L", value: readingText },
      ]}
      empty="No metal readings for this pool in the window."
    />
  );
}
