import { sql, type SQL } from "drizzle-orm";
import type { SqlValue } from "mysql2";

/**
 * Many rows' values as one bound parameter, which the driver writes into the
 * statement as "(…), (…)", escaped as it escapes any bound value (instants in
 * UTC, as the connections are set up). For the tens of thousands of kept rows
 * an import writes: a piece of query-builder SQL per value costs more than the
 * insert itself, and values written into the text beforehand would be
 * scanned again for placeholders.
 */
export function rowValues(rows: readonly (readonly SqlValue[])[]): SQL {
  if (rows.length === 0) throw new RangeError("rowValues: no rows to write");
  return sql`${sql.param(rows)}`;
}
