import { and, count, eq, max } from "drizzle-orm";
import { saturationIndex, type BalanceBand } from "@analysis/chemistry/saturation";
import type { AheadHistory, BalancePoint } from "@analysis/ahead/features";
import { metalOutlook, type Backtest, type Outlook, type OutlookMethod } from "@analysis/ahead/outlook";
import type { Metal, MetalThresholds } from "@analysis/metals/reading";
import { db } from "../../db/client";
import { waterTests } from "../../db/schema";
import { dayToMs, utcDate } from "../../db/values";
import type { Scope } from "../../scope";
import { BALANCE_COLUMNS, balanceInputsPresent } from "./balance-inputs";
import { sourceTestRows } from "./fill-water-tests";
import { treatmentRows, waterTestReadings } from "./metal-readings";
import { poolLabels, poolProfiles } from "./pool-profiles";

export type OutlookEntryJson = {
  poolId: number;
  street: string;
  customerName: string;
  routeName: string | null;
  fillSourceName: string | null;
  metal: Metal;
  probability: number | null;
  latestValue: number | null;
  latestAt: string | null;
  flagged: boolean;
  reasons: { key: string; text: string }[];
};

export type BacktestJson = Omit<Backtest, "firstOrigin" | "lastOrigin"> & { firstOrigin: string | null; lastOrigin: string | null };

export type OutlookAnswer = {
  /** The latest test on record: the outlook is worked out as of then (null before any test). */
  asOf: string | null;
  horizonDays: number;
  method: OutlookMethod;
  methodNote: string;
  backtest: BacktestJson | null;
  /** Pools in the member's scope, highest chance first; `flagged` marks the company's top tenth. */
  entries: OutlookEntryJson[];
  /** Entries before `limit` cut the list. */
  total: number;
};

export type OutlookParams = { thresholds: MetalThresholds; balanceBand: BalanceBand };

/** Saturation indices of the company's tests that carry the balance inputs. */
async function balancePoints(companyId: number): Promise<BalancePoint[]> {
  const rows = await db()
    .select({ poolId: waterTests.poolId, sampledAt: waterTests.sampledAt, ...BALANCE_COLUMNS })
    .from(waterTests)
    .where(and(eq(waterTests.companyId, companyId), balanceInputsPresent));
  const points: BalancePoint[] = [];
  for (const r of rows) {
    const result = saturationIndex(r);
    if (result.ok) points.push({ poolId: String(r.poolId), takenAt: r.sampledAt.getTime(), index: result.index });
  }
  return points;
}

/** The company's history as the outlook reads it, up to `asOf`: the model is the company's, whoever asks. */
export async function readOutlookHistory(companyId: number, params: OutlookParams, asOf: Date): Promise<AheadHistory> {
  const tenant = { companyId };
  const window = { from: null, to: asOf };
  const [tests, balance, algaecide, fillWater, { profiles }] = await Promise.all([
    waterTestReadings(tenant, { window }),
    balancePoints(companyId),
    treatmentRows(tenant, { window, categories: ["copper_algaecide"] }),
    sourceTestRows(companyId),
    poolProfiles(tenant),
  ]);
  return {
    asOf: asOf.getTime(),
    tests,
    balance: balance.filter((b) => b.takenAt <= asOf.getTime()),
    copperAlgaecide: algaecide.map((t) => ({ poolId: t.poolId, appliedAt: t.appliedAt })),
    fillWaterTests: fillWater
      .map((t) => ({ fillSourceId: String(t.fillSourceId), takenAt: dayToMs(t.sampledOn)!, copper: t.copper, iron: t.iron, manganese: t.manganese }))
      .filter((t) => t.takenAt <= asOf.getTime()),
    pools: profiles,
    thresholds: params.thresholds,
    balanceBand: params.balanceBand,
  };
}

/** Yield between weeks of work so the fit never holds the server's other requests for long. */
export const yieldToOtherRequests = () => new Promise<void>((resolve) => setImmediate(resolve));

async function companyOutlook(companyId: number, params: OutlookParams, asOf: Date): Promise<Outlook> {
  return metalOutlook(await readOutlookHistory(companyId, params, asOf), {}, yieldToOtherRequests);
}

