import * as Plot from "@observablehq/plot";
import { useMemo } from "react";
import { METALS, type MetalReading, type MetalThresholds } from "@analysis/metals/reading";
import { metalColourScale, metalSymbolScale, readingText, readingTip } from "~/components/charts/chart-parts";
import { PlotFigure } from "~/components/charts/plot-figure";
import { METAL_LABELS } from "@analysis/metals/names";
import { sourceTestReading } from "~/lib/analytics/chart-readings";

type SourceTest = { sampledOn: string; copper: MetalReading | null; iron: MetalReading | null; manganese: MetalReading | null };

/** Metals measured in one fill source's water, test by test. */
export function SourceTestChart({ name, tests, thresholds }: { name: string; tests: readonly SourceTest[]; thresholds: MetalThresholds }) {
  const rows = useMemo(
    () =>
      tests.flatMap((t) =>
        METALS.flatMap((metal) => {
          const r = t[metal];
          return r ? [{ at: new Date(`${t.sampledOn}T00:00:00Z`), day: t.sampledOn, metal: METAL_LABELS[metal], value: r.value, belowDetection: r.belowDetection }] : [];
        }),
      ),
    [tests],
  );
  const plot = useMemo(
    (): Plot.PlotOptions => ({
      marginLeft: 44,
      x: { type: "utc", label: "Sampled on" },
      y: { label: "mg/L", grid: true, zero: true },
      color: metalColourScale(),
      symbol: metalSymbolScale(),
      marks: [
        Plot.lineY(rows, { x: "at", y: "value", z: "metal", stroke: "metal" }),
        Plot.dot(rows, { x: "at", y: "value", stroke: "metal", symbol: "metal", r: 3.5, tip: true, title: (d: (typeof rows)[number]) => readingTip(d.metal, d, d.day) }),
      ],
    }),
    [rows],
  );
  return (
    <PlotFigure
      title={`Does this source bring metals in? Metals in the fill water of ${name} (mg/L)`}
      reading={sourceTestReading(tests, thresholds)}
      caption="Each point is a test of the source water itself; hollow points read below the kit's detection limit."
      plot={plot}
      rows={rows}
      height={200}
      csvName="fill-water-tests.csv"
      columns={[
        { label: "Sampled on", value: (r) => r.day },
        { label: "Metal", value: (r) => r.metal },
        { label: "mg/L", value: readingText },
      ]}
      empty="This source's water has not been tested for metals. A fill-water test would show whether it brings metals in."
    />
  );
}
