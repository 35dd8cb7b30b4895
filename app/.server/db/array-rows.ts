import { pool } from "./client";

type BuiltQuery = { toSQL(): { sql: string; params: unknown[] } };

/**
 * The rows of a built query as arrays, in the order of its select, with the
 * driver's own types (DATETIME as Date, numbers as numbers, flags as 0 or 1,
 * JSON as text). For reads of tens of thousands of rows: the query builder's
 * per-value mapping costs more than the read itself there.
 */
export async function arrayRows<Row extends readonly unknown[]>(query: BuiltQuery): Promise<Row[]> {
  const { sql, params } = query.toSQL();
  const [rows] = await pool().query({ sql, rowsAsArray: true }, params);
  return rows as unknown as Row[];
}

/**
 * The same through the binary protocol (a prepared statement): every DOUBLE
 * arrives with all its bits, where the text protocol's decimal form can drop
 * the last one.
 */
export async function exactArrayRows<Row extends readonly unknown[]>(query: BuiltQuery): Promise<Row[]> {
  const { sql, params } = query.toSQL();
  const [rows] = await pool().execute({ sql, rowsAsArray: true }, params as never);
  return rows as unknown as Row[];
}
