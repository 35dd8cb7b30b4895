import { describe, expect, it } from "vitest";
import { isMissing, readNumber, readReading } from "./cells";
import { findDateOrder, readInstant } from "./dates";
import { proposeMapping, readHeader, savedMappingFits, toSavedMapping } from "./propose-mapping";
import { validateRow, type RowContext } from "./validate-row";

describe("reading headers", () => {
  it.each([
    { header: "Cu", field: "copper" },
    { header: "Copper (ppm)", field: "copper", unit: "mgL" },
    { header: "Cu (µg/L)", field: "copper", unit: "ugL" },
    { header: "Iron ug/L", field: "iron", unit: "ugL" },
    { header: "Mn ppb", field: "manganese", unit: "ugL" },
    { header: "Temp F", field: "temperatureC", unit: "degF" },
    { header: "Water Temp (°C)", field: "temperatureC", unit: "degC" },
    { header: "Free Cl", field: "freeChlorine" },
    { header: "Free Cl (ppm)", field: "freeChlorine" },
    { header: "FC", field: "freeChlorine" },
    { header: "TA", field: "totalAlkalinity" },
    { header: "CH", field: "calciumHardness" },
    { header: "CYA", field: "cyanuricAcid" },
    { header: "pH", field: "ph" },
    { header: "Acct #", field: "accountCode" },
    { header: "Service Address", field: "address" },
    { header: "Sample Date", field: "sampledAt" },
    { header: "Time", field: "sampleTime" },
    { header: "Product", field: "product" },
    { header: "Qty", field: "amount" },
    { header: "Favourite colour", field: "ignore" },
  ])("$header", ({ header, field, unit }) => {
    const reading = readHeader(header);
    expect(reading.field).toBe(field);
    expect(reading.unit).toBe(unit);
  });

  it("gives a field to its first column only", () => {
    expect(proposeMapping(["Date", "Cu", "Copper"]).map((c) => c.field)).toEqual(["sampledAt", "copper", "ignore"]);
  });

  it("a saved mapping wins over the proposal and fits files with the same headers", () => {
    const headers = ["Date", "Stuff"];
    const saved = toSavedMapping(headers, [{ field: "sampledAt" }, { field: "copper", unit: "ugL" }]);
    expect(savedMappingFits(["date", "STUFF"], saved)).toBe(true);
    expect(savedMappingFits(["date", "other"], saved)).toBe(false);
    expect(proposeMapping(["DATE", "stuff"], saved)).toEqual([{ field: "sampledAt" }, { field: "copper", unit: "ugL" }]);
  });
});

describe("reading numbers", () => {
  const dot = { decimalComma: false };
  const comma = { decimalComma: true };
  it("reads points everywhere and commas only where the separator allows", () => {
    expect(readNumber("7.4", dot)).toEqual({ ok: true, value: 7.4 });
    expect(readNumber("7,4", comma)).toEqual({ ok: true, value: 7.4 });
    expect(readNumber("3.200,5", comma)).toEqual({ ok: true, value: 3200.5 });
    expect(readNumber("3,200", dot)).toEqual({ ok: true, value: 3200 });
    expect(readNumber("7,4", dot).ok).toBe(false);
    expect(readNumber("abc", dot)).toEqual({ ok: false, reason: "is not a number" });
    expect(readNumber("-1", dot)).toEqual({ ok: false, reason: "is negative" });
  });

  it("treats n/a, - and blank as missing", () => {
    for (const cell of ["", " ", "-", "n/a", "N/A", "na"]) expect(isMissing(cell)).toBe(true);
    expect(readReading("n/a", "plain", undefined, dot)).toEqual({ ok: true, value: null, belowDetection: false });
  });

  it("keeps <x as a detection limit for metals and converts µg/L to mg/L", () => {
    expect(readReading("<0.1", "metal", "mgL", dot)).toEqual({ ok: true, value: 0.1, belowDetection: true });
    // 120 µg/L / 1000 = 0.12 mg/L
    expect(readReading("120", "metal", "ugL", dot)).toEqual({ ok: true, value: 0.12, belowDetection: false });
    // the cell's own unit wins: 0.3 ppm in a µg/L column stays 0.3 mg/L
    expect(readReading("0.3 ppm", "metal", "ugL", dot)).toEqual({ ok: true, value: 0.3, belowDetection: false });
    expect(readReading("<0,05", "metal", "mgL", comma)).toEqual({ ok: true, value: 0.05, belowDetection: true });
    expect(readReading("<0.1", "plain", undefined, dot).ok).toBe(false);
  });

  it("converts °F to °C", () => {
    // (82 - 32) x 5/9 = 27.78 -> 27.8 degC
    expect(readReading("82", "temperature", "degF", dot)).toEqual({ ok: true, value: 27.8, belowDetection: false });
    expect(readReading("28 C", "temperature", "degF", dot)).toEqual({ ok: true, value: 28, belowDetection: false });
    expect(readReading("28", "temperature", undefined, dot).ok).toBe(false);
  });
});

