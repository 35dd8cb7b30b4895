import { and, asc, eq, isNotNull } from "drizzle-orm";
import { saturationIndex } from "@analysis/chemistry/saturation";
import { analyseMetalHistory, type Episode } from "@analysis/metals/episodes";
import { metalsReadAs, type ReadAs } from "@analysis/metals/kept-history";
import { METALS, type Metal } from "@analysis/metals/reading";
import { episodeJson, type EpisodeJson } from "@analysis/json-shapes";
import type { SeriesAnalyte } from "~/lib/analytics/params";
import { db } from "../../db/client";
import { pools, waterTests } from "../../db/schema";
import type { Scope } from "../../scope";
import { keptEpisodeList, keptVersionFor, type AnswerSource } from "../kept/read-kept";
import { metalReadings, treatmentRows } from "./metal-readings";
import { BALANCE_COLUMNS, balanceInputsPresent } from "./balance-inputs";
import { tenantCondition, testsInScope, type AnalyticsParams, type TimeWindow } from "./tenant-and-window";

export const ANALYTE_UNITS: Record<SeriesAnalyte, string> = {
  copper: "mg/L",
  iron: "mg/L",
  manganese: "mg/L",
  ph: "",
  freeChlorine: "mg/L",
  combinedChlorine: "mg/L",
  totalAlkalinity: "mg/L as CaCO3",
  calciumHardness: "mg/L as CaCO3",
  cyanuricAcid: "mg/L",
  salt: "mg/L",
  tds: "mg/L",
  temperatureC: "°C",
  saturationIndex: "",
};

export type SeriesPoint = { at: string; value: number; belowDetection: boolean };

export type PoolSeries = {
  poolId: number;
  analyte: SeriesAnalyte;
  unit: string;
  points: SeriesPoint[];
  /** For a metal: its elevated and clear levels. */
  levels: { elevated: number; clear: number } | null;
  episodes: EpisodeJson[];
  /** Where the episodes came from; the points are always the pool's own tests. */
  source: AnswerSource;
  treatments: Array<{ appliedAt: string; productName: string; category: string; amount: number; unit: string }>;
};

export async function poolInScope(scope: Scope, poolId: number): Promise<boolean> {
  const [row] = await db().select({ id: pools.id }).from(pools).where(and(tenantCondition({ scope }), eq(pools.id, poolId)));
  return Boolean(row);
}

const isMetal = (analyte: SeriesAnalyte): analyte is Metal => (METALS as readonly string[]).includes(analyte);

/** Saturation index of one pool's tests that carry what it needs, oldest first. */
export async function poolBalance(scope: Scope, poolId: number, window: TimeWindow) {
  const rows = await db()
    .select({ sampledAt: waterTests.sampledAt, ...BALANCE_COLUMNS })
    .from(waterTests)
    .innerJoin(pools, eq(pools.id, waterTests.poolId))
    .where(
      and(
        testsInScope({ scope }, window),
        eq(waterTests.poolId, poolId),
        balanceInputsPresent,
      ),
    )
    .orderBy(asc(waterTests.sampledAt));
  const points: Array<{ takenAt: number; saturationIndex: number }> = [];
  for (const r of rows) {
    const result = saturationIndex(r);
    if (result.ok) points.push({ takenAt: r.sampledAt.getTime(), saturationIndex: result.index });
  }
  return points;
}

/**
 * One pool's metal episodes read one way: from its kept rows when a kept
 * version answers, else from its readings in the window (those of a metal
 * series already read are passed in as its points).
 */
export async function poolEpisodes(
  scope: Scope,
  poolId: number,
  params: AnalyticsParams,
  readAs: ReadAs,
  metalPoints?: readonly SeriesPoint[],
  keptVersion?: number | null,
): Promise<{ list: Episode[]; source: AnswerSource }> {
  const versionId = keptVersion === undefined ? await keptVersionFor(scope.companyId, params) : keptVersion;
  if (versionId !== null) return { list: await keptEpisodeList({ scope }, versionId, readAs, [poolId]), source: "kept" };
  const tests =
    metalPoints && readAs !== "all"
      ? metalPoints.map((p, i) => ({ id: String(i), poolId: String(poolId), takenAt: Date.parse(p.at), [readAs]: { value: p.value, belowDetection: p.belowDetection } }))
      : await metalReadings({ scope }, { window: params.window, metals: metalsReadAs(readAs), poolIds: [poolId] });
  return { list: analyseMetalHistory(tests, { thresholds: params.thresholds, metals: metalsReadAs(readAs) }).episodes, source: "recomputed" };
}

/** One analyte of one pool over time, with the pool's metal episodes and treatments; null when not in scope. */
export async function poolSeries(scope: Scope, poolId: number, analyte: SeriesAnalyte, params: AnalyticsParams): Promise<PoolSeries | null> {
  if (!(await poolInScope(scope, poolId))) return null;
  let points: SeriesPoint[];
  if (isMetal(analyte)) {
    const readings = await metalReadings({ scope }, { window: params.window, metals: [analyte], poolIds: [poolId] });
    points = readings.map((r) => ({ at: new Date(r.takenAt).toISOString(), value: r[analyte]!.value, belowDetection: r[analyte]!.belowDetection }));
  } else if (analyte === "saturationIndex") {
    points = (await poolBalance(scope, poolId, params.window)).map((p) => ({
      at: new Date(p.takenAt).toISOString(),
      value: p.saturationIndex,
      belowDetection: false,
    }));
  } else {
    const column = waterTests[analyte];
    const rows = await db()
      .select({ sampledAt: waterTests.sampledAt, value: column })
      .from(waterTests)
      .innerJoin(pools, eq(pools.id, waterTests.poolId))
      .where(and(testsInScope({ scope }, params.window), eq(waterTests.poolId, poolId), isNotNull(column)))
      .orderBy(asc(waterTests.sampledAt));
    points = rows.map((r) => ({ at: r.sampledAt.toISOString(), value: Number(r.value), belowDetection: false }));
  }
  const [episodes, treated] = await Promise.all([
    poolEpisodes(scope, poolId, params, isMetal(analyte) ? analyte : "all", isMetal(analyte) ? points : undefined),
    treatmentRows({ scope }, { window: params.window, poolIds: [poolId] }),
  ]);
  return {
    poolId,
    analyte,
    unit: ANALYTE_UNITS[analyte],
    points,
    levels: isMetal(analyte) ? params.thresholds[analyte] : null,
    episodes: episodes.list.map(episodeJson),
    source: episodes.source,
    treatments: treated.map((t) => ({
      appliedAt: new Date(t.appliedAt).toISOString(),
      productName: t.productName,
      category: t.category,
      amount: t.amount,
      unit: t.unit,
    })),
  };
}
