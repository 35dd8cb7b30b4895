import { randomUUID } from "node:crypto";
import { and, count, eq, inArray } from "drizzle-orm";
import { z } from "zod";
import { group } from "d3-array";
import { analyseMetalHistory, DAY_MS, DEFAULT_EPISODE_RULES, type Episode, type MetalTest } from "@analysis/metals/episodes";
import { METALS, type Metal, type MetalThresholds } from "@analysis/metals/reading";
import type { PoolProfile } from "@analysis/metals/route-book";
import { DEFAULT_SHARED_SOURCE_RULES, sharedSourceAlerts } from "@analysis/metals/shared-source";
import { companySettings } from "../settings/queries/company-settings";
import { db } from "../db/client";
import { inIdList } from "../db/id-list";
import { alertEvents, type ALERT_KINDS, fillSources, mailPreferences, memberships, pools, user, waterTests } from "../db/schema";
import { serverEnv } from "../env";
import { claimJob, type JobClaim, runClaimed } from "../jobs/claims";
import { keptEpisodeList, keptVersionAsOf } from "../analytics/kept/read-kept";
import { metalReadings, waterTestReadings } from "../analytics/queries/metal-readings";
import { poolLabels } from "../analytics/queries/pool-profiles";
import { episodeOpenedMail, type PoolLabel, poolRecurringMail, sharedSourceMail } from "./alert-messages";
import { enqueueMail, signalMailQueued } from "./outbox";
import type { RenderedMail } from "./templates";

/**
 * Only events this recent are announced, so bringing in years of old logs
 * does not mail every episode of the past.
 */
export const ALERT_LOOKBACK_DAYS = 14;

type AlertKind = (typeof ALERT_KINDS)[number];

type Company = { id: number; name: string; timeZone: string; thresholds: MetalThresholds; alertOwners: boolean };

type AlertEvent = {
  kind: AlertKind;
  dedupeKey: string;
  poolId: number | null;
  fillSourceId: number | null;
  metal: Metal;
  occurredAt: number;
  details: Record<string, unknown>;
  mail: RenderedMail;
};

export type RecordedAlert = { kind: AlertKind; dedupeKey: string; recipients: string[] };

async function companyFor(companyId: number): Promise<Company | null> {
  const settings = await companySettings(companyId);
  return settings && { id: companyId, name: settings.name, timeZone: settings.timeZone, thresholds: settings.thresholds, alertOwners: settings.alertOwners };
}

/** The managers, and the owners when the company asks for it, who have not turned alerts off. */
async function alertRecipients(company: Company) {
  const roles: Array<"manager" | "owner"> = company.alertOwners ? ["manager", "owner"] : ["manager"];
  const rows = await db()
    .select({ userId: user.id, email: user.email, alerts: mailPreferences.alerts })
    .from(memberships)
    .innerJoin(user, eq(user.id, memberships.userId))
    .leftJoin(mailPreferences, eq(mailPreferences.membershipId, memberships.id))
    .where(and(eq(memberships.companyId, company.id), inArray(memberships.role, roles)));
  return rows.filter((r) => r.alerts !== false);
}

/** Stores each event once (UNIQUE company + key) and, only for a new event, queues one mail per recipient. */
async function recordEvents(company: Company, events: AlertEvent[]): Promise<RecordedAlert[]> {
  if (events.length === 0) return [];
  const recipients = await alertRecipients(company);
  const recorded: RecordedAlert[] = [];
  for (const event of events) {
    const mailed = await db().transaction(async (tx) => {
      const [inserted] = await tx
        .insert(alertEvents)
        .ignore()
        .values({
          companyId: company.id,
          kind: event.kind,
          dedupeKey: event.dedupeKey,
          poolId: event.poolId,
          fillSourceId: event.fillSourceId,
          metal: event.metal,
          occurredAt: new Date(event.occurredAt),
          details: event.details,
        });
      if (inserted.affectedRows !== 1) return null;
      for (const recipient of recipients) {
        await enqueueMail(
          {
            companyId: company.id,
            dedupeKey: `alert:${company.id}:${event.dedupeKey}:${recipient.userId}`,
            kind: "alert",
            recipient: recipient.email,
            mail: event.mail,
          },
          tx,
        );
      }
      return recipients.map((r) => r.email);
    });
    if (mailed) recorded.push({ kind: event.kind, dedupeKey: event.dedupeKey, recipients: mailed });
  }
  if (recorded.length > 0) signalMailQueued();
  return recorded;
}

