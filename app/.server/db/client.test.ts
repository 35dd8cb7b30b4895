import { describe, expect, it } from "vitest";
import { withStatementLimit } from "./client";

describe("withStatementLimit", () => {
  it("puts MariaDB's statement limit in front of reads, with the driver's timeout as a backstop", () => {
    expect(withStatementLimit("select 1", 1500)).toEqual({ sql: "SET STATEMENT max_statement_time=1.500 FOR select 1", timeout: 6500 });
    const options = withStatementLimit({ sql: " WITH x AS (SELECT 1) SELECT * FROM x", rowsAsArray: true }, 20_000);
    expect(options).toMatchObject({ sql: expect.stringMatching(/^SET STATEMENT max_statement_time=20\.000 FOR /), rowsAsArray: true, timeout: 25_000 });
  });

  it("leaves writes alone", () => {
    expect(withStatementLimit("insert into t values (1)", 1500)).toBe("insert into t values (1)");
  });
});
