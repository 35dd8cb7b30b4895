import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { desc, eq } from "drizzle-orm";
import { DEFAULT_METAL_THRESHOLDS, METALS, type Metal } from "@analysis/metals/reading";
import type { ArmDimension } from "@analysis/outcomes/summary";
import { keptArmCourses } from "~/.server/analytics/kept/keep-courses";
import { keepCompanyCurrent } from "~/.server/analytics/kept/versions";
import { verifyKeptResults } from "~/.server/analytics/kept/verify";
import { treatmentOutcomes, type TreatmentOutcomes } from "~/.server/analytics/queries/treatment-outcomes";
import { ALL_TIME } from "~/.server/analytics/queries/tenant-and-window";
import { db } from "~/.server/db/client";
import { keepPoolsInStep, lockPoolsForKeeping } from "~/.server/analytics/kept/keep-pools";
import { companies, importBatches, keptTreatmentCourses, pools, treatments, waterTests } from "~/.server/db/schema";
import { undoBatch } from "~/.server/imports/commit";
import { saveProduct } from "~/.server/routebook/commands/products";
import { logVisit } from "~/.server/visits/commands/save-visit";
import type { Scope } from "~/.server/scope";
import type { ProductInput } from "~/lib/forms/routebook";
import * as outcomesApi from "~/routes/api.analytics.outcomes";
import { createMember, createPool, createRoute, requestAs, type FixtureMember } from "../fixtures/company";
import { callRoute } from "../fixtures/route-call";
import { analystWithPools, postCheckForm, upload } from "./imports-helpers";
import { keptReady } from "../fixtures/kept";
import { visitForm } from "../fixtures/visit-input";

const DAY = 86_400_000;
const T0 = Date.UTC(2024, 2, 1, 12);
const ARMS: ArmDimension[] = ["product", "category", "combination", "category-combination"];
/** From the start of time: the same courses as no window, but a window is always worked out from the tests. */
const FROM_EPOCH = { from: new Date(0), to: null };

type Readings = Partial<Record<Metal, number>> & { ph?: number };

const productInput = (name: string, category: ProductInput["category"], unitCost: number | null, doseUnit: string | null): ProductInput => ({
  name,
  category,
  labelDose: null,
  maintenanceDose: null,
  doseUnit,
  doseBasis: "per_10k_gal",
  unitCost,
  active: true,
});


const instantText = (at: number) => new Date(at).toISOString().slice(0, 16).replace("T", " ");

let owner: Scope;
let analyst: FixtureMember;
let manager: FixtureMember;
let poolIds: number[] = [];
let routeId = 0;
const productIds: Record<string, number> = {};
/** Each visit a minute after the one before on its day, so an import row can name its instant. */
const visitTimes: number[] = [];

async function visit(pool: number, day: number, readings: Readings, treated: Array<[product: string, amount: number, unit: string]> = []) {
  const at = T0 + day * DAY + visitTimes.length * 60_000;
  visitTimes.push(at);
  const { ph, ...metals } = readings;
  const input = visitForm(
    { ph, ...Object.fromEntries(Object.entries(metals).map(([metal, value]) => [metal, { value, belowDetection: false }])) },
    { treatments: treated.map(([product, amount, unit]) => ({ productId: productIds[product]!, amount, unit })) },
  );
  const saved = await logVisit(owner, poolIds[pool]!, input, new Date(at));
  expect(saved.ok).toBe(true);
  return at;
}

async function importRows(name: string, lines: string[]): Promise<number> {
  const sent = await upload(analyst, name, new TextEncoder().encode(["Account,Date,pH,Cu,Fe,Product,Amount,Unit", ...lines].join("\n")));
  expect(sent.status).toBe(201);
  const committed = await postCheckForm(analyst, (sent.body as { uploadId: string }).uploadId, "commit");
  expect(committed.status).toBe(302);
  const [batch] = await db()
    .select({ id: importBatches.id })
    .from(importBatches)
    .where(eq(importBatches.companyId, owner.companyId))
    .orderBy(desc(importBatches.id))
    .limit(1);
  return batch!.id;
}

/**
 * Every metal and arm of the outcomes answer, from the kept courses and from
 * the treatments and tests: equal but for the source. Returns the kept answers.
 */
