import { describe, expect, it } from "vitest";
import { isKnownCurrency } from "./forms/settings";
import { formatMoney } from "./format";

// ISO 4217 (the standard's list of codes and their minor units): USD, EUR and GBP have 2 decimals, JPY 0, KWD 3.
describe("costs in the company's currency", () => {
  it.each([
    ["USD", "$648.26"],
    ["EUR", "€648.26"],
    ["GBP", "£648.26"],
    ["JPY", "¥648"],
    ["KWD", "KWD 648.260"],
  ])("%s", (currency, shown) => {
    expect(formatMoney(648.26, currency).replace(/\u00a0/g, " ")).toBe(shown);
  });

  it("knows the ISO 4217 codes and nothing else", () => {
    expect(isKnownCurrency("CAD")).toBe(true);
    expect(isKnownCurrency("ZAR")).toBe(true);
    expect(isKnownCurrency("XYZ")).toBe(false);
    expect(isKnownCurrency("usd")).toBe(false);
  });
});
