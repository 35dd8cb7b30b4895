import * as Plot from "@observablehq/plot";
import { useMemo } from "react";
import { METALS, type Metal } from "@analysis/metals/reading";
import type { MonthlyMetalFigure } from "~/.server/analytics/queries/metal-trend";
import type { RouteBookSummary } from "~/.server/analytics/queries/route-book-summary";
import { metalColourScale, metalSymbolScale } from "~/components/charts/chart-parts";
import { PlotFigure } from "~/components/charts/plot-figure";
import { BALANCE_COLOURS } from "~/lib/analytics/colours";
import { balanceReading, openEpisodesReading, percentText, worstMonthReading } from "~/lib/analytics/chart-readings";
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
      title="Which metal is open on the most pools? Open metal episodes, by metal (pools)"
      reading={openEpisodesReading(open)}
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
      title="Is the water balanced? Share of pools by saturation index at their latest full test (%)"
      reading={balanceReading(balance)}
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

type TrendRow = MonthlyMetalFigure & { label: string; at: Date; percent: number };

/** Per month and metal, the share of metal tests at or above the company's elevated level: a bad season stands out. */
export function MetalTrendChart({ months }: { months: MonthlyMetalFigure[] }) {
  const rows: TrendRow[] = useMemo(
    () => months.map((m) => ({ ...m, label: METAL_LABELS[m.metal], at: new Date(`${m.month}-01T00:00:00Z`), percent: m.elevatedShare * 100 })),
    [months],
  );
  const plot = useMemo(
    (): Plot.PlotOptions => ({
      marginLeft: 52,
      x: { type: "utc", label: "Month" },
      y: { label: "Tests at or above elevated (%)", grid: true, zero: true, domain: [0, Math.max(10, ...rows.map((r) => r.percent))] },
      color: metalColourScale(),
      symbol: metalSymbolScale(),
      marks: [
        Plot.lineY(rows, { x: "at", y: "percent", stroke: "label", curve: "monotone-x" }),
        Plot.dot(rows, {
          x: "at",
          y: "percent",
          stroke: "label",
          symbol: "label",
          r: 3,
          tip: true,
          title: (d: TrendRow) =>
            `${d.label}, ${d.month}\n${d.elevated} of ${d.readings} tests (${percentText(d.elevatedShare)}) at or above elevated\n${d.poolsElevated} pools`,
        }),
        Plot.ruleY([0]),
      ],
    }),
    [rows],
  );
  return (
    <PlotFigure
      title="How often was each metal elevated? Share of metal tests at or above the elevated level, per month (%)"
      caption="Each dot is one month of one metal: the tests at or above the company's elevated level over all tests of that metal. The table gives the counts, pools and medians."
      reading={worstMonthReading(months) ?? "No metal test in this window reached the elevated level."}
      plot={plot}
      rows={rows}
      height={360}
      csvName="metal-trend-by-month.csv"
      columns={[
        { label: "Month", value: (r) => r.month },
        { label: "Metal", value: (r) => r.label },
        { label: "Tests", value: (r) => String(r.readings) },
        { label: "At or above elevated", value: (r) => String(r.elevated) },
        { label: "Share (%)", value: (r) => (r.elevatedShare * 100).toFixed(1) },
        { label: "Pools elevated", value: (r) => String(r.poolsElevated) },
        { label: "Median (mg/L)", value: (r) => r.median.toFixed(3) },
      ]}
      empty="No metal was measured in this window. Readings of copper, iron or manganese on any visit fill this chart."
    />
  );
}
