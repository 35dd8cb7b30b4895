import type { PlotOptions } from "@observablehq/plot";
import { type ReactNode, useEffect, useRef, useState } from "react";
import { TableHead } from "~/components/reading-table";
import { displayTableCsv } from "~/lib/csv";

export type TableColumn<Row> = { label: string; value: (row: Row) => string };

/**
 * The one home of Observable Plot in Patina. The caller gives Plot options
 * (memoized, without width and height: this component sets them), or a
 * function of the width for charts laid out differently on a phone; this
 * component draws them after hydration at the available width, redraws on
 * resize, removes the old drawing on every change, and offers the same data
 * as a table for screen readers and for reading exact values.
 */
export function PlotFigure<Row>({
  title,
  caption,
  plot,
  rows,
  columns,
  empty,
  height = 260,
  csvName,
  reading,
}: {
  /** Plain-language title, with units. */
  title: string;
  caption?: ReactNode;
  /** The chart's main result in one line of words, shown under it. */
  reading?: ReactNode;
  /** Memoized by the caller: every new object redraws the chart. A function gets the drawing's width (a layout for phones). */
  plot: PlotOptions | ((width: number) => PlotOptions);
  /** The rows behind the chart, shown in the table view. */
  rows: readonly Row[];
  columns: ReadonlyArray<TableColumn<Row>>;
  /** Shown instead of the chart when there are no rows: say why and what would fill it. */
  empty: ReactNode;
  height?: number;
  /** When given, the table's numbers can be downloaded as this CSV file. */
  csvName?: string;
}) {
  const holder = useRef<HTMLDivElement>(null);
  const [width, setWidth] = useState(0);
  const [showTable, setShowTable] = useState(false);

  useEffect(() => {
    const element = holder.current;
    if (!element) return;
    const observer = new ResizeObserver(([entry]) => {
      if (entry) setWidth(Math.floor(entry.contentRect.width));
    });
    observer.observe(element);
    return () => observer.disconnect();
  }, []);

  useEffect(() => {
    const element = holder.current;
    if (!element || width === 0 || rows.length === 0) return;
    let drawn: Element | null = null;
    let cancelled = false;
    // Loaded in the browser only: Plot needs a document, and pages without charts stay light.
    let tips: MutationObserver | null = null;
    void import("@observablehq/plot").then((Plot) => {
      if (cancelled) return;
      drawn = Plot.plot({ ...(typeof plot === "function" ? plot(width) : plot), height, width });
      element.append(drawn);
      tips = keepTipsInside(drawn);
    });
    return () => {
      cancelled = true;
      tips?.disconnect();
      drawn?.remove();
    };
  }, [plot, width, rows, height]);

  return (
    <figure className="rounded-xl border border-line bg-white p-4">
      <figcaption className="mb-2">
        <span className="block font-semibold">{title}</span>
        {caption ? <span className="block text-sm text-muted">{caption}</span> : null}
      </figcaption>
      {rows.length === 0 ? (
        <p className="py-6 text-center text-muted" data-chart-empty>
          {empty}
        </p>
      ) : (
        <>
          <div ref={holder} aria-hidden={showTable} className="w-full overflow-hidden" style={{ minHeight: height }} data-chart-drawing />
          {reading ? (
            <p className="mt-2 text-sm font-medium" data-chart-reading>
              {reading}
            </p>
          ) : null}
          <button
            type="button"
            onClick={() => setShowTable((v) => !v)}
            aria-expanded={showTable}
            className="mt-2 text-sm font-medium text-verdigris-700 underline"
          >
            {showTable ? "Hide the table" : "Show as a table"}
          </button>
          {csvName ? (
            <button
              type="button"
              onClick={() => downloadCsv(csvName, columns, rows)}
              className="mt-2 ml-4 text-sm font-medium text-verdigris-700 underline"
            >
              Download CSV
            </button>
          ) : null}
          {showTable ? (
            <div className="mt-2 max-h-80 overflow-auto">
              <table className="w-full text-left text-sm tabular-nums">
                <TableHead caption={title} headings={columns.map((c) => c.label)} className="text-muted" cellClassName="px-2 py-1 font-medium" />
                <tbody className="divide-y divide-line">
                  {rows.map((row, i) => (
                    <tr key={i}>
                      {columns.map((c) => (
                        <td key={c.label} className="px-2 py-1">
                          {c.value(row)}
                        </td>
                      ))}
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          ) : null}
        </>
      )}
    </figure>
  );
}

/**
 * Plot places a tip beside its mark, but when the tip is wider than the room on
 * either side (a long tip on a phone) it hangs past the drawing, where the
 * holder cuts it off. Each time a tip appears (Plot draws a fresh one per
 * pointer or tap, then shows it once measured), it is shifted back inside the
 * drawing and the viewport.
 */
function keepTipsInside(drawn: Element): MutationObserver {
  const place = () => {
    for (const tip of drawn.querySelectorAll<SVGGElement>('g[aria-label="tip"]')) {
      if (tip.getAttribute("visibility") === "hidden") continue;
      const svg = tip.ownerSVGElement;
      if (!svg) continue;
      const frame = svg.getBoundingClientRect();
      const scale = frame.width / (svg.width.baseVal.value || frame.width);
      const left = Math.max(frame.left, 0);
      const right = Math.min(frame.right, document.documentElement.clientWidth);
      for (const box of tip.children) {
        const at = (box as SVGGElement).dataset.at ?? box.getAttribute("transform") ?? "";
        (box as SVGGElement).dataset.at = at;
        box.setAttribute("transform", at);
        const r = box.getBoundingClientRect();
        const dx = r.left < left ? left - r.left : r.right > right ? Math.max(right - r.right, left - r.left) : 0;
        const dy = r.top < frame.top ? frame.top - r.top : r.bottom > frame.bottom ? Math.max(frame.bottom - r.bottom, frame.top - r.top) : 0;
        if (dx !== 0 || dy !== 0) box.setAttribute("transform", `${at} translate(${dx / scale},${dy / scale})`);
      }
    }
  };
  const observer = new MutationObserver(place);
  observer.observe(drawn, { subtree: true, childList: true, attributes: true, attributeFilter: ["visibility"] });
  return observer;
}

function downloadCsv<Row>(fileName: string, columns: ReadonlyArray<TableColumn<Row>>, rows: readonly Row[]) {
  const csv = displayTableCsv(
    columns.map((c) => c.label),
    rows.map((row) => columns.map((c) => c.value(row))),
  );
  const url = URL.createObjectURL(new Blob([csv], { type: "text/csv;charset=utf-8" }));
  const link = Object.assign(document.createElement("a"), { href: url, download: fileName });
  link.click();
  URL.revokeObjectURL(url);
}
