import { sql, type Column, type SQL } from "drizzle-orm";

/**
 * Row ids written into the statement as one list ("3,1,20"). For the
 * thousands of pool ids of a large company: one bound parameter per id costs
 * more to build and escape than the read it limits. Only whole numbers are
 * written; anything else throws.
 */
export function idList(ids: readonly number[]): SQL {
  for (const id of ids) if (!Number.isSafeInteger(id)) throw new TypeError(`not a row id: ${String(id)}`);
  return sql.raw(ids.join(","));
}

/** `column IN (ids)`, matching nothing for no ids. */
export function inIdList(column: Column, ids: readonly number[]): SQL {
  return ids.length === 0 ? sql`false` : sql`${column} IN (${idList(ids)})`;
}
