import { randomUUID } from "node:crypto";
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { and, eq } from "drizzle-orm";
import { DEFAULT_METAL_THRESHOLDS } from "@analysis/metals/reading";
import { verifyKeptResults } from "~/.server/analytics/kept/verify";
import { routeBookSummary } from "~/.server/analytics/queries/route-book-summary";
import { groupFigures } from "~/.server/analytics/queries/group-figures";
import { metalTrend } from "~/.server/analytics/queries/metal-trend";
import { recurringPools } from "~/.server/analytics/queries/recurring-pools";
import { sharedSourceAlertList } from "~/.server/analytics/queries/shared-source-alerts";
import { ALL_TIME } from "~/.server/analytics/queries/tenant-and-window";
import { db } from "~/.server/db/client";
import { serverEnv } from "~/.server/env";
import { companies, importBatches, keptVersions, pools } from "~/.server/db/schema";
import { undoBatch } from "~/.server/imports/commit";
import { updateCompanySettings } from "~/.server/settings/commands/update-company-settings";
import { logVisit } from "~/.server/visits/commands/save-visit";
import type { Scope } from "~/.server/scope";
import type { VisitInput } from "~/lib/forms/visit";
import { createFillSource } from "../fixtures/company";
import { analystWithPools, postCheckForm, upload } from "./imports-helpers";
import { keptReady } from "../fixtures/kept";

const DAY = 86_400_000;
const T0 = Date.UTC(2024, 2, 1, 12);
const POOLS = 3;

/** Levels a settings change may choose: the defaults, and stricter or looser ones. */
const LEVEL_CHOICES = [
  DEFAULT_METAL_THRESHOLDS,
  { copper: { elevated: 0.2, clear: 0.1 }, iron: { elevated: 0.15, clear: 0.05 }, manganese: { elevated: 0.05, clear: 0.02 } },
  { copper: { elevated: 0.6, clear: 0.3 }, iron: { elevated: 0.5, clear: 0.2 }, manganese: { elevated: 0.2, clear: 0.1 } },
] as const;

const metalValue = fc.option(fc.constantFrom(0.05, 0.1, 0.2, 0.3, 0.5, 0.9), { nil: undefined, freq: 2 });

type Step =
  | { kind: "visit"; pool: number; day: number; hour?: number; copper?: number; iron?: number; manganese?: number }
  | { kind: "import"; rows: Array<{ pool: number; day: number; copper?: number; iron?: number }> }
  | { kind: "undo" }
  | { kind: "levels"; choice: number; timeZone: string };

const step: fc.Arbitrary<Step> = fc.oneof(
  {
    weight: 4,
    arbitrary: fc.record({
      kind: fc.constant("visit" as const),
      pool: fc.nat(POOLS - 1),
      day: fc.nat(400),
      // Any hour of the day, so visits fall on both sides of a local midnight and of a month's end.
      hour: fc.nat(23),
      copper: metalValue,
      iron: metalValue,
      manganese: metalValue,
    }),
  },
  {
    weight: 2,
    arbitrary: fc.record({
      kind: fc.constant("import" as const),
      rows: fc.array(fc.record({ pool: fc.nat(POOLS - 1), day: fc.nat(400), copper: metalValue, iron: metalValue }), { minLength: 1, maxLength: 12 }),
    }),
  },
  { weight: 1, arbitrary: fc.constant({ kind: "undo" as const }) },
  {
    weight: 1,
    arbitrary: fc.record({
      kind: fc.constant("levels" as const),
      choice: fc.nat(LEVEL_CHOICES.length - 1),
      timeZone: fc.constantFrom("UTC", "America/New_York", "Asia/Kolkata"),
    }),
  },
);

const reading = (value: number | undefined) => (value === undefined ? undefined : { value, belowDetection: false });

function visitInput(s: Extract<Step, { kind: "visit" }>): VisitInput {
  return {
    submissionKey: randomUUID(),
    readings: { ph: 7.4, copper: reading(s.copper), iron: reading(s.iron), manganese: reading(s.manganese) },
    hardnessEndpoint: null,
    stain: null,
    stainColour: null,
    padTint: null,
    note: null,
    treatments: [],
  };
}

