import * as Plot from "@observablehq/plot";
import { useMemo } from "react";
import type { GroupFigure } from "~/.server/analytics/queries/group-figures";
import { labelledRows } from "~/components/charts/chart-parts";
import { PlotFigure } from "~/components/charts/plot-figure";
import { FLAG_COLOURS } from "~/lib/analytics/colours";
import { groupReading } from "~/lib/analytics/chart-readings";

const FLAG_WORDS = { risky: "Risky", ordinary: "Not set apart", small: "Too small to judge" } as const;
type Flag = keyof typeof FLAG_WORDS;

const flagOf = (g: GroupFigure): Flag => (g.tooSmallToJudge ? "small" : g.risky ? "risky" : "ordinary");
const fixed = (n: number | null, digits = 2) => (n === null ? "—" : n.toFixed(digits));

/** Episode openings per pool-year for each group, with its exact 95% interval. */
export function GroupRateChart({ groups, dimension, overallRate }: { groups: GroupFigure[]; dimension: string; overallRate: number | null }) {
  const rows = useMemo(
    () =>
      groups
        .filter((g) => g.ratePerPoolYear.estimate !== null)
        .map((g) => ({
          ...g,
          flag: FLAG_WORDS[flagOf(g)],
          rate: g.ratePerPoolYear.estimate!,
          lower: g.ratePerPoolYear.lower ?? 0,
          upper: g.ratePerPoolYear.upper ?? 0,
        })),
    [groups],
  );
  const layout = useMemo(
    () =>
      labelledRows(
        rows.map((r) => r.label),
        { rowHeight: 36, minHeight: 160, maxMargin: 230 },
      ),
    [rows],
  );
  const plot = useMemo(
    () =>
      (width: number): Plot.PlotOptions => {
        const labels = layout.at(width);
        return {
          ...labels.options,
          x: { label: "Episode openings per pool-year", grid: true, zero: true },
          color: {
            domain: Object.values(FLAG_WORDS),
            range: [FLAG_COLOURS.risky, FLAG_COLOURS.ordinary, FLAG_COLOURS.small],
            legend: true,
          },
          symbol: { domain: Object.values(FLAG_WORDS), range: ["diamond", "circle", "times"] },
          marks: [
            ...labels.marks,
            overallRate === null ? null : Plot.ruleX([overallRate], { stroke: "#5b6b6b", strokeDasharray: "4,3" }),
            Plot.ruleY(rows, { y: "label", x1: "lower", x2: "upper", stroke: "flag", strokeWidth: 2 }),
            Plot.dot(rows, {
              y: "label",
              x: "rate",
              fill: "flag",
              stroke: "flag",
              symbol: "flag",
              r: 5,
              tip: true,
              title: (d: (typeof rows)[number]) =>
                `${d.label}: ${d.rate.toFixed(2)} per pool-year (95% ${d.lower.toFixed(2)} to ${d.upper.toFixed(2)})\n${d.openings} openings over ${d.poolYears.toFixed(1)} pool-years, ${d.pools} pools\nrate ratio ${fixed(d.rateRatio.estimate)} (${fixed(d.rateRatio.lower)} to ${d.rateRatio.upper === null ? "unbounded" : d.rateRatio.upper.toFixed(2)})\n${d.flag}`,
            }),
          ],
        };
      },
    [layout, rows, overallRate],
  );
  return (
    <PlotFigure
      title={`Which ${dimension.toLowerCase()} has more metal episodes than the rest? Metal episodes per pool-year, by ${dimension.toLowerCase()}`}
      caption="Dot: episode openings per pool-year observed; bar: exact 95% interval (Poisson). Dashed line: the whole route book's rate. Groups with fewer than 3 pools are shown but too small to judge."
      reading={groupReading(groups)}
      plot={plot}
      rows={rows}
      height={layout.height}
      csvName="group-comparison.csv"
      columns={[
        { label: "Group", value: (r) => r.label },
        { label: "Pools", value: (r) => String(r.pools) },
        { label: "Pool-years", value: (r) => r.poolYears.toFixed(2) },
        { label: "Openings", value: (r) => String(r.openings) },
        { label: "Rate per pool-year", value: (r) => r.rate.toFixed(3) },
        { label: "Rate 95% low", value: (r) => r.lower.toFixed(3) },
        { label: "Rate 95% high", value: (r) => r.upper.toFixed(3) },
        { label: "Rate ratio", value: (r) => (r.rateRatio.estimate === null ? "unbounded" : r.rateRatio.estimate.toFixed(2)) },
        { label: "Ratio 95% low", value: (r) => fixed(r.rateRatio.lower) },
        { label: "Ratio 95% high", value: (r) => (r.rateRatio.upper === null ? "unbounded" : r.rateRatio.upper.toFixed(2)) },
        { label: "Pools with an episode (%)", value: (r) => fixed(r.shareWithEpisode.estimate === null ? null : r.shareWithEpisode.estimate * 100, 0) },
        { label: "Judgement", value: (r) => r.flag },
      ]}
      empty="No pool was tested in this window, so no group has any observed time. Pick a wider date window."
    />
  );
}
