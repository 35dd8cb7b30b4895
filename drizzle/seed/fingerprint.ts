// A compact fingerprint of one company's seeded data: row counts and a
// checksum over its water tests in pool and time order. Two seeds of the same
// scenario must give the same fingerprint, whatever ids the database chose.
import { createHash } from "node:crypto";
import { asc, count, eq } from "drizzle-orm";
import type { MySqlColumn, MySqlTable } from "drizzle-orm/mysql-core";
import type { Database } from "../../app/.server/db/client";
import * as schema from "../../app/.server/db/schema";

export type SeedFingerprint = { counts: Record<string, number>; waterTestsChecksum: string };

export async function fingerprintCompany(db: Database, companyId: number): Promise<SeedFingerprint> {
  const countOf = async (table: MySqlTable, companyColumn: MySqlColumn) => {
    const [row] = await db.select({ n: count() }).from(table).where(eq(companyColumn, companyId));
    return row?.n ?? 0;
  };
  const counts = {
    routes: await countOf(schema.routes, schema.routes.companyId),
    fillSources: await countOf(schema.fillSources, schema.fillSources.companyId),
    sourceTests: await countOf(schema.sourceTests, schema.sourceTests.companyId),
    pools: await countOf(schema.pools, schema.pools.companyId),
    equipment: await countOf(schema.equipment, schema.equipment.companyId),
    products: await countOf(schema.products, schema.products.companyId),
    waterTests: await countOf(schema.waterTests, schema.waterTests.companyId),
    treatments: await countOf(schema.treatments, schema.treatments.companyId),
    memberships: await countOf(schema.memberships, schema.memberships.companyId),
  };

  const t = schema.waterTests;
  const rows = await db
    .select({
      accountCode: schema.pools.accountCode,
      sampledAt: t.sampledAt,
      technicianId: t.technicianId,
      freeChlorine: t.freeChlorine,
      combinedChlorine: t.combinedChlorine,
      ph: t.ph,
      totalAlkalinity: t.totalAlkalinity,
      calciumHardness: t.calciumHardness,
      cyanuricAcid: t.cyanuricAcid,
      salt: t.salt,
      tds: t.tds,
      temperatureC: t.temperatureC,
      copper: t.copper,
      copperBelowDetection: t.copperBelowDetection,
      iron: t.iron,
      ironBelowDetection: t.ironBelowDetection,
      manganese: t.manganese,
      manganeseBelowDetection: t.manganeseBelowDetection,
      hardnessEndpoint: t.hardnessEndpoint,
      stain: t.stain,
      stainColour: t.stainColour,
      padTint: t.padTint,
      note: t.note,
    })
    .from(t)
    .innerJoin(schema.pools, eq(schema.pools.id, t.poolId))
    .where(eq(t.companyId, companyId))
    .orderBy(asc(schema.pools.accountCode), asc(t.sampledAt));

  const hash = createHash("sha256");
  for (const row of rows) hash.update(JSON.stringify({ ...row, sampledAt: row.sampledAt.toISOString() }) + "\n");
  return { counts, waterTestsChecksum: hash.digest("hex") };
}
