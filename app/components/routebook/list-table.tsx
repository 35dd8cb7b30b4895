import type { ReactNode } from "react";
import { Link } from "react-router";
import { type Column, DataTable, FilterSelect } from "~/components/data-table";
import { ARCHIVE_STATUS_OPTIONS } from "~/lib/archived";
import type { ListParams } from "~/lib/list-params";

/** "1 pool", "12 pools". */
export function countOf(total: number, one: string, many: string): string {
  return `${total} ${total === 1 ? one : many}`;
}

/** The entry's name: a link to its page, or plain text when there is nowhere to go (`to` null). */
export function NameCell({ to, children }: { to: string | null; children: ReactNode }) {
  return to === null ? (
    <span className="font-medium">{children}</span>
  ) : (
    <Link to={to} className="font-medium text-verdigris-700 underline">
      {children}
    </Link>
  );
}

/** The "In use" / "Archived" column of lists whose entries are archived, never deleted. */
export function archiveColumn<Row extends { active: boolean }>(): Column<Row> {
  return { key: "active", label: "Status", wide: true, cell: (r) => (r.active ? "In use" : "Archived") };
}

export function ArchiveStatusFilter() {
  return <FilterSelect name="status" label="Status" options={ARCHIVE_STATUS_OPTIONS} />;
}

/**
 * A route book list: the table sorted and paged by the list's URL params, and
 * an empty state that says whether the search or the book is empty.
 */
export function ListTable<Row extends { id: number }>({
  caption,
  columns,
  rows,
  total,
  params,
  noun,
  emptyText,
}: {
  caption: string;
  columns: ReadonlyArray<Column<Row>>;
  rows: readonly Row[];
  total: number;
  params: Pick<ListParams, "sort" | "dir" | "page" | "q">;
  /** The singular noun of a search miss: `No pool matches "…".` */
  noun: string;
  emptyText: string;
}) {
  return (
    <DataTable
      caption={caption}
      columns={columns}
      rows={rows}
      rowKey={(r) => r.id}
      total={total}
      sort={params.sort}
      dir={params.dir}
      page={params.page}
      empty={params.q ? `No ${noun} matches "${params.q}".` : emptyText}
    />
  );
}
