import { describe, expect, it } from "vitest";
import { MySqlDialect } from "drizzle-orm/mysql-core";
import { pools } from "./schema";
import { inIdList } from "./id-list";

const dialect = new MySqlDialect();
const rendered = (ids: readonly number[]) => dialect.sqlToQuery(inIdList(pools.id, ids));

describe("inIdList", () => {
  it("writes whole-number ids into the statement as one list, with no parameters", () => {
    expect(rendered([3, 1, 20])).toEqual({ sql: "`pools`.`id` IN (3,1,20)", params: [] });
  });

  it("matches nothing for no ids", () => {
    expect(rendered([]).sql).toBe("false");
  });

  it("refuses anything that is not a whole number, so no text reaches the statement", () => {
    for (const bad of [1.5, Number.NaN, Number.POSITIVE_INFINITY, 2 ** 53, "1) OR (1=1" as unknown as number]) {
      expect(() => rendered([1, bad])).toThrow(/not a row id/);
    }
  });
});
