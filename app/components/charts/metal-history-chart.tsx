import * as Plot from "@observablehq/plot";
import { useMemo } from "react";
import { type Metal, type MetalThresholds, METALS } from "@analysis/metals/reading";
import { METAL_LABELS } from "@analysis/metals/names";
import { isoDay, metalLevels, metalNames, readingText, readingTip } from "./chart-parts";
import { PlotFigure } from "./plot-figure";

export type MetalPoint = { at: Date; metal: Metal; value: number; belowDetection: boolean };

/** Copper, iron and manganese over time, one panel each, with the company's elevated and clear levels drawn. */
export function MetalHistoryChart({ points, thresholds }: { points: MetalPoint[]; thresholds: MetalThresholds }) {
  const plot = useMemo((): Plot.PlotOptions => {
    const rows = points.map((p) => ({ ...p, label: METAL_LABELS[p.metal] }));
    const levelStroke = (d: { kind: string }) => (d.kind === "elevated" ? "#b3541e" : "#2f6fa7");
    return {
      marginLeft: 48,
      x: { type: "utc", label: null },
      y: { label: "mg/L", grid: true, zero: true },
      fy: { label: null, domain: metalNames() },
      facet: { data: rows, y: "label" },
      color: { legend: false },
      marks: [
        Plot.ruleY(metalLevels(METALS, thresholds), { fy: "label", y: "level", stroke: levelStroke, strokeDasharray: "4,3" }),
        Plot.lineY(rows, { x: "at", y: "value", fy: "label", stroke: "#22604f", curve: "monotone-x" }),
        Plot.dot(rows, {
          x: "at",
          y: "value",
          fy: "label",
          r: 3,
          fill: (d: { belowDetection: boolean }) => (d.belowDetection ? "white" : "#22604f"),
          stroke: "#22604f",
          tip: true,
          title: (d: (typeof rows)[number]) => readingTip(d.label, d, isoDay(d.at)),
        }),
      ],
    };
  }, [points, thresholds]);
  return (
    <PlotFigure
      title="Dissolved metals at each test (mg/L)"
      caption="Dashed lines: orange at the company's elevated level, blue at its clear level. Hollow dots are below the kit's detection limit."
      plot={plot}
      rows={points}
      height={330}
      columns={[
        { label: "Date", value: (r) => isoDay(r.at) },
        { label: "Metal", value: (r) => METAL_LABELS[r.metal] },
        { label: "mg/L", value: readingText },
      ]}
      empty="No metal readings on this pool yet. Metals appear here once a visit logs copper, iron or manganese."
    />
  );
}

export type BalancePoint = { at: Date; ph: number | null; index: number | null };

/** pH and saturation index over time, with the balanced band shaded. */
export function BalanceHistoryChart({ points, band }: { points: BalancePoint[]; band: { low: number; high: number } }) {
  const rows = useMemo(
    () =>
      points.flatMap((p) => [
        ...(p.ph !== null ? [{ at: p.at, series: "pH", value: p.ph }] : []),
        ...(p.index !== null ? [{ at: p.at, series: "Saturation index", value: p.index }] : []),
      ]),
    [points],
  );
  const plot = useMemo(
    (): Plot.PlotOptions => ({
      marginLeft: 48,
      x: { type: "utc", label: null },
      y: { label: null, grid: true },
      fy: { label: null, domain: ["pH", "Saturation index"] },
      facet: { data: rows, y: "series" },
      marks: [
        Plot.rectY([{ series: "Saturation index", y1: band.low, y2: band.high }], { fy: "series", y1: "y1", y2: "y2", fill: "#d3ebe3", fillOpacity: 0.6 }),
        Plot.lineY(rows, { x: "at", y: "value", fy: "series", stroke: "#1d2a2b" }),
        Plot.dot(rows, { x: "at", y: "value", fy: "series", r: 2.5, fill: "#1d2a2b", tip: true }),
      ],
    }),
    [rows, band.low, band.high],
  );
  return (
    <PlotFigure
      title="pH and saturation index at each test"
      caption={`Shaded: balanced (${band.low} to +${band.high}); below is corrosive, above is scale-forming.`}
      plot={plot}
      rows={rows}
      height={300}
      columns={[
        { label: "Date", value: (r) => isoDay(r.at) },
        { label: "Series", value: (r) => r.series },
        { label: "Value", value: (r) => r.value.toFixed(2) },
      ]}
      empty="No pH readings yet. The saturation index also needs temperature, calcium hardness and alkalinity."
    />
  );
}