// Fitting and backtesting takes seconds on a route book; the answer stays good
// until the company's tests or levels change.
const CACHE_LIMIT = 16;
const cache = new Map<string, Promise<Outlook>>();

/**
 * The record's state: count and highest id change with any insert or delete
 * (an undone import too). The outlook is as of the latest test on record, so
 * a company that stopped logging still sees what its record says.
 */
async function recordMark(companyId: number) {
  const [mark] = await db()
    .select({ tests: count(), lastId: max(waterTests.id), lastAt: max(waterTests.sampledAt) })
    .from(waterTests)
    .where(eq(waterTests.companyId, companyId));
  return { key: `${mark?.tests ?? 0}:${mark?.lastId ?? 0}`, lastAt: mark?.lastAt ? utcDate(mark.lastAt) : null };
}

async function cachedOutlook(companyId: number, params: OutlookParams): Promise<Outlook | null> {
  const mark = await recordMark(companyId);
  if (!mark.lastAt) return null;
  const asOf = mark.lastAt;
  const key = JSON.stringify([companyId, mark.key, params.thresholds, params.balanceBand]);
  let answer = cache.get(key);
  if (!answer) {
    answer = companyOutlook(companyId, params, asOf);
    cache.set(key, answer);
    answer.catch(() => cache.delete(key));
    while (cache.size > CACHE_LIMIT) cache.delete(cache.keys().next().value!);
  }
  return answer;
}

export type OutlookFilter = { metal?: Metal | undefined; limit?: number | undefined };

/** The four-week metal outlook for the pools in the member's scope (active pools only). */
export async function metalOutlookFor(scope: Scope, params: OutlookParams, filter: OutlookFilter = {}): Promise<OutlookAnswer> {
  return answerFor(scope, await cachedOutlook(scope.companyId, params), filter);
}

/**
 * The outlook if it is ready within `waitMs`, else null while it goes on being
 * worked out (and cached) in the background: for pages that show it beside
 * other things and must not wait seconds for a fresh fit.
 */
export async function metalOutlookIfReady(scope: Scope, params: OutlookParams, waitMs: number, filter: OutlookFilter = {}): Promise<OutlookAnswer | null> {
  const pending = cachedOutlook(scope.companyId, params);
  let timer: ReturnType<typeof setTimeout> | undefined;
  const late = new Promise<"late">((resolve) => (timer = setTimeout(() => resolve("late"), waitMs)));
  const outlook = await Promise.race([pending, late]).finally(() => clearTimeout(timer));
  if (outlook === "late") return null;
  return answerFor(scope, outlook, filter);
}

async function answerFor(scope: Scope, outlook: Outlook | null, filter: OutlookFilter): Promise<OutlookAnswer> {
  const labels = await poolLabels({ scope });
  if (!outlook) {
    return { asOf: null, horizonDays: 28, method: "latest-reading", methodNote: "No water tests on record yet.", backtest: null, entries: [], total: 0 };
  }
  const entries: OutlookEntryJson[] = [];
  for (const e of outlook.entries) {
    const label = labels.get(Number(e.poolId));
    if (!label || !label.active) continue;
    if (filter.metal && e.metal !== filter.metal) continue;
    entries.push({
      poolId: label.poolId,
      street: label.street,
      customerName: label.customerName,
      routeName: label.routeName,
      fillSourceName: label.fillSourceName,
      metal: e.metal,
      probability: e.probability,
      latestValue: e.latestValue,
      latestAt: e.latestAt === null ? null : new Date(e.latestAt).toISOString(),
      flagged: e.flagged,
      reasons: e.reasons.map((r) => ({ key: r.key, text: r.text })),
    });
  }
  const iso = (at: number | null) => (at === null ? null : new Date(at).toISOString());
  return {
    asOf: new Date(outlook.asOf).toISOString(),
    horizonDays: outlook.horizonDays,
    method: outlook.method,
    methodNote: outlook.methodNote,
    backtest: outlook.backtest
      ? { ...outlook.backtest, firstOrigin: iso(outlook.backtest.firstOrigin), lastOrigin: iso(outlook.backtest.lastOrigin) }
      : null,
    entries: filter.limit === undefined ? entries : entries.slice(0, filter.limit),
    total: entries.length,
  };
}