function importFile(prefix: string, rows: Extract<Step, { kind: "import" }>["rows"]): Uint8Array<ArrayBuffer> {
  const lines = ["Account,Date,pH,Cu,Fe"];
  // A minute apart within the file, so no two rows of one pool fall on one instant.
  rows.forEach((r, i) => {
    const at = new Date(T0 + r.day * DAY + i * 60_000).toISOString().slice(0, 16).replace("T", " ");
    lines.push(`${prefix}-${r.pool},${at},7.5,${r.copper ?? ""},${r.iron ?? ""}`);
  });
  return new TextEncoder().encode(lines.join("\n"));
}


describe("kept analytics stay equal to a recomputation from the tests", () => {
  it("after every step of random visits, imports, undos and changes of levels", async () => {
    let run = 0;
    await fc.assert(
      fc.asyncProperty(fc.array(step, { minLength: 1, maxLength: 7 }), async (steps) => {
        const prefix = `K${run++}`;
        const { member, scope } = await analystWithPools(prefix, POOLS);
        const owner: Scope = { ...scope, role: "owner" };
        const poolIds = await poolIdsOf(scope.companyId);
        await keptReady(scope.companyId);
        let visitsAt = 0;
        for (const s of steps) {
          if (s.kind === "visit") {
            // Each visit a little later than the last, as the day's work goes.
            const at = T0 + s.day * DAY + ((s.hour ?? 12) - 12) * 3_600_000 + ++visitsAt * 1000;
            const saved = await logVisit(scope, poolIds[s.pool]!, visitInput(s), new Date(at));
            expect(saved.ok).toBe(true);
          } else if (s.kind === "import") {
            const sent = await upload(member, `${prefix}.csv`, importFile(prefix, s.rows));
            expect(sent.status).toBe(201);
            const uploadId = (sent.body as { uploadId: string }).uploadId;
            // A file of rows already stored has nothing to import and is refused; anything else is stored whole.
            const committed = await postCheckForm(member, uploadId, "commit");
            expect([302, 422]).toContain(committed.status);
          } else if (s.kind === "undo") {
            const [last] = await db()
              .select({ id: importBatches.id, status: importBatches.status })
              .from(importBatches)
              .where(eq(importBatches.companyId, scope.companyId))
              .orderBy(importBatches.id);
            if (last?.status === "committed") expect((await undoBatch(scope, last.id)).ok).toBe(true);
          } else {
            const levels = LEVEL_CHOICES[s.choice]!;
            const saved = await updateCompanySettings(owner, {
              copperElevated: levels.copper.elevated,
              copperClear: levels.copper.clear,
              ironElevated: levels.iron.elevated,
              ironClear: levels.iron.clear,
              manganeseElevated: levels.manganese.elevated,
              manganeseClear: levels.manganese.clear,
              balanceLow: -0.3,
              balanceHigh: 0.3,
              unitSystem: "us",
              timeZone: s.timeZone,
            });
            expect(saved.ok).toBe(true);
            await keptReady(scope.companyId);
            const [version] = await db()
              .select({ timeZone: keptVersions.timeZone })
              .from(keptVersions)
              .where(and(eq(keptVersions.companyId, scope.companyId), eq(keptVersions.state, "ready")));
            expect(version?.timeZone).toBe(s.timeZone);
          }
          const check = await verifyKeptResults(scope.companyId);
          expect(check.versionId).not.toBeNull();
          expect(check.differences).toEqual([]);
        }
      }),
      { numRuns: 8 },
    );
  }, 300_000);
});

async function poolIdsOf(companyId: number): Promise<number[]> {
  const [rows] = (await db().execute(`SELECT id FROM pools WHERE company_id = ${companyId} ORDER BY account_code`)) as unknown as [
    Array<{ id: number }>,
  ];
  return rows.map((r) => r.id);
}

