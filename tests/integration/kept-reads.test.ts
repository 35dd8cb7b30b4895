import { randomUUID } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq, inArray } from "drizzle-orm";
import { DEFAULT_METAL_THRESHOLDS, type MetalReading } from "@analysis/metals/reading";
import { keptEpisodeList, keptMetalStates, keptSpans, keptVersionAsOf, keptVersionFor } from "~/.server/analytics/kept/read-kept";
import { verifyKeptResults } from "~/.server/analytics/kept/verify";
import { poolEvidence, poolMetalPanel } from "~/.server/analytics/queries/pool-evidence";
import { poolSeries } from "~/.server/analytics/queries/pool-series";
import { routeBookSummary } from "~/.server/analytics/queries/route-book-summary";
import { sharedSourceAlertList } from "~/.server/analytics/queries/shared-source-alerts";
import { sourceHealth } from "~/.server/analytics/queries/source-health";
import { ALL_TIME } from "~/.server/analytics/queries/tenant-and-window";
import { db } from "~/.server/db/client";
import { keepPoolsInStep, lockPoolsForKeeping } from "~/.server/analytics/kept/keep-pools";
import { alertEvents, companies, importBatches, mailOutbox, pools, products, treatments } from "~/.server/db/schema";
import { serverEnv } from "~/.server/env";
import { undoBatch } from "~/.server/imports/commit";
import { afterWaterTestsSaved, recordAlertsForPool } from "~/.server/mail/alerts";
import { weeklyDigestFor } from "~/.server/mail/digest";
import { logVisit } from "~/.server/visits/commands/save-visit";
import type { Scope } from "~/.server/scope";
import type { VisitReadings } from "~/lib/forms/visit";
import type { SeriesAnalyte } from "~/lib/analytics/params";
import * as evidenceApi from "~/routes/api.analytics.pools.$poolId.evidence";
import * as seriesApi from "~/routes/api.analytics.pools.$poolId.series";
import * as sourcesApi from "~/routes/api.analytics.sources";
import { createFillSource, createRoute, requestAs, type FixtureMember } from "../fixtures/company";
import { keptReady } from "../fixtures/kept";
import { callRoute } from "../fixtures/route-call";
import { analystWithPools, postCheckForm, upload } from "./imports-helpers";
import { visitForm } from "../fixtures/visit-input";

// Default levels, common practice of the trade (no published source): iron
// elevated >= 0.2, clear < 0.1; copper 0.3 / 0.1; manganese 0.05 / 0.02.
//
// Four pools on one shared well, days after T0 (visits unless marked):
//   pool 0  d0 Fe 0.50 (opens) Cu <0.05 | d10 Fe 0.15 (between the levels) | d20 Fe <0.2 ("<x" above clear: unknown)
//           d30 Fe 0.05 (closes) | d200 Fe 0.40 (opens again, a recurrence)
//           d210 two tests at one instant: Fe 0.05 then Fe 0.30 (closes it, and the later one, by id, opens iron again),
//                each with every balance input: scale-forming, then corrosive
//   pool 1  d5 Cu 0.90 Mn 0.03 | d50 Cu 0.60 | d100 Cu 0.50 + balance inputs (chronic, open)
//           an import of d120 Cu 0.05 is undone, so copper stays open
//   pool 2  d8 Fe 0.25 (opens) | d40 Fe 0.05 (closes) | d203 Fe 0.30 (opens again) | d207 Fe 0.15 after a sequestrant on d204
//   pool 3  d1 pH only | imported: d2 Cu 0.35, d206 Fe 0.30
// Pools 0, 2 and 3 open iron within 21 days from d200: a shared-source wave.
const DAY = 86_400_000;
const T0 = Date.UTC(2025, 0, 6, 10);
const POOLS = 4;
const BALANCE_BAND = { low: -0.3, high: 0.3 };
const params = { window: ALL_TIME, thresholds: DEFAULT_METAL_THRESHOLDS, metal: null, balanceBand: BALANCE_BAND };
const ANALYTES: SeriesAnalyte[] = ["copper", "iron", "manganese", "ph", "saturationIndex"];
// The digest's moment: after the last test, so kept rows answer as of it.
const DIGEST_AT = new Date(T0 + 212 * DAY);

