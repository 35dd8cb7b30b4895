import { sql, type Column, type SQL } from "drizzle-orm";

/**
 * `column IN (ids)` with the ids written into the statement as one list.
 * For the thousands of pool ids of a large company: one bound parameter per
 * id costs more to build and escape than the read it limits. Only whole
 * numbers are written; anything else throws.
 */
export function inIdList(column: Column, ids: readonly number[]): SQL {
  if (ids.length === 0) return sql`false`;
  for (const id of ids) if (!Number.isSafeInteger(id)) throw new TypeError(`not a row id: ${String(id)}`);
  return sql`${column} IN (${sql.raw(ids.join(","))})`;
}
