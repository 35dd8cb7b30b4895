/** Pieces the Plot charts share: the metals' scales, reading text, levels and the layout of labelled rows. */
import * as Plot from "@observablehq/plot";
import type { PlotOptions, ScaleOptions } from "@observablehq/plot";
import { METAL_LABELS } from "@analysis/metals/names";
import { type Metal, type MetalThresholds, METALS } from "@analysis/metals/reading";
import { METAL_COLOURS, METAL_SYMBOLS } from "~/lib/analytics/colours";
import { shortLabel } from "~/lib/analytics/labels";

/** The metals' labels, the values by which the charts' series are named. */
export const metalNames = (metals: readonly Metal[] = METALS) => metals.map((m) => METAL_LABELS[m]);

/** The colour scale of charts whose series are metals (by their labels), with its legend. */
export function metalColourScale(metals: readonly Metal[] = METALS): ScaleOptions {
  return { domain: metalNames(metals), range: metals.map((m) => METAL_COLOURS[m]), legend: true };
}

/** The symbol scale that pairs each metal with its own shape, so no chart relies on colour alone. */
export function metalSymbolScale(metals: readonly Metal[] = METALS): ScaleOptions {
  return { domain: metalNames(metals), range: metals.map((m) => METAL_SYMBOLS[m]) };
}

/** A day as the charts print it: 2024-06-01. */
export const isoDay = (at: Date) => at.toISOString().slice(0, 10);

/** A metal reading in mg/L as the kit gave it: "<0.05" below the detection limit. */
export const readingText = (r: { value: number; belowDetection: boolean }) => `${r.belowDetection ? "<" : ""}${r.value}`;

/** The tip of a reading's dot: metal, reading and day on two lines. */
export const readingTip = (metal: string, r: { value: number; belowDetection: boolean }, day: string) => `${metal} ${readingText(r)} mg/L\n${day}`;

/** The company's elevated and clear level of each metal, for rule marks. */
export function metalLevels(metals: readonly Metal[], thresholds: MetalThresholds) {
  return metals.flatMap((metal) => [
    { label: METAL_LABELS[metal], level: thresholds[metal].elevated, kind: "elevated" },
    { label: METAL_LABELS[metal], level: thresholds[metal].clear, kind: "clear" },
  ]);
}

/**
 * The layout of a chart with one row per label (groups, treatments): its
 * height, rows of `rowHeight` but no lower than `minHeight`, and at a given
 * width the options and marks that place the labels. Where a left margin wide
 * enough for the shortened labels (up to `maxMargin`) fits in 40% of the
 * width, the labels sit there; on a narrower drawing (a phone) each label
 * sits on its own line above its row, so the data keep most of the width.
 * `inset` is the room a bar leaves at the top of its row for that line.
 */
export function labelledRows(labels: readonly string[], { rowHeight, minHeight, maxMargin }: { rowHeight: number; minHeight: number; maxMargin: number }) {
  const margin = Math.min(maxMargin, Math.max(...labels.map((l) => shortLabel(l).length), 8) * 6.5);
  const domain = [...labels];
  return {
    height: Math.max(minHeight, rowHeight * labels.length + 60),
    at(width: number): { options: Pick<PlotOptions, "marginLeft" | "y">; marks: Plot.Markish[]; inset: number } {
      if (margin <= width * 0.4) return { options: { marginLeft: margin, y: { label: null, domain, tickFormat: shortLabel } }, marks: [], inset: 0 };
      return {
        options: { marginLeft: 8, y: { label: null, domain, axis: null } },
        marks: [
          Plot.text(domain, {
            y: (d: string) => d,
            text: shortLabel,
            frameAnchor: "left",
            textAnchor: "start",
            dy: -Math.round(rowHeight * 0.32),
            // A white edge keeps the label readable where grid lines cross it.
            fill: "currentColor",
            stroke: "white",
            strokeWidth: 3,
            paintOrder: "stroke",
          }),
        ],
        inset: Math.round(rowHeight * 0.45),
      };
    },
  };
}