const mgL = (value: number, belowDetection = false): MetalReading => ({ value, belowDetection });

let scope: Scope;
let owner: Scope;
let member: FixtureMember;
let poolIds: number[] = [];
let streets: string[] = [];
let visits = 0;

async function visit(pool: number, at: number, readings: VisitReadings) {
  const saved = await logVisit(
    scope,
    poolIds[pool]!,
    visitForm(readings),
    new Date(at),
  );
  expect(saved.ok).toBe(true);
  visits++;
}

async function importRows(prefix: string, rows: Array<[pool: number, day: number, copper: string, iron: string]>): Promise<number> {
  const lines = ["Account,Date,pH,Cu,Fe", ...rows.map(([pool, day, cu, fe]) => `${prefix}-${pool},${new Date(T0 + day * DAY).toISOString().slice(0, 16).replace("T", " ")},7.5,${cu},${fe}`)];
  const sent = await upload(member, `${prefix}-${randomUUID().slice(0, 6)}.csv`, new TextEncoder().encode(lines.join("\n")));
  expect(sent.status).toBe(201);
  const committed = await postCheckForm(member, (sent.body as { uploadId: string }).uploadId, "commit");
  expect(committed.status).toBe(302);
  const batches = await db().select({ id: importBatches.id }).from(importBatches).where(eq(importBatches.companyId, scope.companyId));
  return Math.max(...batches.map((b) => b.id));
}


/** The same question answered with kept analytics turned off: worked out from the tests. */
async function recomputed<T>(answer: () => Promise<T>): Promise<T> {
  serverEnv().PATINA_KEPT_ANALYTICS = "off";
  try {
    return await answer();
  } finally {
    serverEnv().PATINA_KEPT_ANALYTICS = "on";
  }
}

const withoutSource = <T extends { source?: unknown }>(answer: T | null) => (answer === null ? null : { ...answer, source: null });

