import { asc, type AnyColumn, count, desc, type SQL, type SQLWrapper } from "drizzle-orm";
import type { AnyMySqlColumn, MySqlSelect, MySqlTable } from "drizzle-orm/mysql-core";
import type { ListParams } from "~/lib/list-params";
import { db } from "../../db/client";

export type ListQuery<Sort extends string> = {
  /** The table listed: its id breaks ties in the order, and its rows under `where` are counted. */
  table: MySqlTable & { id: AnyColumn };
  where: SQL | undefined;
  /** What each sort key of the page orders by. */
  sorts: Record<Sort, AnyColumn | SQLWrapper>;
  params: ListParams<Sort>;
};

/**
 * One page of a list together with the number of all rows matching the same
 * condition. `select` is the list's select, from and joins; the page is
 * ordered by the chosen sort in the chosen direction, then by id, so pages
 * never overlap.
 */
export async function listPage<Select extends MySqlSelect, Sort extends string>(
  select: { $dynamic(): Select },
  list: ListQuery<Sort>,
) {
  const { table, where, sorts, params } = list;
  const sortedBy = sorts[params.sort];
  const page = select
    .$dynamic()
    .where(where)
    .orderBy(params.dir === "desc" ? desc(sortedBy) : asc(sortedBy), asc(table.id))
    .limit(params.limit)
    .offset(params.offset);
  const [rows, [total]] = await Promise.all([page, db().select({ n: count() }).from(table).where(where)]);
  return { rows: rows as Awaited<Select>, total: total?.n ?? 0 };
}

type NamedTable = MySqlTable & {
  id: AnyMySqlColumn<{ data: number; notNull: true }>;
  name: AnyMySqlColumn<{ data: string; notNull: true }>;
  active: AnyMySqlColumn<{ data: boolean; notNull: true }>;
};

/**
 * Names for pickers and filters, in name order: routes or fill sources under
 * `where`. Archived ones are flagged; pickers leave them out.
 */
export function nameOptions(table: NamedTable, where: SQL) {
  return db()
    .select({ id: table.id, name: table.name, active: table.active })
    .from(table)
    .where(where)
    .orderBy(asc(table.name));
}