describe("dates", () => {
  it("finds the order, or says it cannot", () => {
    expect(findDateOrder(["2024-05-03", "2024-06-01 10:00"])).toEqual({ kind: "iso" });
    expect(findDateOrder(["03/04/2024", "25/04/2024"])).toMatchObject({ kind: "known", order: "dmy" });
    expect(findDateOrder(["03/04/2024", "04/25/2024"])).toMatchObject({ kind: "known", order: "mdy" });
    expect(findDateOrder(["03/04/2024", "05/06/2024"])).toMatchObject({ kind: "ambiguous" });
    expect(findDateOrder(["13/04/2024", "04/25/2024"])).toMatchObject({ kind: "conflicting" });
  });

  it("reads wall-clock times in the company's zone", () => {
    // 10:30 in New York on 3 May 2024 is EDT (UTC-4): 14:30 UTC.
    const may = readInstant("2024-05-03 10:30", undefined, null, "America/New_York");
    expect(may).toEqual({ ok: true, value: new Date("2024-05-03T14:30:00Z"), hadTime: true });
    // 3 January is EST (UTC-5); day-first order; time in its own column with pm.
    const jan = readInstant("03/01/2024", "2:15 pm", "dmy", "America/New_York");
    expect(jan).toEqual({ ok: true, value: new Date("2024-01-03T19:15:00Z"), hadTime: true });
    // Month first, no time: the start of the day in the zone.
    expect(readInstant("1/3/2024", undefined, "mdy", "Europe/Lisbon")).toEqual({
      ok: true,
      value: new Date("2024-01-03T00:00:00Z"),
      hadTime: false,
    });
  });

  it("never guesses an ambiguous date and refuses impossible ones", () => {
    expect(readInstant("03/04/2024", undefined, null, "UTC")).toMatchObject({ ok: false });
    expect(readInstant("31/02/2024", undefined, "dmy", "UTC")).toMatchObject({ ok: false });
    expect(readInstant("25/04/2024", undefined, "mdy", "UTC")).toMatchObject({ ok: false });
    expect(readInstant("03/04/24", undefined, "dmy", "UTC")).toMatchObject({ ok: false });
  });
});

describe("validating a row", () => {
  const headers = ["Account", "Date", "pH", "Cu (ug/L)", "Temp F", "FC", "Product", "Amount", "Unit"];
  const context: RowContext = {
    headers,
    columns: proposeMapping(headers),
    dateOrder: null,
    timeZone: "UTC",
    style: { decimalComma: false },
  };

  it("stores canonical values", () => {
    const result = validateRow(["A-1", "2024-05-03", "7.4", "<50", "82", "n/a", "Metal guard", "16", "fl oz"], 2, context);
    expect(result).toEqual({
      ok: true,
      record: {
        row: 2,
        accountCode: "A-1",
        address: null,
        customerName: null,
        neighbourhood: null,
        postalCode: null,
        sampledAt: new Date("2024-05-03T00:00:00Z"),
        // <50 µg/L = <0.05 mg/L; 82 degF = 27.8 degC
        test: { ph: 7.4, copper: 0.05, copperBelowDetection: true, temperatureC: 27.8 },
        treatment: { product: "Metal guard", amount: 16, unit: "fl oz", cost: null },
      },
    });
  });

  it("names the field, the value and the bound", () => {
    const result = validateRow(["A-1", "2024-05-03", "15", "", "", "62", "", "", ""], 7, context);
    expect(result).toEqual({
      ok: false,
      refusals: [
        { row: 7, column: "FC", value: "62", reason: "Free chlorine 62 mg/L is above the accepted maximum of 50 mg/L" },
        { row: 7, column: "pH", value: "15", reason: "pH 15 is above the accepted maximum of 14" },
      ],
    });
  });

  it("refuses rows with no pool, no date or nothing to store", () => {
    expect(validateRow(["", "2024-05-03", "7.4", "", "", "", "", "", ""], 3, context)).toMatchObject({ ok: false });
    expect(validateRow(["A-1", "", "7.4", "", "", "", "", "", ""], 3, context)).toMatchObject({ ok: false });
    expect(validateRow(["A-1", "2024-05-03", "", "", "", "", "", "", ""], 3, context)).toMatchObject({
      ok: false,
      refusals: [{ reason: "has no test value and no treatment" }],
    });
  });
});

describe("match keys", async () => {
  const { addressKey, accountKey } = await import("./match-keys");
  it("ignores case, punctuation and street-word spelling", () => {
    expect(addressKey("12 Heron Walk Street")).toBe(addressKey("12, heron walk St."));
    expect(addressKey("4 Copse Lane")).not.toBe(addressKey("4 Copse Road"));
    expect(accountKey(" kpc 0012 ")).toBe("KPC0012");
  });
});

describe("days the clocks change", () => {
  it("converts each time on its own on a changeover day", () => {
    // New York, 10 March 2024: clocks go from 02:00 EST to 03:00 EDT.
    // 01:30 is EST (UTC-5) = 06:30 UTC; 03:30 is EDT (UTC-4) = 07:30 UTC.
    expect(readInstant("2024-03-10 01:30", undefined, null, "America/New_York")).toMatchObject({ value: new Date("2024-03-10T06:30:00Z") });
    expect(readInstant("2024-03-10 03:30", undefined, null, "America/New_York")).toMatchObject({ value: new Date("2024-03-10T07:30:00Z") });
    // The days around it keep one offset each: 9 March EST, 11 March EDT.
    expect(readInstant("2024-03-09 12:00", undefined, null, "America/New_York")).toMatchObject({ value: new Date("2024-03-09T17:00:00Z") });
    expect(readInstant("2024-03-11 12:00", undefined, null, "America/New_York")).toMatchObject({ value: new Date("2024-03-11T16:00:00Z") });
  });
});