describe("answers from kept results", () => {
  it("are the answers worked out from the tests, and say where they came from", async () => {
    const { scope } = await analystWithPools("KA", POOLS);
    const owner: Scope = { ...scope, role: "owner" };
    const poolIds = await poolIdsOf(scope.companyId);
    const well = await createFillSource(scope.companyId, "Test well", "shared_well");
    await db().update(pools).set({ fillSourceId: well }).where(eq(pools.companyId, scope.companyId));
    // pool 0: iron opens twice within a year (recurring); pool 1: copper stays up for 90 days (chronic); pool 2: clear
    const series: Array<[pool: number, day: number, values: Partial<Record<"copper" | "iron", number>>]> = [
      [0, 0, { iron: 0.5 }],
      [0, 14, { iron: 0.05 }],
      [0, 100, { iron: 0.6 }],
      [0, 120, { iron: 0.05 }],
      [1, 0, { copper: 0.9 }],
      [1, 45, { copper: 0.6 }],
      [1, 90, { copper: 0.5 }],
      [2, 0, { iron: 0.05, copper: 0.05 }],
      [2, 30, { iron: 0.05 }],
    ];
    let n = 0;
    for (const [pool, day, values] of series) {
      const saved = await logVisit(scope, poolIds[pool]!, visitInput({ kind: "visit", pool, day, ...values }), new Date(T0 + day * DAY + ++n));
      expect(saved.ok).toBe(true);
    }
    await keptReady(scope.companyId);
    const params = { window: ALL_TIME, thresholds: DEFAULT_METAL_THRESHOLDS, metal: null, balanceBand: { low: -0.3, high: 0.3 } };
    const kept = await routeBookSummary(owner, params);
    const keptGroups = await groupFigures(owner, { ...params, metal: "iron", grouping: "route" });
    const keptRecurring = await recurringPools(owner, { ...params, metal: null });
    const keptAlerts = await sharedSourceAlertList(owner, { ...params, metal: "iron" });
    const keptTrend = await metalTrend(owner, ALL_TIME, null, DEFAULT_METAL_THRESHOLDS);
    expect(kept.source).toBe("kept");
    expect(keptTrend.source).toBe("kept");
    // March 2024 holds four iron readings: 0.5 and 0.05 on pool 0 (days 0 and 14), 0.05 twice on pool 2 (days 0 and 30).
    expect(keptTrend.months.find((m) => m.metal === "iron" && m.month === "2024-03")).toMatchObject({
      readings: 4,
      elevated: 1,
      poolsElevated: 1,
      max: 0.5,
    });
    expect(kept.recurringPools).toBe(1);
    expect(kept.chronicPools).toBe(1);
    expect(kept.openEpisodes).toEqual({ copper: 1, iron: 0, manganese: 0 });

    // With no kept version, the same questions are worked out from the tests. Keeping is off meanwhile: the first
    // answer would otherwise start a build in the background, and a later one could already find it ready.
    await db().delete(keptVersions).where(eq(keptVersions.companyId, scope.companyId));
    serverEnv().PATINA_KEPT_ANALYTICS = "off";
    const recomputed = await routeBookSummary(owner, params);
    const recomputedGroups = await groupFigures(owner, { ...params, metal: "iron", grouping: "route" });
    const recomputedRecurring = await recurringPools(owner, { ...params, metal: null });
    const recomputedAlerts = await sharedSourceAlertList(owner, { ...params, metal: "iron" });
    const recomputedTrend = await metalTrend(owner, ALL_TIME, null, DEFAULT_METAL_THRESHOLDS);
    serverEnv().PATINA_KEPT_ANALYTICS = "on";
    expect(recomputedTrend.source).toBe("recomputed");
    expect({ ...keptTrend, source: null }).toEqual({ ...recomputedTrend, source: null });
    expect(recomputed.source).toBe("recomputed");
    expect({ ...kept, source: null }).toEqual({ ...recomputed, source: null });
    expect(keptGroups.source).toBe("kept");
    expect({ ...keptGroups, source: null }).toEqual({ ...recomputedGroups, source: null });
    expect([keptRecurring.source, keptAlerts.source]).toEqual(["kept", "kept"]);
    expect(keptRecurring.pools.map((p) => p.poolId)).toEqual([poolIds[0], poolIds[1]]);
    expect({ ...keptRecurring, source: null }).toEqual({ ...recomputedRecurring, source: null });
    expect(keptAlerts.sourcesWatched).toBe(1);
    expect({ ...keptAlerts, source: null }).toEqual({ ...recomputedAlerts, source: null });
    await keptReady(scope.companyId);
    await db().delete(companies).where(eq(companies.id, scope.companyId));
  });
});
