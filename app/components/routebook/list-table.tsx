import type { ReactNode } from "react";
import { ButtonLink, type Column, DataTable, FilterSelect, ListFilters, PageHeader } from "~/components/data-table";
import { TextLink } from "~/components/text-link";
import { activeWanted, ARCHIVE_STATUS_OPTIONS, ARCHIVE_STATUSES } from "~/lib/archived";
import { enumFilter, listParams, type ListParams } from "~/lib/list-params";

/** "1 pool", "12 pools". */
function countOf(total: number, one: string, many: string): string {
  return `${total} ${total === 1 ? one : many}`;
}

/** The entry's name: a link to its page, or plain text when there is nowhere to go (`to` null). */
export function NameCell({ to, children }: { to: string | null; children: ReactNode }) {
  return to === null ? (
    <span className="font-medium">{children}</span>
  ) : (
    <TextLink to={to}>{children}</TextLink>
  );
}

/** The name column of a list: sorted by name, each name linking to `href` (plain text where it gives null). */
export function nameColumn<Row extends { id: number; name: string }>(label: string, href: (row: Row) => string | null): Column<Row> {
  return { key: "name", label, sortKey: "name", cell: (r) => <NameCell to={href(r)}>{r.name}</NameCell> };
}

/** The "In use" / "Archived" column of lists whose entries are archived, never deleted. */
export function archiveColumn<Row extends { active: boolean }>(): Column<Row> {
  return { key: "active", label: "Status", wide: true, cell: (r) => (r.active ? "In use" : "Archived") };
}

export function ArchiveStatusFilter() {
  return <FilterSelect name="status" label="Status" options={ARCHIVE_STATUS_OPTIONS} />;
}

/**
 * What a list of archivable entries (routes, fill sources, products) reads
 * from its URL: sorting by name unless asked otherwise, paging, and the
 * status of `ArchiveStatusFilter` (entries in use unless the URL says otherwise).
 */
export function archivableListQuery<const K extends readonly ["name", ...string[]]>(request: Request, sortKeys: K) {
  const url = new URL(request.url);
  const active = activeWanted(enumFilter(url, "status", ARCHIVE_STATUSES) ?? "active");
  return { url, params: listParams(url, sortKeys, "name"), active };
}

/**
 * A route book list: the table sorted and paged by the list's URL params, and
 * an empty state that says whether the search or the book is empty.
 */
type ListParamsShown = Pick<ListParams, "sort" | "dir" | "page" | "q">;

/**
 * A route book list page: the title with the count and, for editors, the add
 * button; the search box with the list's own filters (`children`); the table,
 * captioned with the title.
 */
export function ListPage<Row extends { id: number }>({
  title,
  intro,
  nouns: [one, many],
  add,
  searchLabel,
  list,
  columns,
  emptyText,
  children,
}: {
  title: string;
  /** Said before the count under the title. */
  intro?: string;
  /** The entry's noun, one and many: "1 pool", "12 pools". */
  nouns: readonly [string, string];
  /** Where editors add an entry, and the button's words. */
  add: { to: string; label: string };
  searchLabel: string;
  list: { rows: readonly Row[]; total: number; params: ListParamsShown; mayEdit: boolean };
  columns: ReadonlyArray<Column<Row>>;
  emptyText: string;
  children?: ReactNode;
}) {
  const count = countOf(list.total, one, many);
  return (
    <div>
      <PageHeader title={title} action={list.mayEdit ? <ButtonLink to={add.to}>{add.label}</ButtonLink> : null}>
        {intro ? `${intro} · ${count}` : count}
      </PageHeader>
      <ListFilters searchLabel={searchLabel}>{children}</ListFilters>
      <ListTable caption={title} columns={columns} rows={list.rows} total={list.total} params={list.params} noun={one} emptyText={emptyText} />
    </div>
  );
}

function ListTable<Row extends { id: number }>({
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
  params: ListParamsShown;
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
