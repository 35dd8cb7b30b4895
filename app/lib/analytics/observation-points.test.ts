import { describe, expect, it } from "vitest";
import type { PoolProfile } from "@analysis/metals/route-book";
import { groupObservations } from "@analysis/stats/groups";
import { observationInstants } from "./observation-points";

const day = (iso: string) => Date.parse(`${iso}T00:00:00Z`);

const pool: PoolProfile = {
  poolId: "p1",
  equipment: [{ id: "h1", kind: "heater", exchangerMetal: "copper", installedAt: day("2014-06-01"), removedAt: day("2025-03-01") }],
};

describe("observation instants", () => {
  it("are the first and last test only for keys that do not change with equipment", () => {
    expect(observationInstants(pool, day("2023-01-01"), day("2025-12-31"), "fill-source")).toEqual([day("2023-01-01"), day("2025-12-31")]);
  });

  it("add the age-bucket birthday and the removal inside the span", () => {
    // Installed 2014-06-01: 10th birthday 2024-06-01 (10-14 bucket), removed 2025-03-01; 5th and 15th fall outside.
    expect(observationInstants(pool, day("2023-01-01"), day("2025-12-31"), "heater-age")).toEqual([
      day("2023-01-01"),
      day("2024-06-01"),
      day("2025-03-01"),
      day("2025-12-31"),
    ]);
  });

  it("credit each bucket with exactly the time spent in it", () => {
    const tests = observationInstants(pool, day("2023-01-01"), day("2025-12-31"), "heater-age").map((takenAt) => ({ poolId: "p1", takenAt }));
    const cells = groupObservations([pool], tests, [], "heater-age");
    const years = Object.fromEntries(cells.map((c) => [c.group, c.years]));
    // 5-9: 2023-01-01 .. 2024-06-01 = 517 days; 10-14: 2024-06-01 .. 2025-03-01 = 273 days;
    // none: 2025-03-01 .. 2025-12-31 = 305 days; each over 365.25 days a year.
    expect(years["5-9"]).toBeCloseTo(517 / 365.25, 10);
    expect(years["10-14"]).toBeCloseTo(273 / 365.25, 10);
    expect(years["none"]).toBeCloseTo(305 / 365.25, 10);
  });
});
