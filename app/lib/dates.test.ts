import { describe, expect, it } from "vitest";
import { ageBetween, todayIn } from "./dates";

describe("todayIn", () => {
  it("takes the calendar date of the company's time zone, not the server's", () => {
    // 03:30 UTC on 2 March is still 1 March in New York (UTC-5 in winter).
    expect(todayIn("America/New_York", new Date("2026-03-02T03:30:00Z"))).toBe("2026-03-01");
    expect(todayIn("UTC", new Date("2026-03-02T03:30:00Z"))).toBe("2026-03-02");
  });
});

describe("ageBetween", () => {
  it("counts whole months and years", () => {
    // 2014-05-10 to 2026-08-09: 12 years 2 months (the 10th is not yet reached in August).
    expect(ageBetween("2014-05-10", "2026-08-09")).toBe("12 y 2 m");
    expect(ageBetween("2026-01-01", "2026-04-01")).toBe("3 m");
    expect(ageBetween("2026-04-02", "2026-04-01")).toBe("—");
  });
});