beforeAll(async () => {
  const prefix = `KR${Date.now().toString(36)}`;
  ({ member, scope } = await analystWithPools(prefix, POOLS));
  owner = { ...scope, role: "owner" };
  const [rows] = (await db().execute(`SELECT id, street FROM pools WHERE company_id = ${scope.companyId} ORDER BY account_code`)) as unknown as [
    Array<{ id: number; street: string }>,
  ];
  poolIds = rows.map((r) => r.id);
  streets = rows.map((r) => r.street);
  const well = await createFillSource(scope.companyId, "Ridge shared well", "shared_well");
  await db().update(pools).set({ fillSourceId: well }).where(eq(pools.companyId, scope.companyId));
  // Kept rows exist from the start, so every write below keeps them in step.
  await keptReady(scope.companyId);

  const at = (day: number) => T0 + day * DAY + visits * 1000;
  await visit(0, at(0), { iron: mgL(0.5), copper: mgL(0.05, true), ph: 7.4 });
  await visit(0, at(10), { iron: mgL(0.15) });
  await visit(0, at(20), { iron: mgL(0.2, true) });
  await visit(0, at(30), { iron: mgL(0.05) });
  await visit(0, at(200), { iron: mgL(0.4) });
  const sameInstant = T0 + 210 * DAY;
  // Both with every balance input: the later one (corrosive) is the pool's latest balance test, counted once.
  await visit(0, sameInstant, { iron: mgL(0.05), ph: 8.0, temperatureC: 28.9, calciumHardness: 400, totalAlkalinity: 150 });
  await visit(0, sameInstant, { iron: mgL(0.3), ph: 7.8, temperatureC: 20, calciumHardness: 140, totalAlkalinity: 20 });

  await visit(1, at(5), { copper: mgL(0.9), manganese: mgL(0.03) });
  await visit(1, at(50), { copper: mgL(0.6) });
  await visit(1, at(100), { copper: mgL(0.5), ph: 7.8, temperatureC: 20, calciumHardness: 140, totalAlkalinity: 20 });

  await visit(2, at(8), { iron: mgL(0.25) });
  await visit(2, at(40), { iron: mgL(0.05) });
  await visit(2, at(203), { iron: mgL(0.3), ph: 7.5, temperatureC: 28.9, calciumHardness: 300, totalAlkalinity: 100 });
  await visit(2, at(207), { iron: mgL(0.15), ph: 7.4 });
  const [product] = await db().insert(products).values({ companyId: scope.companyId, name: "Sequestrant S", category: "sequestrant", unitCost: 0.5 }).$returningId();
  // A treatment written as the app writes one: the pool's kept rows (its courses among them) kept in step.
  await db().transaction(async (tx) => {
    await lockPoolsForKeeping(tx, [poolIds[2]!]);
    await tx
      .insert(treatments)
      .values({ companyId: scope.companyId, poolId: poolIds[2]!, productId: product!.id, appliedAt: new Date(T0 + 204 * DAY), amount: 20, unit: "fl oz", cost: 10 });
    await keepPoolsInStep(tx, scope.companyId, [poolIds[2]!]);
  });

  await visit(3, at(1), { ph: 7.6 });
  await importRows(prefix, [
    [3, 2, "0.35", ""],
    [3, 206, "", "0.3"],
  ]);
  const undone = await importRows(prefix, [[1, 120, "0.05", ""]]);
  expect((await undoBatch(scope, undone)).ok).toBe(true);

  const check = await verifyKeptResults(scope.companyId);
  expect(check.differences).toEqual([]);
}, 120_000);

afterAll(async () => {
  if (scope) await db().delete(companies).where(eq(companies.id, scope.companyId));
});

describe("source health from kept rows", () => {
  it("equals the answer worked out from every reading and says it is kept", async () => {
    const kept = await sourceHealth(owner, params);
    const fromTests = await recomputed(() => sourceHealth(owner, params));
    expect(kept.source).toBe("kept");
    expect(fromTests.source).toBe("recomputed");
    expect(withoutSource(kept)).toEqual(withoutSource(fromTests));

    const [well] = kept.sources;
    const stateOf = (pool: number) => well!.pools.find((p) => p.poolId === poolIds[pool])!.metals;
    // Two tests at one instant: the later by id (elevated) counts, as for the episodes.
    expect(stateOf(0).iron).toEqual({ state: "open", lastTestedAt: new Date(T0 + 210 * DAY).toISOString() });
    expect(stateOf(0).copper.state).toBe("clear"); // "<0.05" is below the clear level
    expect(stateOf(0).manganese.state).toBe("not-tested");
    expect(stateOf(1).copper.state).toBe("open"); // the undone import's clear reading is gone
    expect(stateOf(1).manganese.state).toBe("clear"); // between the levels, never elevated
    expect(stateOf(2).iron.state).toBe("open");
    expect(stateOf(3)).toMatchObject({ iron: { state: "open" }, copper: { state: "open" }, manganese: { state: "not-tested" } });
    expect(well!.flagged).toBe(true);
    expect(well!.alerts.map((a) => a.metal)).toContain("iron");
  });

  it("for each metal asked for", async () => {
    for (const metal of ["copper", "iron", "manganese"] as const) {
      const kept = await sourceHealth(owner, { ...params, metal });
      expect(kept.source).toBe("kept");
      expect(withoutSource(kept)).toEqual(withoutSource(await recomputed(() => sourceHealth(owner, { ...params, metal }))));
    }
  });

  it("is worked out from the tests for a window, and /api/analytics/sources carries the source", async () => {
    const window = { from: new Date(T0), to: new Date(T0 + 100 * DAY) };
    expect((await sourceHealth(owner, { ...params, window })).source).toBe("recomputed");
    const api = await callRoute(sourcesApi.loader, requestAs(member, "/api/analytics/sources"), {});
    expect(api.status).toBe(200);
    expect((api.body as { source: string }).source).toBe("kept");
    const windowed = await callRoute(sourcesApi.loader, requestAs(member, "/api/analytics/sources?from=2025-01-06&to=2025-04-01"), {});
    expect((windowed.body as { source: string }).source).toBe("recomputed");
  });

  it("alerts from kept rows equal the recomputed ones", async () => {
    const kept = await sharedSourceAlertList(owner, params);
    expect(kept.source).toBe("kept");
    expect(kept.alerts.length).toBeGreaterThan(0);
    expect(withoutSource(kept)).toEqual(withoutSource(await recomputed(() => sharedSourceAlertList(owner, params))));
  });
});

