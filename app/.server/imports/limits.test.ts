import { getTableColumns } from "drizzle-orm";
import type { MySqlVarChar } from "drizzle-orm/mysql-core";
import { describe, expect, it } from "vitest";
import { TEXT_LIMITS } from "~/lib/imports/limits";
import { readAccountKey } from "~/lib/imports/match-keys";
import { readCheckForm } from "~/lib/imports/form";
import { pools, products, treatments } from "../db/schema";

describe("imported text limits", () => {
  it("are the widths of the columns the text is stored in", () => {
    const width = (column: unknown) => (column as MySqlVarChar<never>).length;
    const pool = getTableColumns(pools);
    expect(TEXT_LIMITS).toEqual({
      accountCode: width(pool.accountCode),
      address: width(pool.street),
      customerName: width(pool.customerName),
      neighbourhood: width(pool.neighbourhood),
      postalCode: width(pool.postalCode),
      product: width(getTableColumns(products).name),
      amountUnit: width(getTableColumns(treatments).unit),
    });
  });
});

describe("account keys", () => {
  it("fold what the collation folds: NUL, zero-width and soft hyphen, accents, case, fullwidth forms", () => {
    for (const code of ["KP-12", "kp-12", "KP\u0000-12", "K\u200bP-12", "KP\u00ad-12", "\u212a\u0300P-12", "\uff2b\uff30\uff0d\uff11\uff12", " KP - 12 "]) {
      expect(readAccountKey(code)).toEqual({ ok: true, key: "KP-12" });
    }
  });

  it("refuses what cannot be folded safely, saying why", () => {
    expect(readAccountKey("\u200b\u00ad")).toMatchObject({ ok: false, reason: expect.stringContaining("no letters or digits") });
    expect(readAccountKey("\u00d8ST-1")).toMatchObject({ ok: false, reason: expect.stringContaining("U+00D8") });
    expect(readAccountKey("A".repeat(41))).toMatchObject({ ok: false, reason: expect.stringContaining("at most 40") });
  });
});

describe("the check form", () => {
  it("reads 200 columns, each from its own field", () => {
    const form = new FormData();
    form.set("intent", "check");
    for (let i = 0; i < 200; i++) form.set(`column-${i}`, i === 7 ? "ph" : i === 9 ? "copper" : "ignore");
    form.set("unit-9", "ugL");
    const read = readCheckForm(form, 200);
    expect(read.ok && read.options.columns.length).toBe(200);
    expect(read.ok && read.options.columns[7]).toEqual({ field: "ph" });
    expect(read.ok && read.options.columns[9]).toEqual({ field: "copper", unit: "ugL" });
  });

  it("still refuses one field read from two columns", () => {
    const form = new FormData();
    form.set("intent", "check");
    form.set("column-0", "ph");
    form.set("column-1", "ph");
    expect(readCheckForm(form, 2)).toMatchObject({ ok: false, field: "columns" });
  });
});
