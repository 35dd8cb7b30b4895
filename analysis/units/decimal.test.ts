import { describe, expect, it } from "vitest";
import { parseDecimal } from "./decimal";

const typed = { decimalComma: true, negative: true };

describe("decimal numbers", () => {
  it("reads a point or a comma as the decimal mark in typed input", () => {
    expect(parseDecimal("7.4", typed)).toBe(7.4);
    expect(parseDecimal(" 7,4 ", typed)).toBe(7.4);
    expect(parseDecimal(".5", typed)).toBe(0.5);
    expect(parseDecimal(",5", typed)).toBe(0.5);
    expect(parseDecimal("12.", typed)).toBe(12);
    expect(parseDecimal("+3", typed)).toBe(3);
    expect(parseDecimal("-0,3", typed)).toBe(-0.3);
  });

  it("refuses what is not one plain number", () => {
    for (const text of ["", " ", ".", ",", "-", "1,2,3", "1.2.3", "1e3", "0x10", "7.4 mg/L", "abc", "--1", "Infinity"]) {
      expect(parseDecimal(text, typed), text).toBeNull();
    }
  });

  it("refuses a minus unless negatives are allowed", () => {
    expect(parseDecimal("-1", { decimalComma: true })).toBeNull();
    expect(parseDecimal("-1", { decimalComma: true, negative: true })).toBe(-1);
  });

  it("reads digit groups only when allowed, by the file's decimal mark", () => {
    expect(parseDecimal("1,234.5", { decimalComma: false, groups: true })).toBe(1234.5);
    expect(parseDecimal("1.234,5", { decimalComma: true, groups: true })).toBe(1234.5);
    expect(parseDecimal("1,234.5", { decimalComma: false })).toBeNull();
    // A comma file cannot carry a decimal comma unquoted, so "7,4" there is not read as 7.4.
    expect(parseDecimal("7,4", { decimalComma: false, groups: true })).toBeNull();
    // "1.234" is one point two three four in both styles: point decimals are always read first.
    expect(parseDecimal("1.234", { decimalComma: true, groups: true })).toBe(1.234);
  });
});