async function keptEqualsRecomputed(scope: Scope): Promise<TreatmentOutcomes[]> {
  const answers: TreatmentOutcomes[] = [];
  for (const metal of METALS) {
    for (const arm of ARMS) {
      const kept = await treatmentOutcomes(scope, { window: ALL_TIME, thresholds: DEFAULT_METAL_THRESHOLDS, metal, arm });
      const recomputed = await treatmentOutcomes(scope, { window: FROM_EPOCH, thresholds: DEFAULT_METAL_THRESHOLDS, metal, arm });
      expect([kept.source, recomputed.source]).toEqual(["kept", "recomputed"]);
      expect({ ...kept, source: null }).toEqual({ ...recomputed, source: null });
      answers.push(kept);
    }
  }
  return answers;
}

async function noDifferences() {
  const check = await verifyKeptResults(owner.companyId);
  expect(check.versionId).not.toBeNull();
  expect(check.differences).toEqual([]);
  return check;
}

const copperCourses = async (scope: Scope = owner) =>
  (await treatmentOutcomes(scope, { window: ALL_TIME, thresholds: DEFAULT_METAL_THRESHOLDS, metal: "copper", arm: "product" })).courses;

beforeAll(async () => {
  const made = await analystWithPools("KO", 4);
  analyst = made.member;
  owner = { ...made.scope, role: "owner" };
  manager = await createMember(owner.companyId, "manager");
  const [rows] = (await db().execute(`SELECT id FROM pools WHERE company_id = ${owner.companyId} ORDER BY account_code`)) as unknown as [Array<{ id: number }>];
  poolIds = rows.map((r) => r.id);
  routeId = await createRoute(owner.companyId, "Tuesday");
  await db().update(pools).set({ routeId }).where(eq(pools.id, poolIds[3]!));
  for (const [name, category, cost, unit] of [
    ["Binder A", "sequestrant", 0.5, "fl oz"],
    ["Pad B", "collector_pad", 25, "each"],
    ["Acid C", "ph_decreaser", null, null],
    ["Stain Lifter", "other", null, null],
  ] as const) {
    const saved = await saveProduct(owner, null, productInput(name, category, cost, unit));
    if (!saved.ok) throw new Error(`product ${name} was refused`);
    productIds[name] = saved.id;
  }
  // Kept from the start, so every write below keeps its pools in step.
  await keptReady(owner.companyId);
});

afterAll(async () => {
  await db().delete(companies).where(eq(companies.id, owner.companyId));
});