/** Episodes that opened, and openings that made the pool recurring (its first repeat inside the window). */
function poolEvents(company: Company, label: PoolLabel, episodes: readonly Episode[], valueAt: Map<string, number>, since: number): AlertEvent[] {
  const common = { baseUrl: serverEnv().PATINA_URL, companyName: company.name, timeZone: company.timeZone };
  const windowDays = DEFAULT_EPISODE_RULES.recurrenceWindowDays;
  const events: AlertEvent[] = [];
  const byMetal = new Map<Metal, Episode[]>();
  for (const e of episodes) byMetal.set(e.metal, [...(byMetal.get(e.metal) ?? []), e]);
  for (const [metal, list] of byMetal) {
    list.sort((a, b) => a.openedAt - b.openedAt);
    list.forEach((episode, i) => {
      if (episode.openedAt < since) return;
      const value = valueAt.get(`${episode.openedByTestId}:${metal}`) ?? episode.peak;
      const levels = company.thresholds[metal];
      events.push({
        kind: "episode_opened",
        dedupeKey: `episode:${label.poolId}:${metal}:${episode.openedAt}`,
        poolId: label.poolId,
        fillSourceId: null,
        metal,
        occurredAt: episode.openedAt,
        details: { value, elevated: levels.elevated, clear: levels.clear, testId: episode.openedByTestId },
        mail: episodeOpenedMail({ ...common, pool: label, metal, openedAt: episode.openedAt, value, elevatedLevel: levels.elevated, clearLevel: levels.clear }),
      });
      const previous = list[i - 1];
      // The pool "becomes" recurring at the first repeat; later repeats of an already recurring pool are not news.
      if (episode.recurrence && previous && !previous.recurrence) {
        const openingsLastYear = list.filter((e) => e.openedAt <= episode.openedAt && episode.openedAt - e.openedAt <= windowDays * DAY_MS).length;
        events.push({
          kind: "pool_recurring",
          dedupeKey: `recurring:${label.poolId}:${metal}:${episode.openedAt}`,
          poolId: label.poolId,
          fillSourceId: null,
          metal,
          occurredAt: episode.openedAt,
          details: { previousOpenedAt: new Date(previous.openedAt).toISOString(), openingsLastYear, windowDays },
          mail: poolRecurringMail({ ...common, pool: label, metal, openedAt: episode.openedAt, previousOpenedAt: previous.openedAt, openingsLastYear, windowDays }),
        });
      }
    });
  }
  return events;
}

/**
 * The episodes (every metal) of some pools up to `now`: their kept rows when
 * those answer as of `now`, else worked out from the pools' metal tests,
 * which come back with them (null when kept rows answered).
 */
async function episodesAsOf(company: Company, poolIds: readonly number[], now: number): Promise<{ episodes: Episode[]; tests: MetalTest[] | null }> {
  const tenant = { companyId: company.id };
  const versionId = await keptVersionAsOf(company.id, company.thresholds, new Date(now), poolIds);
  if (versionId !== null) return { episodes: await keptEpisodeList(tenant, versionId, "all", poolIds), tests: null };
  const tests = await metalReadings(tenant, { poolIds, window: { from: null, to: new Date(now) } });
  return { episodes: analyseMetalHistory(tests, { thresholds: company.thresholds }).episodes, tests };
}

/** Each test's metal readings by "test id:metal". */
function readingValues(tests: readonly MetalTest[]): Map<string, number> {
  const valueAt = new Map<string, number>();
  for (const t of tests) {
    for (const metal of METALS) {
      const r = t[metal];
      if (r) valueAt.set(`${t.id}:${metal}`, r.value);
    }
  }
  return valueAt;
}

/** How many pools' episodes an alert check holds at once: an import can touch thousands. */
const POOLS_PER_CHECK = 250;

async function poolAlerts(company: Company, poolIds: readonly number[], now: number): Promise<AlertEvent[]> {
  const labels = await poolLabels({ companyId: company.id }, { poolIds });
  const since = now - ALERT_LOOKBACK_DAYS * DAY_MS;
  const events: AlertEvent[] = [];
  for (let from = 0; from < poolIds.length; from += POOLS_PER_CHECK) {
    const slice = poolIds.slice(from, from + POOLS_PER_CHECK).filter((id) => labels.has(id));
    if (slice.length === 0) continue;
    const { episodes, tests } = await episodesAsOf(company, slice, now);
    // From kept rows, only the readings that opened an episode in the look-back are read.
    const openedBy = tests ? [] : [...new Set(episodes.filter((e) => e.openedAt >= since).map((e) => Number(e.openedByTestId)))];
    const opening = openedBy.length ? await waterTestReadings({ companyId: company.id }, { poolIds: slice, where: inIdList(waterTests.id, openedBy) }) : [];
    const valueAt = readingValues(tests ?? opening);
    const byPool = group(episodes, (e) => Number(e.poolId));
    for (const poolId of slice) events.push(...poolEvents(company, labels.get(poolId)!, byPool.get(poolId) ?? [], valueAt, since));
  }
  return events;
}

