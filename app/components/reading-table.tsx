import type { ReactNode } from "react";

/**
 * A small table of readings in a bordered frame that scrolls sideways on a
 * phone: the caption names it for screen readers, the rows are the caller's.
 */
export function ReadingTable({ caption, headings, children }: { caption: string; headings: readonly string[]; children: ReactNode }) {
  return (
    <div className="overflow-x-auto rounded-xl border border-line bg-white">
      <table className="w-full text-left text-sm tabular-nums">
        <caption className="sr-only">{caption}</caption>
        <thead className="border-b border-line text-muted">
          <tr>
            {headings.map((heading) => (
              <th key={heading} scope="col" className="px-3 py-2 font-medium">
                {heading}
              </th>
            ))}
          </tr>
        </thead>
        <tbody className="divide-y divide-line">{children}</tbody>
      </table>
    </div>
  );
}
