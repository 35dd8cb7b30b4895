import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { DEFAULT_HEATER_AGE_EDGES, HEATING_KINDS, type PoolProfile } from "@analysis/metals/route-book";
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

  it("are every install, removal and age birthday strictly inside the span, once each and in order, for any equipment", () => {
    // The definition, written with Dates and a set.
    const expected = (p: PoolProfile, firstAt: number, lastAt: number, key: "heater-age" | "exchanger-metal") => {
      const instants = new Set<number>([firstAt, lastAt]);
      for (const item of p.equipment ?? []) {
        if (!HEATING_KINDS.includes(item.kind)) continue;
        const changes: number[] = [];
        if (item.installedAt !== null) changes.push(item.installedAt);
        if (item.removedAt !== null && item.removedAt !== undefined) changes.push(item.removedAt);
        if (key === "heater-age" && item.installedAt !== null) {
          const installed = new Date(item.installedAt);
          for (const years of DEFAULT_HEATER_AGE_EDGES)
            changes.push(Date.UTC(installed.getUTCFullYear() + years, installed.getUTCMonth(), installed.getUTCDate()));
        }
        for (const at of changes) if (at > firstAt && at < lastAt) instants.add(at);
      }
      return [...instants].sort((a, b) => a - b);
    };
    const DAY = 86_400_000;
    const T0 = Date.UTC(2008, 1, 29); // a leap day: its birthdays fall on 1 March in other years
    const item = fc.record({
      kind: fc.constantFrom("heater", "heat-pump", "pump") as fc.Arbitrary<"heater" | "heat-pump" | "pump">,
      installed: fc.option(fc.integer({ min: -3000, max: 6000 })),
      removedAfter: fc.option(fc.nat(6000)),
    });
    fc.assert(
      fc.property(
        fc.array(item, { maxLength: 4 }),
        fc.integer({ min: 0, max: 7000 }),
        fc.nat(3000),
        fc.constantFrom("heater-age", "exchanger-metal") as fc.Arbitrary<"heater-age" | "exchanger-metal">,
        (items, first, length, key) => {
          const p: PoolProfile = {
            poolId: "p",
            equipment: items.map((e, i) => ({
              id: `e${i}`,
              kind: e.kind,
              installedAt: e.installed === null ? null : T0 + e.installed * DAY,
              removedAt: e.removedAfter === null ? null : T0 + ((e.installed ?? 0) + e.removedAfter) * DAY,
            })),
          };
          const firstAt = T0 + first * DAY;
          const lastAt = firstAt + length * DAY;
          expect(observationInstants(p, firstAt, lastAt, key)).toEqual(expected(p, firstAt, lastAt, key));
        },
      ),
      { numRuns: 3000 },
    );
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
