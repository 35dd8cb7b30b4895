import { describe, expect, it } from "vitest";
import { rowValues } from "./row-values";
import { sql, type SQL } from "drizzle-orm";
import { MySqlDialect } from "drizzle-orm/mysql-core";
import { format, type SqlValue } from "mysql2";

/** The statement as the driver sends it: the dialect's text with its bound values written in, instants in UTC as the connections are set up. */
const sent = (statement: SQL) => {
  const query = new MySqlDialect().sqlToQuery(statement);
  return format(query.sql, query.params as SqlValue[], false, "Z");
};

describe("rowValues", () => {
  it("writes each row as a parenthesised list, escaped as the driver escapes bound values", () => {
    const rows = [
      [1, new Date(Date.UTC(2024, 0, 2, 3, 4, 5, 678)), null, true, "it's"],
      [2, new Date(Date.UTC(2025, 11, 31, 23, 59, 59, 1)), 0.25, false, '[{"value":0.1,"n":2}]'],
    ];
    expect(new MySqlDialect().sqlToQuery(sql`VALUES ${rowValues(rows)}`)).toMatchObject({ sql: "VALUES ?", params: [rows] });
    expect(sent(sql`VALUES ${rowValues(rows)}`)).toBe(
      "VALUES (1, '2024-01-02 03:04:05.678', NULL, true, 'it\\'s'), (2, '2025-12-31 23:59:59.001', 0.25, false, '[{\\\"value\\\":0.1,\\\"n\\\":2}]')",
    );
  });

  it("keeps a question mark inside a value and binds the statement's other parameters in order", () => {
    expect(sent(sql`SELECT ${rowValues([["what?", "it's ?"]])} WHERE id = ${5}`)).toBe("SELECT ('what?', 'it\\'s ?') WHERE id = 5");
  });

  it("refuses an empty list rather than write an insert without rows", () => {
    expect(() => rowValues([])).toThrow(/no rows/);
  });
});
