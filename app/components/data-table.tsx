import type { ReactNode } from "react";
import { Form, Link, useSearchParams } from "react-router";
import { OptionList } from "~/components/form-controls";
import { PAGE_SIZE } from "~/lib/list-params";

export type Column<Row> = {
  key: string;
  label: string;
  /** The URL sort key; absent = not sortable. */
  sortKey?: string;
  numeric?: boolean;
  /** Hidden on narrow screens to keep the table readable on a phone. */
  wide?: boolean;
  cell: (row: Row) => ReactNode;
};

/**
 * A table sorted, filtered and paged on the server through URL search params:
 * every state is a link, so it works before the page's script loads and can
 * be bookmarked.
 */
export function DataTable<Row>({
  caption,
  columns,
  rows,
  rowKey,
  total,
  sort,
  dir,
  page,
  empty,
}: {
  caption: string;
  columns: ReadonlyArray<Column<Row>>;
  rows: readonly Row[];
  rowKey: (row: Row) => string | number;
  total: number;
  sort: string;
  dir: "asc" | "desc";
  page: number;
  empty: ReactNode;
}) {
  const [search] = useSearchParams();
  const hrefWith = (changes: Record<string, string | null>) => {
    const next = new URLSearchParams(search);
    for (const [key, value] of Object.entries(changes)) {
      if (value === null) next.delete(key);
      else next.set(key, value);
    }
    return `?${next.toString()}`;
  };
  const pages = Math.max(1, Math.ceil(total / PAGE_SIZE));
  const first = total === 0 ? 0 : (page - 1) * PAGE_SIZE + 1;
  const last = Math.min(total, page * PAGE_SIZE);

  return (
    <div>
      <div className="overflow-x-auto rounded-xl border border-line bg-white">
        <table className="w-full text-left text-sm">
          <caption className="sr-only">{caption}</caption>
          <thead className="border-b border-line text-muted">
            <tr>
              {columns.map((column) => {
                const active = column.sortKey === sort;
                const className = `px-3 py-2 font-medium whitespace-nowrap ${column.numeric ? "text-right" : ""} ${column.wide ? "hidden md:table-cell" : ""}`;
                return (
                  <th
                    key={column.key}
                    scope="col"
                    className={className}
                    aria-sort={active ? (dir === "asc" ? "ascending" : "descending") : undefined}
                  >
                    {column.sortKey ? (
                      <Link
                        to={hrefWith({ sort: column.sortKey, dir: active && dir === "asc" ? "desc" : "asc", page: null })}
                        className="inline-flex items-center gap-1 hover:text-ink"
                        preventScrollReset
                      >
                        {column.label}
                        <span aria-hidden="true">{active ? (dir === "asc" ? "▲" : "▼") : "↕"}</span>
                      </Link>
                    ) : (
                      column.label
                    )}
                  </th>
                );
              })}
            </tr>
          </thead>
          <tbody className="divide-y divide-line">
            {rows.length === 0 ? (
              <tr>
                <td colSpan={columns.length} className="px-3 py-6 text-center text-muted">
                  {empty}
                </td>
              </tr>
            ) : (
              rows.map((row) => (
                <tr key={rowKey(row)}>
                  {columns.map((column) => (
                    <td
                      key={column.key}
                      className={`px-3 py-2 ${column.numeric ? "text-right tabular-nums" : ""} ${column.wide ? "hidden md:table-cell" : ""}`}
                    >
                      {column.cell(row)}
                    </td>
                  ))}
                </tr>
              ))
            )}
          </tbody>
        </table>
      </div>
      <nav aria-label="Pages" className="mt-3 flex items-center justify-between gap-3 text-sm">
        <span className="text-muted">
          {first}–{last} of {total}
        </span>
        <span className="flex gap-2">
          {page > 1 ? (
            <Link to={hrefWith({ page: String(page - 1) })} className="rounded-lg border border-line bg-white px-3 py-2">
              Previous
            </Link>
          ) : null}
          {page < pages ? (
            <Link to={hrefWith({ page: String(page + 1) })} className="rounded-lg border border-line bg-white px-3 py-2">
              Next
            </Link>
          ) : null}
        </span>
      </nav>
    </div>
  );
}

/** The search box and filters above a table; submits as GET so the URL holds the state. */
export function ListFilters({ children, searchLabel }: { children?: ReactNode; searchLabel: string }) {
  const [search] = useSearchParams();
  return (
    <Form method="get" className="mb-3 flex flex-wrap items-end gap-2" role="search">
      <label className="grow basis-48">
        <span className="text-sm font-medium">{searchLabel}</span>
        <input
          type="search"
          name="q"
          defaultValue={search.get("q") ?? ""}
          className="mt-1 block w-full rounded-lg border border-line bg-white px-3 py-2.5 text-base"
        />
      </label>
      {children}
      {search.get("sort") ? <input type="hidden" name="sort" value={search.get("sort")!} /> : null}
      {search.get("dir") ? <input type="hidden" name="dir" value={search.get("dir")!} /> : null}
      <button type="submit" className="rounded-lg border border-line bg-white px-4 py-2.5 font-medium hover:bg-verdigris-50">
        Show
      </button>
    </Form>
  );
}

export function FilterSelect({
  name,
  label,
  options,
  allLabel,
}: {
  name: string;
  label: string;
  options: ReadonlyArray<{ value: string; label: string }>;
  allLabel?: string;
}) {
  const [search] = useSearchParams();
  return (
    <label className="basis-40">
      <span className="text-sm font-medium">{label}</span>
      <select
        name={name}
        defaultValue={search.get(name) ?? ""}
        className="mt-1 block w-full rounded-lg border border-line bg-white px-3 py-2.5 text-base"
      >
        <OptionList options={options} blank={allLabel} />
      </select>
    </label>
  );
}

export function PageHeader({ title, action, children }: { title: string; action?: ReactNode; children?: ReactNode }) {
  return (
    <div className="mb-4 flex flex-wrap items-end justify-between gap-3">
      <div>
        <h1 className="text-2xl font-semibold tracking-tight">{title}</h1>
        {children ? <div className="text-muted">{children}</div> : null}
      </div>
      {action}
    </div>
  );
}

export function ButtonLink({ to, children }: { to: string; children: ReactNode }) {
  return (
    <Link to={to} className="rounded-lg bg-verdigris-700 px-4 py-2.5 font-semibold text-white hover:bg-verdigris-900">
      {children}
    </Link>
  );
}