async function sourceAlerts(company: Company, fillSourceId: number, now: number): Promise<AlertEvent[]> {
  const [source] = await db()
    .select({ id: fillSources.id, name: fillSources.name, kind: fillSources.kind })
    .from(fillSources)
    .where(and(eq(fillSources.id, fillSourceId), eq(fillSources.companyId, company.id)));
  if (!source) return [];
  const onSource = await db()
    .select({ id: pools.id, active: pools.active })
    .from(pools)
    .where(and(eq(pools.companyId, company.id), eq(pools.fillSourceId, fillSourceId)));
  const [activeRow] = await db()
    .select({ n: count() })
    .from(pools)
    .where(and(eq(pools.companyId, company.id), eq(pools.fillSourceId, fillSourceId), eq(pools.active, true)));
  const poolIds = onSource.map((p) => p.id);
  const { episodes } = await episodesAsOf(company, poolIds, now);
  const profiles: PoolProfile[] = onSource.map((p) => ({ poolId: String(p.id), fillSourceId: String(fillSourceId) }));
  const alerts = sharedSourceAlerts(episodes, profiles, {
    activePools: new Map([[String(fillSourceId), activeRow?.n ?? 0]]),
  });
  const since = now - ALERT_LOOKBACK_DAYS * DAY_MS;
  const recent = alerts.filter((a) => a.lastOpeningAt >= since);
  if (recent.length === 0) return [];
  const labels = await poolLabels({ companyId: company.id }, { poolIds: [...new Set(recent.flatMap((a) => a.poolIds.map(Number)))] });
  const common = { baseUrl: serverEnv().PATINA_URL, companyName: company.name, timeZone: company.timeZone };
  return recent.map((alert) => {
    const poolsInWave = alert.poolIds.map((id) => labels.get(Number(id))).filter((p): p is NonNullable<typeof p> => Boolean(p));
    return {
      kind: "shared_source" as const,
      // The wave keeps its first opening as it grows, so one wave is one event.
      dedupeKey: `shared:${fillSourceId}:${alert.metal}:${alert.firstOpeningAt}`,
      poolId: null,
      fillSourceId,
      metal: alert.metal,
      occurredAt: alert.lastOpeningAt,
      details: {
        poolIds: alert.poolIds.map(Number),
        activePools: alert.activePools,
        poolsRequired: alert.poolsRequired,
        firstOpeningAt: new Date(alert.firstOpeningAt).toISOString(),
        lastOpeningAt: new Date(alert.lastOpeningAt).toISOString(),
      },
      mail: sharedSourceMail({
        ...common,
        source,
        metal: alert.metal,
        firstOpeningAt: alert.firstOpeningAt,
        lastOpeningAt: alert.lastOpeningAt,
        pools: poolsInWave,
        activePools: alert.activePools,
        poolsRequired: alert.poolsRequired,
        windowDays: DEFAULT_SHARED_SOURCE_RULES.windowDays,
      }),
    };
  });
}

/**
 * Works out the pool's alerts from its metal readings (new episode, newly
 * recurring, a shared-source wave on its fill source), records each event once
 * and queues one e-mail per recipient. Safe to call any number of times.
 */
export async function recordAlertsForPool(companyId: number, poolId: number, options: { now?: Date } = {}): Promise<RecordedAlert[]> {
  return recordAlertsForPools(companyId, [poolId], options);
}

async function recordAlertsForPools(companyId: number, poolIds: readonly number[], options: { now?: Date }): Promise<RecordedAlert[]> {
  const company = await companyFor(companyId);
  if (!company) return [];
  const now = (options.now ?? new Date()).getTime();
  const unique = [...new Set(poolIds)];
  const events = await poolAlerts(company, unique, now);
  const labels = await poolLabels({ companyId }, { poolIds: unique });
  const sources = new Set([...labels.values()].map((p) => p.fillSourceId).filter((id): id is number => id !== null));
  for (const sourceId of sources) events.push(...(await sourceAlerts(company, sourceId, now)));
  return recordEvents(company, events);
}

export const ALERT_JOB = "alerts";

const alertJobPayload = z.object({ poolIds: z.array(z.number().int().positive()), at: z.iso.datetime() });

/**
 * For the visit log and the import: call after the tests are committed, e.g.
 * `void afterWaterTestsSaved(companyId, poolIds)`. The check is recorded as a
 * job first (background_jobs) and run under its claim, so when this instance
 * dies half-way another takes it over once the claim's lease ends; each
 * alert is still recorded once (UNIQUE company + key). It never throws, so a
 * problem with alerts can never undo or fail the save that triggered it.
 */
export async function afterWaterTestsSaved(
  companyId: number,
  poolIds: readonly number[],
  options: { now?: Date } = {},
): Promise<RecordedAlert[]> {
  try {
    const at = options.now ?? new Date();
    const claim = await claimJob({
      key: `${ALERT_JOB}:${companyId}:${randomUUID()}`,
      kind: ALERT_JOB,
      companyId,
      payload: { poolIds: [...new Set(poolIds)], at: at.toISOString() },
    });
    if (!claim) return [];
    return await runAlertJob(claim);
  } catch (error) {
    console.error(`[patina] alerts for company ${companyId} could not be worked out:`, error);
    return [];
  }
}

/** Works out the alerts of a claimed check, as of the moment the tests were saved. */
export async function runAlertJob(claim: JobClaim): Promise<RecordedAlert[]> {
  const payload = alertJobPayload.parse(claim.payload);
  if (claim.companyId === null) throw new Error(`alert job ${claim.key} names no company`);
  const companyId = claim.companyId;
  return runClaimed(claim, () => recordAlertsForPools(companyId, payload.poolIds, { now: new Date(payload.at) }));
}
