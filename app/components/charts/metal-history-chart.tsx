import * as Plot from "@observablehq/plot";
import { useMemo } from "react";
import { type Metal, type MetalThresholds, METALS } from "@analysis/metals/reading";
import { METAL_LABELS } from "@analysis/metals/names";
import { isoDay, metalLevels, metalNames, readingText, readingTip } from "./chart-parts";
import { PlotFigure } from "./plot-figure";
import { indexReading, metalHistoryReading, phReading } from "~/lib/analytics/chart-readings";

export type MetalPoint = { at: Date; metal: Metal; value: number; belowDetection: boolean };

/** Copper, iron and manganese over time, one panel each, with the company's elevated and clear levels drawn. */
export function MetalHistoryChart({ points, thresholds }: { points: MetalPoint[]; thresholds: MetalThresholds }) {
  const plot = useMemo((): Plot.PlotOptions => {
    const rows = points.map((p) => ({ ...p, label: METAL_LABELS[p.metal] }));
    const levelStroke = (d: { kind: string }) => (d.kind === "elevated" ? "#b3541e" : "#2f6fa7");
    return {
      marginLeft: 48,
      x: { type: "utc", label: "Date" },
      // Each panel's name sits inside its top left corner: a facet axis at the right edge is cut off on a phone.
      y: { label: "mg/L", grid: true, zero: true, insetTop: 16 },
      fy: { label: null, domain: metalNames(), axis: null },
      facet: { data: rows, y: "label" },
      color: { legend: false },
      marks: [
        Plot.text(metalNames(), { fy: (d: string) => d, text: (d: string) => d, frameAnchor: "top-left", dx: 4, dy: 2, fontWeight: 600 }),
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
      title="Is any metal at the elevated level? Dissolved metals at each test (mg/L)"
      reading={metalHistoryReading(points, thresholds)}
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

/** The usual pH scale of a pool chart: 6.5 to 8.5 at least, wider when a reading falls outside. */
export function phDomain(values: readonly number[]): [number, number] {
  return [Math.min(6.5, ...values.map((v) => Math.floor(v * 10 - 1) / 10)), Math.max(8.5, ...values.map((v) => Math.ceil(v * 10 + 1) / 10))];
}

/** A saturation index scale symmetric around 0 (balanced in the middle), at least -1 to +1. */
export function indexDomain(values: readonly number[]): [number, number] {
  const reach = Math.max(1, ...values.map((v) => Math.ceil(Math.abs(v) * 10 + 1) / 10));
  return [-reach, reach];
}

/** pH and saturation index over time, each on its own scale around its data, the balanced band shaded on the index. */
export function BalanceHistoryChart({ points, band }: { points: BalancePoint[]; band: { low: number; high: number } }) {
  const ph = useMemo(() => points.flatMap((p) => (p.ph !== null ? [{ at: p.at, value: p.ph }] : [])), [points]);
  const index = useMemo(() => points.flatMap((p) => (p.index !== null ? [{ at: p.at, value: p.index }] : [])), [points]);
  const phPlot = useMemo(
    (): Plot.PlotOptions => ({
      marginLeft: 48,
      x: { type: "utc", label: "Date" },
      y: { label: "pH", grid: true, domain: phDomain(ph.map((r) => r.value)) },
      marks: [
        Plot.lineY(ph, { x: "at", y: "value", stroke: "#1d2a2b" }),
        Plot.dot(ph, { x: "at", y: "value", r: 2.5, fill: "#1d2a2b", tip: true, title: (d: { at: Date; value: number }) => `pH ${d.value}\n${isoDay(d.at)}` }),
      ],
    }),
    [ph],
  );
  const indexPlot = useMemo(
    (): Plot.PlotOptions => ({
      marginLeft: 48,
      x: { type: "utc", label: "Date" },
      y: { label: "Saturation index", grid: true, domain: indexDomain(index.map((r) => r.value)) },
      marks: [
        Plot.rectY([{ y1: band.low, y2: band.high }], { y1: "y1", y2: "y2", fill: "#d3ebe3", fillOpacity: 0.6 }),
        Plot.ruleY([0], { stroke: "#9aa5a0" }),
        Plot.lineY(index, { x: "at", y: "value", stroke: "#1d2a2b" }),
        Plot.dot(index, {
          x: "at",
          y: "value",
          r: 2.5,
          fill: "#1d2a2b",
          tip: true,
          title: (d: { at: Date; value: number }) => `Index ${d.value.toFixed(2)}\n${isoDay(d.at)}`,
        }),
      ],
    }),
    [index, band.low, band.high],
  );
  const columns = [
    { label: "Date", value: (r: { at: Date }) => isoDay(r.at) },
    { label: "Value", value: (r: { value: number }) => r.value.toFixed(2) },
  ];
  return (
    <div className="grid gap-4 lg:grid-cols-2">
      <PlotFigure
        title="Is the pH in range? pH at each test"
        caption="Scale from 6.5 to 8.5, wider when a reading falls outside."
        reading={phReading(ph)}
        plot={phPlot}
        rows={ph}
        height={220}
        columns={columns}
        empty="No pH readings yet."
      />
      <PlotFigure
        title="Is the water corrosive or scale-forming? Saturation index at each test"
        caption={`Shaded: balanced (${band.low} to +${band.high}); below is corrosive, above is scale-forming. The scale is centred on 0.`}
        reading={indexReading(index, band)}
        plot={indexPlot}
        rows={index}
        height={220}
        columns={columns}
        empty="No saturation index yet: it needs pH, temperature, calcium hardness and alkalinity on the same test."
      />
    </div>
  );
}
