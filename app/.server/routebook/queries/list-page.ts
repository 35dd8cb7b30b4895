import { asc, type AnyColumn, count, desc, type SQL, type SQLWrapper } from "drizzle-orm";
import type { MySqlTable } from "drizzle-orm/mysql-core";
import { db } from "../../db/client";

/** A list page's ORDER BY: the chosen column in the chosen direction, then the id, so pages never overlap. */
export function listOrder(dir: "asc" | "desc", column: AnyColumn | SQLWrapper, id: AnyColumn): SQL[] {
  return [dir === "desc" ? desc(column) : asc(column), asc(id)];
}

/** One page of rows together with the number of all rows matching the same condition. */
export async function withTotal<Row>(page: PromiseLike<Row[]>, table: MySqlTable, where: SQL | undefined) {
  const [rows, [total]] = await Promise.all([page, db().select({ n: count() }).from(table).where(where)]);
  return { rows, total: total?.n ?? 0 };
}
