import { verifyPassword } from "better-auth/crypto";
import { and, eq, isNotNull } from "drizzle-orm";
import mysql from "mysql2/promise";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createDatabase, createPool, type Database } from "../../app/.server/db/client";
import * as schema from "../../app/.server/db/schema";
import { migrateDatabase } from "../../drizzle/migrate";
import { fingerprintCompany, type SeedFingerprint } from "../../drizzle/seed/fingerprint";
import { seedDemo, type SeedSummary } from "../../drizzle/seed/insert";
import { TEST_DATABASE_URL } from "../fixtures/database";

// Two scratch databases seeded from the same seed must hold the same data.
const SEED = 424242;
const scratchNames = [`patina_scratch_seed_${process.pid}_a`, `patina_scratch_seed_${process.pid}_b`];

function urlFor(database: string) {
  const url = new URL(TEST_DATABASE_URL);
  url.pathname = `/${database}`;
  return url.toString();
}

async function onServer<T>(work: (connection: mysql.Connection) => Promise<T>): Promise<T> {
  const url = new URL(TEST_DATABASE_URL);
  url.pathname = "/";
  const connection = await mysql.createConnection({ uri: url.toString() });
  try {
    return await work(connection);
  } finally {
    await connection.end();
  }
}

type Seeded = { pool: mysql.Pool; db: Database; summary: SeedSummary; fingerprint: SeedFingerprint };
const seeded: Seeded[] = [];

beforeAll(async () => {
  for (const name of scratchNames) {
    await onServer((c) => c.query(`DROP DATABASE IF EXISTS \`${name}\``));
    await onServer((c) => c.query(`CREATE DATABASE \`${name}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`));
    await migrateDatabase(urlFor(name));
    const pool = createPool(urlFor(name));
    const db = createDatabase(pool);
    const summary = await seedDemo(db, { seed: SEED });
    seeded.push({ pool, db, summary, fingerprint: await fingerprintCompany(db, summary.companyId) });
  }
});

afterAll(async () => {
  for (const { pool } of seeded) await pool.end();
  for (const name of scratchNames) await onServer((c) => c.query(`DROP DATABASE IF EXISTS \`${name}\``));
});

type MetalReading = { poolId: number; sampledAt: Date; value: number };

/** Every reading of the metal in the seeded company, in no particular order. */
async function metalReadings({ db, summary }: Seeded, metal: "iron" | "copper"): Promise<MetalReading[]> {
  const value = schema.waterTests[metal];
  const rows = await db
    .select({ poolId: schema.waterTests.poolId, sampledAt: schema.waterTests.sampledAt, value })
    .from(schema.waterTests)
    .where(and(eq(schema.waterTests.companyId, summary.companyId), isNotNull(value)));
  return rows.map((r) => ({ ...r, value: r.value ?? 0 }));
}

/** Episode openings per pool: open at >= elevated, close at the first later reading < clear. */
function episodeOpenings(readings: MetalReading[], elevated: number, clear: number): Map<number, number> {
  const openings = new Map<number, number>();
  const open = new Set<number>();
  const ordered = [...readings].sort((a, b) => a.poolId - b.poolId || a.sampledAt.getTime() - b.sampledAt.getTime());
  for (const { poolId, value } of ordered) {
    if (!open.has(poolId) && value >= elevated) {
      open.add(poolId);
      openings.set(poolId, (openings.get(poolId) ?? 0) + 1);
    } else if (open.has(poolId) && value < clear) {
      open.delete(poolId);
    }
  }
  return openings;
}

function meanOver(poolIds: number[], openings: Map<number, number>) {
  return poolIds.reduce((sum, id) => sum + (openings.get(id) ?? 0), 0) / poolIds.length;
}