describe("pool series and evidence from kept episodes", () => {
  it("every analyte of every pool equals the recomputed series", async () => {
    for (const [i, poolId] of poolIds.entries()) {
      for (const analyte of ANALYTES) {
        const kept = await poolSeries(owner, poolId, analyte, params);
        const fromTests = await recomputed(() => poolSeries(owner, poolId, analyte, params));
        expect([i, analyte, kept?.source]).toEqual([i, analyte, "kept"]);
        expect(fromTests?.source).toBe("recomputed");
        expect(withoutSource(kept)).toEqual(withoutSource(fromTests));
      }
    }
    const iron = await poolSeries(owner, poolIds[0]!, "iron", params);
    expect(iron!.episodes.map((e) => [e.openedAt, e.censored, e.recurrence])).toEqual([
      [new Date(T0).toISOString(), false, false],
      // Closed by the clear test at d210 and opened again by the elevated one at the same instant.
      [new Date(T0 + 200 * DAY + 4000).toISOString(), false, true],
      [new Date(T0 + 210 * DAY).toISOString(), true, true],
    ]);
  });

  it("every pool's evidence and metal panel equal the recomputed ones", async () => {
    for (const poolId of poolIds) {
      const kept = await poolEvidence(owner, poolId, params);
      expect(kept?.source).toBe("kept");
      expect(withoutSource(kept)).toEqual(withoutSource(await recomputed(() => poolEvidence(owner, poolId, params))));
      const panel = await poolMetalPanel(owner, poolId);
      expect(panel?.source).toBe("kept");
      expect(withoutSource(panel)).toEqual(withoutSource(await recomputed(() => poolMetalPanel(owner, poolId))));
    }
    const evidence = await poolEvidence(owner, poolIds[2]!, params);
    expect(evidence!.openEpisodes).toBe(1);
    expect(evidence!.episodes[0]!.evidence.map((e) => e.kind)).toContain("shared-source-alert");
  });

  it("the API answers carry the source, and a window is worked out from the tests", async () => {
    const poolId = String(poolIds[1]);
    const series = await callRoute(seriesApi.loader, requestAs(member, `/api/analytics/pools/${poolId}/series?analyte=copper`), { poolId });
    expect(series.status).toBe(200);
    expect((series.body as { source: string }).source).toBe("kept");
    const windowed = await callRoute(seriesApi.loader, requestAs(member, `/api/analytics/pools/${poolId}/series?analyte=copper&from=2025-01-06&to=2025-03-01`), {
      poolId,
    });
    expect((windowed.body as { source: string }).source).toBe("recomputed");
    const evidence = await callRoute(evidenceApi.loader, requestAs(member, `/api/analytics/pools/${poolId}/evidence`), { poolId });
    expect(evidence.status).toBe(200);
    expect((evidence.body as { source: string }).source).toBe("kept");
  });
});

