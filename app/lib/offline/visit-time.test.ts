import { describe, expect, it } from "vitest";
import { visitTime } from "./visit-time";

const now = new Date("2026-12-02T14:00:00.000Z");

describe("the time a kept visit is stored at", () => {
  it("is the moment it was saved on the phone, when that lies in the last 30 days", () => {
    expect(visitTime("2026-12-02T11:15:30.250Z", now).toISOString()).toBe("2026-12-02T11:15:30.250Z");
    // 2026-11-02T14:00Z is exactly 30 days before now: still accepted.
    expect(visitTime("2026-11-02T14:00:00.000Z", now).toISOString()).toBe("2026-11-02T14:00:00.000Z");
  });

  it("is now when the visit is older than 30 days, ahead of the clock, or not a UTC timestamp", () => {
    expect(visitTime("2026-11-02T13:59:59.999Z", now)).toBe(now);
    expect(visitTime("2026-12-02T14:06:00.000Z", now)).toBe(now);
    expect(visitTime("2026-12-02T12:00:00+02:00", now)).toBe(now);
    expect(visitTime("yesterday", now)).toBe(now);
    expect(visitTime(undefined, now)).toBe(now);
  });

  it("counts a phone clock a few minutes ahead as now", () => {
    expect(visitTime("2026-12-02T14:04:00.000Z", now)).toBe(now);
  });
});
