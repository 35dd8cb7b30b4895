import { and, asc, eq, inArray } from "drizzle-orm";
import type { MetalReading } from "@analysis/metals/reading";
import { db } from "../../db/client";
import { sourceTests } from "../../db/schema";
import { metalReading } from "./metal-readings";

export type SourceTestRow = {
  id: number;
  fillSourceId: number;
  sampledOn: string;
  copper: MetalReading | null;
  iron: MetalReading | null;
  manganese: MetalReading | null;
};

/** Fill-water tests of the company's sources (optionally only some sources), oldest first. */
export async function sourceTestRows(companyId: number, sourceIds?: readonly number[]): Promise<SourceTestRow[]> {
  if (sourceIds && sourceIds.length === 0) return [];
  const rows = await db()
    .select()
    .from(sourceTests)
    .where(and(eq(sourceTests.companyId, companyId), sourceIds ? inArray(sourceTests.fillSourceId, [...sourceIds]) : undefined))
    .orderBy(asc(sourceTests.fillSourceId), asc(sourceTests.sampledOn));
  return rows.map((r) => ({
    id: r.id,
    fillSourceId: r.fillSourceId,
    sampledOn: r.sampledOn,
    copper: metalReading(r.copper, r.copperBelowDetection),
    iron: metalReading(r.iron, r.ironBelowDetection),
    manganese: metalReading(r.manganese, r.manganeseBelowDetection),
  }));
}