describe("demo seed", () => {
  it("gives identical data for the same seed", () => {
    const [first, second] = seeded;
    expect(first!.fingerprint).toEqual(second!.fingerprint);
    expect(first!.fingerprint.counts.pools).toBe(120);
    expect(first!.fingerprint.counts.routes).toBe(3);
    expect(first!.fingerprint.counts.waterTests).toBeGreaterThan(15_000);
    expect(first!.fingerprint.counts.treatments).toBeGreaterThan(0);
  });

  it("creates five demo users who can sign in with the printed passwords", async () => {
    const { db, summary } = seeded[0]!;
    expect(summary.users.map((u) => u.role).sort()).toEqual(["analyst", "manager", "owner", "technician", "technician"]);
    const owner = summary.users.find((u) => u.role === "owner")!;
    const [account] = await db
      .select({ hash: schema.account.password })
      .from(schema.account)
      .innerJoin(schema.user, eq(schema.user.id, schema.account.userId))
      .where(and(eq(schema.user.email, owner.email), eq(schema.account.providerId, "credential")));
    expect(await verifyPassword({ hash: account!.hash!, password: owner.password })).toBe(true);
    const routeLinks = await db.select().from(schema.routeTechnicians);
    expect(new Set(routeLinks.map((r) => r.routeId)).size).toBe(3);
  });

  it("plants iron in the pools filled from the iron-bearing shared well", async () => {
    const { db, summary } = seeded[0]!;
    const sources = await db.select().from(schema.fillSources).where(eq(schema.fillSources.companyId, summary.companyId));
    const sourceTests = await db.select().from(schema.sourceTests).where(eq(schema.sourceTests.companyId, summary.companyId));
    const ironWell = sources.find(
      (s) => s.kind === "shared_well" && sourceTests.some((t) => t.fillSourceId === s.id && (t.iron ?? 0) >= 0.3),
    );
    const municipal = sources.find((s) => s.kind === "municipal");
    expect(ironWell).toBeDefined();

    const pools = await db.select().from(schema.pools).where(eq(schema.pools.companyId, summary.companyId));
    const openings = episodeOpenings(await metalReadings(seeded[0]!, "iron"), 0.2, 0.1);
    const onIronWell = pools.filter((p) => p.fillSourceId === ironWell!.id).map((p) => p.id);
    const onMunicipal = pools.filter((p) => p.fillSourceId === municipal!.id).map((p) => p.id);

    expect(onIronWell.length).toBeGreaterThanOrEqual(3);
    expect(meanOver(onIronWell, openings)).toBeGreaterThan(1);
    expect(meanOver(onIronWell, openings)).toBeGreaterThan(5 * meanOver(onMunicipal, openings));
  });

  it("plants copper in pools with old copper or cupronickel heat exchangers", async () => {
    const { db, summary } = seeded[0]!;
    const pools = await db.select({ id: schema.pools.id }).from(schema.pools).where(eq(schema.pools.companyId, summary.companyId));
    const heaters = await db
      .select()
      .from(schema.equipment)
      .where(and(eq(schema.equipment.companyId, summary.companyId), eq(schema.equipment.kind, "heater")));
    const firstDay = new Date(`${summary.options.endDate}T00:00:00Z`);
    firstDay.setUTCFullYear(firstDay.getUTCFullYear() - summary.options.years);
    const tenYearsBefore = new Date(firstDay);
    tenYearsBefore.setUTCFullYear(tenYearsBefore.getUTCFullYear() - 10);
    const oldCopper = new Set(
      heaters
        .filter((h) => (h.exchangerMetal === "copper" || h.exchangerMetal === "cupronickel") && new Date(h.installedOn!) <= tenYearsBefore)
        .map((h) => h.poolId),
    );
    const openings = episodeOpenings(await metalReadings(seeded[0]!, "copper"), 0.3, 0.1);
    const withOld = pools.map((p) => p.id).filter((id) => oldCopper.has(id));
    const without = pools.map((p) => p.id).filter((id) => !oldCopper.has(id));

    expect(withOld.length).toBeGreaterThanOrEqual(5);
    expect(meanOver(withOld, openings)).toBeGreaterThan(3 * meanOver(without, openings));
  });

  it("records the treatments that answer elevated metals, with costs", async () => {
    const { db, summary } = seeded[0]!;
    const rows = await db
      .select({ category: schema.products.category, amount: schema.treatments.amount, cost: schema.treatments.cost, unitCost: schema.products.unitCost })
      .from(schema.treatments)
      .innerJoin(schema.products, eq(schema.products.id, schema.treatments.productId))
      .where(eq(schema.treatments.companyId, summary.companyId));
    const categories = new Set(rows.map((r) => r.category));
    expect(categories).toContain("sequestrant");
    expect(categories).toContain("collector_pad");
    // Cost is amount x unit cost, rounded to the cent.
    for (const row of rows) expect(Math.abs(row.cost! - row.amount * row.unitCost!)).toBeLessThanOrEqual(0.005 + 1e-9);
  });
});
