import { describe, expect, it } from "vitest";
import { isCalendarDay, plainId, plainPositiveInt } from "./strict-params";

describe("ids are plain positive integers", () => {
  it.each([
    ["1", 1],
    ["12", 12],
    ["999999999999999", 999_999_999_999_999],
    [7, 7],
  ])("accepts %j", (value, expected) => {
    expect(plainPositiveInt(value)).toBe(expected);
  });
  it.each([
    "1e2",
    "0x10",
    "1.0",
    "012",
    "0",
    "-3",
    "+3",
    " 12",
    "12 ",
    "",
    "1_000",
    "Infinity",
    "NaN",
    "9999999999999999",
    0,
    -1,
    1.5,
    null,
    undefined,
  ])("refuses %j", (value) => {
    expect(plainPositiveInt(value)).toBeNull();
  });
  it("names the field", () => {
    const parsed = plainId("poolId").safeParse("1e2");
    expect(parsed.success).toBe(false);
    expect(parsed.error?.issues[0]?.message).toBe(
      "poolId must be a positive whole number written in digits (like 12)",
    );
  });
});

describe("dates must exist on the calendar", () => {
  it.each(["2024-02-29", "2023-12-31", "2000-02-29", "2026-01-01"])(
    "accepts %s",
    (text) => {
      expect(isCalendarDay(text)).toBe(true);
    },
  );
  it.each([
    "2024-02-30",
    "2023-02-29",
    "1900-02-29",
    "2024-04-31",
    "2024-13-01",
    "2024-00-10",
    "2024-01-00",
    "2024-1-1",
    "20240101",
    "2024-01-01T00:00",
  ])("refuses %s", (text) => {
    expect(isCalendarDay(text)).toBe(false);
  });
});
