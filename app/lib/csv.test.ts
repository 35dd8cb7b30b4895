import { describe, expect, it } from "vitest";
import { csvCell, csvLine, displayTableCsv, neutraliseFormula } from "./csv";

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

describe("chart table downloads", () => {
  const headers = ["Treatment", "Median fall (%)", "Judgement"];

  it("neutralises display text a spreadsheet would run as a formula", () => {
    const csv = displayTableCsv(headers, [
      ["=HYPERLINK(\"http://example.invalid\")", "12.5", "@risk"],
      ["+Clarifier", "3.0", "-check"],
      ["\tTabbed", "1", "\rReturn"],
    ]);
    expect(csv.split("\r\n")).toEqual([
      "Treatment,Median fall (%),Judgement",
      `"'=HYPERLINK(""http://example.invalid"")",12.5,'@risk`,
      "'+Clarifier,3.0,'-check",
      `'\tTabbed,1,"'\rReturn"`,
      "",
    ]);
  });

  it("keeps numbers written as text, negative ones included, as they are", () => {
    expect(displayTableCsv(headers, [["Sequestrant", "-12.30", "worse"], ["", ".5", "-"]])).toBe(
      "Treatment,Median fall (%),Judgement\r\nSequestrant,-12.30,worse\r\n,.5,'-\r\n",
    );
  });
});