describe("mail from kept rows", () => {
  it("the weekly digest equals the recomputed one, and a digest for a moment before the last test is recomputed", async () => {
    const kept = await weeklyDigestFor(scope.companyId, DIGEST_AT);
    const fromTests = await recomputed(() => weeklyDigestFor(scope.companyId, DIGEST_AT));
    expect(kept?.source).toBe("kept");
    expect(fromTests?.source).toBe("recomputed");
    expect(withoutSource(kept)).toEqual(withoutSource(fromTests));
    expect(kept!.openCases.map((c) => [streets.indexOf(c.pool.street), c.metal])).toEqual([
      [3, "copper"],
      [1, "copper"],
      [2, "iron"],
      [3, "iron"],
      [0, "iron"],
    ]);

    expect(kept!.treatmentResults.map((r) => [r.treatment, r.metal])).toEqual([["Sequestrant S", "iron"]]);

    // Tests after the moment exist: kept rows cover them, so the digest is worked out from the tests up to it.
    const earlier = new Date(T0 + 100 * DAY + 60_000);
    const asOfEarlier = await weeklyDigestFor(scope.companyId, earlier);
    expect(asOfEarlier?.source).toBe("recomputed");
    expect(asOfEarlier!.openCases.map((c) => c.metal)).toEqual(["copper", "copper"]);
  });

  it("the shared-source alert mail records the same events from kept rows as from the tests", async () => {
    const eventsOf = async () =>
      (await db().select().from(alertEvents).where(eq(alertEvents.companyId, scope.companyId)))
        .map((e) => ({ kind: e.kind, dedupeKey: e.dedupeKey, details: e.details, occurredAt: e.occurredAt.getTime() }))
        .sort((a, b) => a.dedupeKey.localeCompare(b.dedupeKey));
    const forget = async () => {
      await db().delete(mailOutbox).where(eq(mailOutbox.companyId, scope.companyId));
      await db().delete(alertEvents).where(eq(alertEvents.companyId, scope.companyId));
    };
    // The source's pools have no test after the moment, so their kept episodes answer as of it; an earlier moment they do not.
    expect(await keptVersionAsOf(scope.companyId, DEFAULT_METAL_THRESHOLDS, DIGEST_AT, poolIds)).not.toBeNull();
    expect(await keptVersionAsOf(scope.companyId, DEFAULT_METAL_THRESHOLDS, new Date(T0 + 209 * DAY), poolIds)).toBeNull();
    await forget();
    const kept = await recordAlertsForPool(scope.companyId, poolIds[3]!, { now: DIGEST_AT });
    const keptEvents = await eventsOf();
    await forget();
    const fromTests = await recomputed(() => recordAlertsForPool(scope.companyId, poolIds[3]!, { now: DIGEST_AT }));
    expect(keptEvents.map((e) => e.kind)).toContain("shared_source");
    expect(await eventsOf()).toEqual(keptEvents);
    expect(fromTests.map((r) => r.dedupeKey).sort()).toEqual(kept.map((r) => r.dedupeKey).sort());
  });

  it("the check after saving tests on several pools records the same events from kept rows as from the tests", async () => {
    const eventsOf = async () =>
      (await db().select().from(alertEvents).where(eq(alertEvents.companyId, scope.companyId)))
        .map((e) => ({ kind: e.kind, dedupeKey: e.dedupeKey, poolId: e.poolId, details: e.details, occurredAt: e.occurredAt.getTime() }))
        .sort((a, b) => a.dedupeKey.localeCompare(b.dedupeKey));
    const forget = async () => {
      await db().delete(mailOutbox).where(eq(mailOutbox.companyId, scope.companyId));
      await db().delete(alertEvents).where(eq(alertEvents.companyId, scope.companyId));
    };
    await forget();
    await afterWaterTestsSaved(scope.companyId, poolIds, { now: DIGEST_AT });
    const keptEvents = await eventsOf();
    await forget();
    await recomputed(() => afterWaterTestsSaved(scope.companyId, poolIds, { now: DIGEST_AT }));
    // Iron opened on pools 0, 2 and 3 within the look-back, and their shared well.
    expect(new Set(keptEvents.filter((e) => e.kind === "episode_opened").map((e) => e.poolId))).toEqual(new Set([poolIds[0], poolIds[2], poolIds[3]]));
    expect(keptEvents.map((e) => e.kind)).toContain("shared_source");
    expect(await eventsOf()).toEqual(keptEvents);
  });
});

