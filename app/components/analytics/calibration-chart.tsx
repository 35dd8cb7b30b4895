import * as Plot from "@observablehq/plot";
import { useMemo } from "react";
import type { BacktestJson } from "~/.server/analytics/queries/metal-outlook";
import { PlotFigure } from "~/components/charts/plot-figure";

const pct = (value: number | null) => (value === null ? "—" : `${(value * 100).toFixed(1)}%`);

/** The calibration table's main result in words: the tenths where forecasts ran high or low. */
export function calibrationReading(bins: BacktestJson["calibration"]): string {
  const filled = bins.filter((b) => b.count >= 20);
  if (filled.length === 0) return "Too few forecasts in any tenth to read calibration.";
  const worst = filled.reduce((a, b) => (Math.abs(b.meanPredicted! - b.observed!) > Math.abs(a.meanPredicted! - a.observed!) ? b : a));
  const gap = worst.meanPredicted! - worst.observed!;
  return `Largest gap in tenths with 20 or more forecasts: ${pct(worst.from)} to ${pct(worst.to)}, forecast ${pct(worst.meanPredicted)} on average against ${pct(worst.observed)} observed (${gap > 0 ? "ran high" : "ran low"}).`;
}

/** Forecast chance against the share that opened, by tenth; on the diagonal the chances meant what they said. */
export function CalibrationChart({ bins }: { bins: BacktestJson["calibration"] }) {
  const rows = useMemo(() => bins.filter((b) => b.count > 0).map((b) => ({ ...b, predicted: b.meanPredicted!, seen: b.observed! })), [bins]);
  const plot = useMemo(
    (): Plot.PlotOptions => ({
      x: { label: "Forecast chance (mean of the tenth)", domain: [0, 1], grid: true, percent: true },
      y: { label: "Share that opened", domain: [0, 1], grid: true, percent: true },
      r: { range: [3, 14] },
      marks: [
        Plot.line([[0, 0], [1, 1]], { stroke: "#5b6b6b", strokeDasharray: "4,3" }),
        Plot.line(rows, { x: "predicted", y: "seen", stroke: "#22604f" }),
        Plot.dot(rows, {
          x: "predicted",
          y: "seen",
          r: "count",
          fill: "#22604f",
          symbol: "diamond",
          tip: true,
          title: (d: (typeof rows)[number]) => `${pct(d.from)} to ${pct(d.to)}: ${d.count} forecasts, mean ${pct(d.predicted)}, ${d.events} opened (${pct(d.seen)})`,
        }),
      ],
    }),
    [rows],
  );
  return (
    <PlotFigure
      title="Calibration: forecast chance against the share that opened, by tenth"
      caption="Dashed: perfect calibration. Diamond size: number of forecasts in the tenth. From the rolling-origin backtest."
      reading={calibrationReading(bins)}
      plot={plot}
      rows={rows}
      height={300}
      csvName="outlook-calibration.csv"
      empty="No backtest forecasts yet."
      columns={[
        { label: "Tenth from", value: (r) => r.from.toFixed(1) },
        { label: "Tenth to", value: (r) => r.to.toFixed(1) },
        { label: "Forecasts", value: (r) => String(r.count) },
        { label: "Mean forecast", value: (r) => r.predicted.toFixed(4) },
        { label: "Opened", value: (r) => String(r.events) },
        { label: "Share opened", value: (r) => r.seen.toFixed(4) },
      ]}
    />
  );
}
