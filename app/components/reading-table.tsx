import type { ReactNode } from "react";

/**
 * A table's caption, for screen readers only, and its row of column headings:
 * the head of the reading tables and of the charts' table view.
 */
export function TableHead({ caption, headings, className, cellClassName }: { caption: string; headings: readonly string[]; className: string; cellClassName: string }) {
  return (
    <>
      <caption className="sr-only">{caption}</caption>
      <thead className={className}>
        <tr>
          {headings.map((heading) => (
            <th key={heading} scope="col" className={cellClassName}>
              {heading}
            </th>
          ))}
        </tr>
      </thead>
    </>
  );
}

/**
 * A small table of readings in a bordered frame that scrolls sideways on a
 * phone: the caption names it for screen readers, the rows are the caller's.
 */
export function ReadingTable({ caption, headings, children }: { caption: string; headings: readonly string[]; children: ReactNode }) {
  return (
    <div className="overflow-x-auto rounded-xl border border-line bg-white">
      <table className="w-full text-left text-sm tabular-nums">
        <TableHead caption={caption} headings={headings} className="border-b border-line text-muted" cellClassName="px-3 py-2 font-medium" />
        <tbody className="divide-y divide-line">{children}</tbody>
      </table>
    </div>
  );
}