describe("treatment outcomes from kept courses", () => {
  it("are the outcomes worked out from the tests after visits with treatments", async () => {
    // Copper levels 0.3 elevated / 0.1 clear (the defaults).
    // KO-0: 0.6 with a binder, a pad the next day (one course); 0.3 on day 5, clear on day 14, up again on day 60;
    //       a second binder course on day 61.
    await visit(0, 0, { copper: 0.6, ph: 7.4 }, [["Binder A", 16, "fl oz"]]);
    await visit(0, 1, { ph: 7.5 }, [["Pad B", 1, "each"]]);
    await visit(0, 5, { copper: 0.3 });
    await visit(0, 14, { copper: 0.05 });
    await visit(0, 60, { copper: 0.4 });
    await visit(0, 61, { copper: 0.5, ph: 7.9 }, [["Binder A", 16, "fl oz"]]);
    await visit(0, 70, { copper: 0.2 });
    // KO-1: iron 0.5 at pH 8.0, acid and binder together; iron falls to 0.3 and clears on day 30.
    await visit(1, 10, { iron: 0.5, ph: 8.0 }, [["Acid C", 2, "lb"], ["Binder A", 20, "fl oz"]]);
    await visit(1, 15, { iron: 0.3 });
    await visit(1, 30, { iron: 0.05 });
    // KO-2: copper already clear at the binder: not eligible. KO-3 (on a route): a pad on copper 0.5.
    await visit(2, 3, { copper: 0.05 }, [["Binder A", 8, "fl oz"]]);
    await visit(2, 8, { copper: 0.04 });
    await visit(3, 2, { copper: 0.5, manganese: 0.2 }, [["Pad B", 1, "each"]]);
    await visit(3, 9, { copper: 0.45 });

    const answers = await keptEqualsRecomputed(owner);
    const copper = answers[0]!;
    expect(copper.courses).toBe(5);
    expect(copper.ineligible).toEqual({ "baseline-clear": 1, "no-baseline": 1 });
    const binder = copper.arms.find((a) => a.label === "Binder A")!;
    // KO-0's first course: 0.6 to 0.3 on day 5 is a 50 % fall, clear on day 14; its second: 0.5 to 0.2
    // on day 70 (9 days on) is 60 %, not clear. Median of 50 and 60: 55.
    expect(binder.reduction.median).toBe(55);
    expect(binder.timeToClear.cleared).toBe(1);
    // 16 fl oz at 0.50 = 8.00, and the pad 25.00, twice 8.00 for the two binders: 41.00 in all.
    expect(binder.totalCost).toBe(41);
    const check = await noDifferences();
    expect(check.courses).toBe(copper.courses * METALS.length);
    // Read in the recomputation's order (pool id as text, then start), so every sum adds alike to the last bit.
    const read = (await keptArmCourses(owner, check.versionId!, "copper", "combination")).map((c) => [c.poolId, c.startAt] as const);
    expect(new Set(read.map(([poolId]) => poolId)).size).toBe(4);
    expect(read).toEqual([...read].sort(([p, a], [q, b]) => (p < q ? -1 : p > q ? 1 : a - b)));

    // The endpoint says where the answer came from, and it is the same answer.
    const api = await callRoute(outcomesApi.loader, requestAs(manager, "/api/analytics/outcomes?metal=copper&arm=product"));
    expect(api.status).toBe(200);
    expect(api.body).toEqual(JSON.parse(JSON.stringify(copper)));
    expect((api.body as { source: string }).source).toBe("kept");
    const windowed = await callRoute(outcomesApi.loader, requestAs(manager, "/api/analytics/outcomes?metal=copper&arm=product&from=2000-01-01"));
    expect((windowed.body as { source: string }).source).toBe("recomputed");
  });

  it("stay so through an import, a treatment added to a stored test, a change of category and undos", async () => {
    const before = await copperCourses();
    // A product of category "other" forms no metal course until its category is changed.
    const first = await importRows("KO-a.csv", [
      `KO-1,${instantText(T0 + 100 * DAY)},7.3,0.7,,Binder A,16,fl oz`,
      `KO-1,${instantText(T0 + 106 * DAY)},7.4,0.35,,,,`,
      `KO-2,${instantText(T0 + 120 * DAY)},7.6,0.5,,Stain Lifter,8,fl oz`,
      `KO-2,${instantText(T0 + 127 * DAY)},,0.2,,,,`,
    ]);
    expect(await copperCourses()).toBe(before + 1);
    await keptEqualsRecomputed(owner);
    await noDifferences();

    // A pad given at KO-0's day-5 visit: the test is stored already, only the treatment is new.
    // It starts a course of its own and ends the first course's follow-up.
    const padOnly = await importRows("KO-b.csv", [`KO-0,${instantText(visitTimes[2]!)},,0.3,,Pad B,1,each`]);
    const [added] = (await db().execute(`SELECT tests_added, treatments_added FROM import_batches WHERE id = ${padOnly}`)) as unknown as [
      Array<{ tests_added: number; treatments_added: number }>,
    ];
    expect(added[0]).toEqual({ tests_added: 0, treatments_added: 1 });
    expect(await copperCourses()).toBe(before + 2);
    await keptEqualsRecomputed(owner);
    await noDifferences();

    const changed = await saveProduct(owner, productIds["Stain Lifter"]!, productInput("Stain Lifter", "sequestrant", null, null));
    expect(changed.ok).toBe(true);
    expect(await copperCourses()).toBe(before + 3);
    await keptEqualsRecomputed(owner);
    await noDifferences();

    expect((await undoBatch(owner, padOnly)).ok).toBe(true);
    expect(await copperCourses()).toBe(before + 2);
    await keptEqualsRecomputed(owner);
    await noDifferences();

    expect((await undoBatch(owner, first)).ok).toBe(true);
    expect(await copperCourses()).toBe(before);
    await keptEqualsRecomputed(owner);
    await noDifferences();
  });

  it("keep a pool an import fills first, in its tests' time order whatever the file's, beside a pool with tests of its own", async () => {
    const fresh = await createPool(owner.companyId, { routeId: null, accountCode: "KO-9" });
    // The fresh pool's rows are out of time order in the file: kept in time order all the same.
    const batch = await importRows("KO-c.csv", [
      `KO-9,${instantText(T0 + 210 * DAY)},7.2,0.8,0.4,,,`,
      `KO-9,${instantText(T0 + 200 * DAY)},7.5,0.1,,,,`,
      `KO-0,${instantText(T0 + 205 * DAY)},7.4,0.6,,,,`,
      `KO-9,${instantText(T0 + 220 * DAY)},,0.05,0.1,,,`,
    ]);
    const [episodes] = (await db().execute(
      `SELECT read_as, metal, opened_at FROM kept_episodes WHERE pool_id = ${fresh} AND read_as = 'all' ORDER BY seq`,
    )) as unknown as [Array<{ read_as: string; metal: string; opened_at: Date }>];
    expect(episodes.map((e) => [e.metal, new Date(e.opened_at).getTime()])).toEqual([
      ["copper", Date.parse(`${instantText(T0 + 210 * DAY).replace(" ", "T")}:00Z`)],
      ["iron", Date.parse(`${instantText(T0 + 210 * DAY).replace(" ", "T")}:00Z`)],
    ]);
    await noDifferences();
    await keptEqualsRecomputed(owner);
    expect((await undoBatch(owner, batch)).ok).toBe(true);
    await noDifferences();
  });

  it("name only a technician's own pools' courses", async () => {
    const technician: Scope = { ...owner, role: "technician", routeIds: [routeId] };
    // Only KO-3 is on the route: its one pad course.
    expect(await copperCourses(technician)).toBe(1);
    await keptEqualsRecomputed(technician);
  });

  it("are worked out again by a build, equal to those kept by the writes", async () => {
    const [keptBefore] = (await db().execute(
      `SELECT COUNT(*) AS n FROM kept_treatment_courses WHERE company_id = ${owner.companyId}`,
    )) as unknown as [Array<{ n: number }>];
    const rebuilt = await keepCompanyCurrent(owner.companyId, { rebuild: true });
    expect(rebuilt).not.toBeNull();
    const rows = await db().select({ seq: keptTreatmentCourses.seq }).from(keptTreatmentCourses).where(eq(keptTreatmentCourses.versionId, rebuilt!));
    expect(rows.length).toBe(Number(keptBefore[0]!.n));
    await keptEqualsRecomputed(owner);
    await noDifferences();
  });
  it("are kept a slice of pools at a time by a write over many pools, the month histogram summed over the slices", async () => {
    const at = (day: number) => new Date(T0 + day * DAY);
    await db().transaction(async (tx) => {
      await lockPoolsForKeeping(tx, poolIds);
      for (const poolId of poolIds) {
        // The same copper reading in the same month on every pool: each slice changes the same histogram row.
        await tx.insert(waterTests).values({ companyId: owner.companyId, poolId, sampledAt: at(400), copper: 0.6, ph: 7.5 });
        await tx
          .insert(treatments)
          .values({ companyId: owner.companyId, poolId, productId: productIds["Binder A"]!, appliedAt: at(401), amount: 10, unit: "fl oz", cost: 5 });
        await tx.insert(waterTests).values({ companyId: owner.companyId, poolId, sampledAt: at(410), copper: 0.05 });
      }
      await keepPoolsInStep(tx, owner.companyId, poolIds, { poolsPerSlice: 1 });
    });
    const [[row]] = (await db().execute(
      `SELECT m.n FROM kept_month_values m JOIN kept_versions v ON v.id = m.version_id
        WHERE v.company_id = ${owner.companyId} AND v.state = 'ready' AND m.metal = 'copper' AND m.month = '${at(400).toISOString().slice(0, 7)}' AND m.value = 0.6`,
    )) as unknown as [Array<{ n: number }>];
    expect(Number(row!.n)).toBe(poolIds.length);
    await noDifferences();
    await keptEqualsRecomputed(owner);
  });
});
