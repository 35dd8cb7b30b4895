import * as Plot from "@observablehq/plot";
import { useCallback, useMemo } from "react";
import type { Metal, MetalThresholds } from "@analysis/metals/reading";
import { METAL_LABELS } from "@analysis/metals/names";
import { PlotFigure } from "./plot-figure";

export type MetalPoint = { at: Date; metal: Metal; value: number; belowDetection: boolean };

/** Copper, iron and manganese over time, one panel each, with the company's elevated and clear levels drawn. */
export function MetalHistoryChart({ points, thresholds }: { points: MetalPoint[]; thresholds: MetalThresholds }) {
  const rows = useMemo(() => points.map((p) => ({ ...p, label: METAL_LABELS[p.metal] })), [points]);
  const levels = useMemo(
    () =>
      (Object.keys(METAL_LABELS) as Metal[]).flatMap((metal) => [
        { label: METAL_LABELS[metal], level: thresholds[metal].elevated, kind: "elevated" },
        { label: METAL_LABELS[metal], level: thresholds[metal].clear, kind: "clear" },
      ]),
    [thresholds],
  );
  const build = useCallback(
    (width: number): Plot.PlotOptions => ({
      width,
      height: 330,
      marginLeft: 48,
      x: { type: "utc", label: null },
      y: { label: "mg/L", grid: true, zero: true },
      fy: { label: null, domain: ["Copper", "Iron", "Manganese"] },
      facet: { data: rows, y: "label" },
      color: { legend: false },
      marks: [
        Plot.ruleY(levels, { fy: "label", y: "level", stroke: (d: { kind: string }) => (d.kind === "elevated" ? "#b3541e" : "#2f6fa7"), strokeDasharray: "4,3" }),
        Plot.lineY(rows, { x: "at", y: "value", fy: "label", stroke: "#22604f", curve: "monotone-x" }),
        Plot.dot(rows, {
          x: "at",
          y: "value",
          fy: "label",
          r: 3,
          fill: (d: { belowDetection: boolean }) => (d.belowDetection ? "white" : "#22604f"),
          stroke: "#22604f",
          tip: true,
          title: (d: (typeof rows)[number]) => `${d.label} ${d.belowDetection ? "<" : ""}${d.value} mg/L\n${d.at.toISOString().slice(0, 10)}`,
        }),
      ],
    }),
    [rows, levels],
  );
  return (
    <PlotFigure
      title="Dissolved metals at each test (mg/L)"
      caption="Dashed lines: orange at the company's elevated level, blue at its clear level. Hollow dots are below the kit's detection limit."
      build={build}
      rows={rows}
      height={330}
      columns={[
        { label: "Date", value: (r) => r.at.toISOString().slice(0, 10) },
        { label: "Metal", value: (r) => r.label },
        { label: "mg/L", value: (r) => `${r.belowDetection ? "<" : ""}${r.value}` },
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
  const build = useCallback(
    (width: number): Plot.PlotOptions => ({
      width,
      height: 300,
      marginLeft: 48,
      x: { type: "utc", label: null },
      y: { label: null, grid: true },
      fy: { label: null, domain: ["pH", "Saturation index"] },
      facet: { data: rows, y: "series" },
      marks: [
        Plot.rectY([{ series: "Saturation index", y1: band.low, y2: band.high }], {
          fy: "series",
          y1: "y1",
          y2: "y2",
          fill: "#d3ebe3",
          fillOpacity: 0.6,
        }),
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
      build={build}
      rows={rows}
      height={300}
      columns={[
        { label: "Date", value: (r) => r.at.toISOString().slice(0, 10) },
        { label: "Series", value: (r) => r.series },
        { label: "Value", value: (r) => r.value.toFixed(2) },
      ]}
      empty="No pH readings yet. The saturation index also needs temperature, calcium hardness and alkalinity."
    />
  );
}
