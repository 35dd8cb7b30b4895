import { sql, type SQL } from "drizzle-orm";
import { format, type SqlValue } from "mysql2";

/**
 * Many rows' values written into the statement as "(…), (…)", escaped by the
 * driver exactly as it escapes bound values (instants in UTC, as the
 * connections are set up). For the tens of thousands of kept rows an import
 * writes: building each value as a piece of query-builder SQL costs more
 * than the insert itself.
 */
export function rowValues(rows: readonly (readonly SqlValue[])[]): SQL {
  if (rows.length === 0) throw new RangeError("rowValues: no rows to write");
  return sql.raw(format("?", [rows as SqlValue[][]], false, "Z"));
}
