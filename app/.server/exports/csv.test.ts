import { describe, expect, it } from "vitest";
import { csvCell, csvLine, neutraliseFormula } from "./csv";

describe("CSV cells", () => {
  it("neutralises text a spreadsheet would run as a formula", () => {
    for (const text of ["=1+1", "+1", "-1", "@SUM(A1)", "\tx", "\rx"]) expect(neutraliseFormula(text)).toBe(`'${text}`);
    expect(neutraliseFormula("Heron Walk")).toBe("Heron Walk");
    expect(csvCell('=HYPERLINK("x")')).toBe(`"'=HYPERLINK(""x"")"`);
  });

  it("writes numbers, booleans, dates and empties plainly", () => {
    expect(csvLine([0.12, true, new Date("2024-05-03T13:15:00Z"), null, "a,b"])).toBe('0.12,true,2024-05-03T13:15:00.000Z,,"a,b"\r\n');
  });
});