describe("the summary from kept rows", () => {
  it("counts each pool's latest balance test once, the last entered of two at one instant, as worked out from the tests", async () => {
    const summary = await routeBookSummary(owner, params);
    expect(summary.source).toBe("kept");
    // Saturation index, 10 NYCRR 6-1.30 factor table (balanced within +/-0.3, common practice):
    // 20 degC (68 degF), CH 140, TA 20, pH 7.8 -> -0.8 corrosive (pool 0's later test at d210, and pool 1);
    // 28.9 degC (84 degF), CH 300, TA 100, pH 7.5 -> +0.2 balanced (pool 2 at d203; d207 has pH only).
    // Pool 3 has pH only. Pool 0's earlier test at d210 (+1.0, scale-forming) is not its latest.
    expect(summary.balance).toMatchObject({
      corrosive: { pools: 2 },
      balanced: { pools: 1 },
      scaleForming: { pools: 0 },
      notComputable: 0,
      poolsWithoutBalanceTest: 1,
    });
    expect(withoutSource(summary)).toEqual(withoutSource(await recomputed(() => routeBookSummary(owner, params))));
  });
});

describe("kept rows read for a technician", () => {
  it("hold only their routes' pools, and those pools' rows in full", async () => {
    const routeId = await createRoute(scope.companyId, "Thursday");
    await db().update(pools).set({ routeId }).where(inArray(pools.id, [poolIds[0]!, poolIds[2]!]));
    const technician: Scope = { ...scope, role: "technician", routeIds: [routeId] };
    const versionId = (await keptVersionFor(scope.companyId, params))!;
    const theirs = new Set([String(poolIds[0]), String(poolIds[2])]);
    const poolsOf = (rows: ReadonlyArray<{ poolId: string | number }>) => [...new Set(rows.map((r) => String(r.poolId)))].sort();

    const episodes = await keptEpisodeList({ scope: technician }, versionId, "all");
    const everyEpisode = await keptEpisodeList({ scope: owner }, versionId, "all");
    expect(poolsOf(everyEpisode).length).toBeGreaterThan(2);
    expect(poolsOf(episodes)).toEqual([...theirs].sort());
    expect(episodes).toEqual(everyEpisode.filter((e) => theirs.has(e.poolId)));

    const spans = await keptSpans({ scope: technician }, versionId, "any");
    expect(poolsOf(spans)).toEqual([...theirs].sort());
    expect(spans).toEqual((await keptSpans({ scope: owner }, versionId, "any")).filter((s) => theirs.has(String(s.poolId))));

    const states = await keptMetalStates({ scope: technician }, versionId);
    expect([...states.keys()].sort()).toEqual([...theirs].sort());
  });

  it("give their summary, balance tests included, as worked out from their pools' tests", async () => {
    // The route of the test above: pools 0 and 2.
    const [pool] = await db().select({ routeId: pools.routeId }).from(pools).where(eq(pools.id, poolIds[0]!));
    const technician: Scope = { ...scope, role: "technician", routeIds: [pool!.routeId!] };
    const summary = await routeBookSummary(technician, params);
    expect(summary.source).toBe("kept");
    expect(summary.counts.poolsTested).toBe(2);
    expect(withoutSource(summary)).toEqual(withoutSource(await recomputed(() => routeBookSummary(technician, params))));
  });
});
