import * as Plot from "@observablehq/plot";
import { useMemo } from "react";
import { METALS, type Metal } from "@analysis/metals/reading";
import type { MonthlyMetalFigure } from "~/.server/analytics/queries/metal-trend";
import type { RouteBookSummary } from "~/.server/analytics/queries/route-book-summary";
import { metalColourScale, metalNames, metalSymbolScale } from "~/components/charts/chart-parts";
import { PlotFigure } from "~/components/charts/plot-figure";
import { BALANCE_COLOURS } from "~/lib/analytics/colours";
import { METAL_LABELS } from "@analysis/metals/names";

export function OpenEpisodesChart({ open }: { open: Record<Metal, number> }) {
  const rows = useMemo(() => METALS.map((metal) => ({ metal: METAL_LABELS[metal], open: open[metal] })), [open]);
  const total = rows.reduce((sum, r) => sum + r.open, 0);
  const plot = useMemo(
    (): Plot.PlotOptions => ({
      marginLeft: 90,
      x: { label: "Pools with an open episode", grid: true, tickFormat: (d: number) => (Number.isInteger(d) ? String(d) : "") },
      y: { label: null },
      color: metalColourScale(),
      marks: [
        Plot.barX(rows, { y: "metal", x: "open", fill: "metal", tip: true, title: (d: (typeof rows)[number]) => `${d.metal}: ${d.open} open` }),
        Plot.text(rows, { y: "metal", x: "open", text: (d: (typeof rows)[number]) => String(d.open), dx: 12 }),
        Plot.ruleX([0]),
      ],
    }),
    [rows],
  );
  return (
    <PlotFigure
      title="Open metal episodes, by metal (pools)"
      caption="An episode opens at a reading at or above the elevated level and stays open until a reading below the clear level."
      plot={plot}
      rows={total === 0 ? [] : rows}
      height={200}
      csvName="open-episodes.csv"
      columns={[
        { label: "Metal", value: (r) => r.metal },
        { label: "Open episodes", value: (r) => String(r.open) },
      ]}
      empty="No open episode: every elevated reading in this window was followed by a clear one."
    />
  );
}

export function BalanceChart({ balance }: { balance: RouteBookSummary["balance"] }) {
  const rows = useMemo(
    () =>
      [
        { kind: "corrosive" as const, label: `Corrosive (below ${balance.band.low})`, ...balance.corrosive },
        { kind: "balanced" as const, label: `Balanced (${balance.band.low} to +${balance.band.high})`, ...balance.balanced },
        { kind: "scale-forming" as const, label: `Scale-forming (above +${balance.band.high})`, ...balance.scaleForming },
      ].map((r) => ({ ...r, percent: r.share === null ? 0 : r.share * 100 })),
    [balance],
  );
  const total = rows.reduce((sum, r) => sum + r.pools, 0);
  const plot = useMemo(
    (): Plot.PlotOptions => ({
      marginLeft: 190,
      x: { label: "Share of pools (%)", domain: [0, 100], grid: true },
      y: { label: null },
      color: { domain: rows.map((r) => r.label), range: rows.map((r) => BALANCE_COLOURS[r.kind]), legend: true },
      marks: [
        Plot.barX(rows, {
          y: "label",
          x: "percent",
          fill: "label",
          tip: true,
          title: (d: (typeof rows)[number]) => `${d.label}: ${d.pools} pools, ${d.percent.toFixed(1)} %`,
        }),
        Plot.ruleX([0]),
      ],
    }),
    [rows],
  );
  return (
    <PlotFigure
      title="Water balance at each pool's latest full test (saturation index, share of pools in %)"
      caption="Saturation index from pH, temperature, calcium hardness and alkalinity corrected for cyanuric acid; the balanced band is the company's setting (common practice)."
      plot={plot}
      rows={total === 0 ? [] : rows}
      height={200}
      csvName="water-balance.csv"
      columns={[
        { label: "Balance", value: (r) => r.label },
        { label: "Pools", value: (r) => String(r.pools) },
        { label: "Share (%)", value: (r) => r.percent.toFixed(1) },
      ]}
      empty="No test in this window carries pH, temperature, calcium hardness and alkalinity together, so no saturation index can be worked out."
    />
  );
}

type TrendRow = MonthlyMetalFigure & { label: string; at: Date };

export function MetalTrendChart({ months, rule }: { months: MonthlyMetalFigure[]; rule: string }) {
  const rows: TrendRow[] = useMemo(
    () => months.map((m) => ({ ...m, label: METAL_LABELS[m.metal], at: new Date(`${m.month}-01T00:00:00Z`) })),
    [months],
  );
  const plot = useMemo(
    (): Plot.PlotOptions => ({
      marginLeft: 52,
      marginRight: 84,
      x: { type: "utc", label: "Month" },
      y: { label: "mg/L", grid: true, zero: true },
      fy: { label: null, domain: metalNames() },
      color: metalColourScale(),
      symbol: metalSymbolScale(),
      facet: { data: rows, y: "label" },
      marks: [
        Plot.areaY(rows, { x: "at", y1: "p25", y2: "p75", fy: "label", fill: "label", fillOpacity: 0.18, curve: "step" }),
        Plot.lineY(rows, { x: "at", y: "median", fy: "label", stroke: "label", curve: "monotone-x" }),
        Plot.dot(rows, {
          x: "at",
          y: "median",
          fy: "label",
          stroke: "label",
          symbol: "label",
          r: 3,
          tip: true,
          title: (d: TrendRow) =>
            `${d.label}, ${d.month}\nmedian ${d.median.toFixed(3)} mg/L\nmiddle half ${d.p25.toFixed(3)} to ${d.p75.toFixed(3)} mg/L\n${d.readings} readings`,
        }),
      ],
    }),
    [rows],
  );
  return (
    <PlotFigure
      title="Monthly median of each metal across the route book (mg/L)"
      caption={`Line: median reading per month; shaded band: the middle half of readings (25th to 75th percentile). ${rule}`}
      plot={plot}
      rows={rows}
      height={420}
      csvName="metal-trend-by-month.csv"
      columns={[
        { label: "Month", value: (r) => r.month },
        { label: "Metal", value: (r) => r.label },
        { label: "Readings", value: (r) => String(r.readings) },
        { label: "Median (mg/L)", value: (r) => r.median.toFixed(3) },
        { label: "25th percentile (mg/L)", value: (r) => r.p25.toFixed(3) },
        { label: "75th percentile (mg/L)", value: (r) => r.p75.toFixed(3) },
        { label: "Highest (mg/L)", value: (r) => r.max.toFixed(3) },
      ]}
      empty="No metal was measured in this window. Readings of copper, iron or manganese on any visit fill this chart."
    />
  );
}
