import * as Plot from "@observablehq/plot";
import { useMemo } from "react";
import type { ArmFigures } from "~/.server/analytics/queries/treatment-outcomes";
import { labelledRows } from "~/components/charts/chart-parts";
import { PlotFigure } from "~/components/charts/plot-figure";
import { ARM_COLOURS } from "~/lib/analytics/colours";
import { reductionReading, timeToClearReading } from "~/lib/analytics/chart-readings";

export type ArmView = ArmFigures & { label: string };

const DASHES = ["none", "6,3", "2,3", "8,3,2,3"];

/** Kaplan-Meier share of courses with the metal still above the clear level, day by day. */
export function TimeToClearChart({ arms, followUpDays }: { arms: ArmView[]; followUpDays: number }) {
  const labels = arms.map((a) => a.label);
  const rows = useMemo(
    () =>
      arms.flatMap((a) =>
        a.timeToClear.curve.map((p) => ({ arm: a.label, ...p, percent: p.stillElevated * 100, lowerPercent: p.lower * 100, upperPercent: p.upper * 100 })),
      ),
    [arms],
  );
  const plot = useMemo(
    (): Plot.PlotOptions => ({
      marginLeft: 48,
      x: { label: "Days after treatment", domain: [0, followUpDays], grid: true },
      y: { label: "Courses not yet clear (%)", domain: [0, 100], grid: true },
      color: { domain: labels, range: ARM_COLOURS.slice(0, Math.max(1, labels.length)), legend: true },
      marks: [
        ...labels.map((label, i) =>
          Plot.lineY(
            rows.filter((r) => r.arm === label),
            { x: "day", y: "percent", stroke: "arm", curve: "step-after", strokeWidth: 2, strokeDasharray: DASHES[i % DASHES.length] },
          ),
        ),
        Plot.dot(rows, {
          x: "day",
          y: "percent",
          stroke: "arm",
          r: 2.5,
          tip: true,
          title: (d: (typeof rows)[number]) =>
            `${d.arm}\nday ${d.day.toFixed(1)}: ${d.percent.toFixed(0)} % not yet clear (95% ${d.lowerPercent.toFixed(0)}–${d.upperPercent.toFixed(0)} %)\n${d.atRisk} followed, ${d.cleared} cleared, ${d.censored} stopped being followed`,
        }),
      ],
    }),
    [rows, labels, followUpDays],
  );
  return (
    <PlotFigure
      title="How soon did each treatment clear the metal? Time to clear: courses still above the clear level, by days after treatment (%)"
      reading={timeToClearReading(arms, followUpDays)}
      caption={`Kaplan-Meier estimate over ${followUpDays} days; courses are no longer followed at the end of the window, at the end of the data, or when a different treatment starts.`}
      plot={plot}
      rows={rows}
      height={300}
      csvName="time-to-clear.csv"
      columns={[
        { label: "Treatment", value: (r) => r.arm },
        { label: "Day", value: (r) => r.day.toFixed(1) },
        { label: "Not yet clear (%)", value: (r) => r.percent.toFixed(1) },
        { label: "95% low (%)", value: (r) => r.lowerPercent.toFixed(1) },
        { label: "95% high (%)", value: (r) => r.upperPercent.toFixed(1) },
        { label: "Followed", value: (r) => String(r.atRisk) },
        { label: "Cleared", value: (r) => String(r.cleared) },
      ]}
      empty="No treated course had a reading above the clear level to follow in this window, so there is no curve to draw."
    />
  );
}

/** Median percent fall from the baseline at the first follow-up 3 to 10 days later. */
export function ReductionChart({ arms }: { arms: ArmView[] }) {
  const rows = useMemo(
    () =>
      arms
        .filter((a) => a.reduction.median !== null)
        .map((a) => ({
          arm: a.label,
          median: a.reduction.median!,
          count: a.reduction.count,
          judged: a.tooFewToCompare ? "Too few to compare" : "Enough pools",
        })),
    [arms],
  );
  const layout = useMemo(
    () =>
      labelledRows(
        rows.map((r) => r.arm),
        { rowHeight: 34, minHeight: 140, maxMargin: 240 },
      ),
    [rows],
  );
  const plot = useMemo(
    () =>
      (width: number): Plot.PlotOptions => {
        const labels = layout.at(width);
        return {
          ...labels.options,
          x: { label: "Median fall at first follow-up (%)", grid: true },
          color: { domain: ["Enough pools", "Too few to compare"], range: ["#22604f", "#9aa5a5"], legend: true },
          marks: [
            ...labels.marks,
            Plot.barX(rows, {
              y: "arm",
              x: "median",
              fill: "judged",
              insetTop: labels.inset,
              tip: true,
              title: (d: (typeof rows)[number]) => `${d.arm}: median fall ${d.median.toFixed(1)} % over ${d.count} courses\n${d.judged}`,
            }),
            Plot.ruleX([0]),
          ],
        };
      },
    [layout, rows],
  );
  return (
    <PlotFigure
      title="How far did each treatment bring the metal down? Median fall at the first follow-up, 3 to 10 days after treatment (%)"
      reading={reductionReading(arms)}
      caption="Percent fall from the baseline reading (same visit or the 7 days before). Grey bars: fewer than 5 treated pools, too few to compare."
      plot={plot}
      rows={rows}
      height={layout.height}
      csvName="reduction-at-follow-up.csv"
      columns={[
        { label: "Treatment", value: (r) => r.arm },
        { label: "Courses with a follow-up", value: (r) => String(r.count) },
        { label: "Median fall (%)", value: (r) => r.median.toFixed(1) },
        { label: "Judgement", value: (r) => r.judged },
      ]}
      empty="No course had a follow-up reading 3 to 10 days after treatment in this window."
    />
  );
}
