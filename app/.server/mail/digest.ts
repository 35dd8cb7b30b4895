import { TZDate } from "@date-fns/tz";
import { format } from "date-fns";
import { and, eq, inArray } from "drizzle-orm";
import { z } from "zod";
import { analyseMetalHistory, DAY_MS, type Episode, type PoolObservation } from "@analysis/metals/episodes";
import { testsReadAs } from "@analysis/metals/kept-history";
import { type Metal, METALS, type MetalThresholds } from "@analysis/metals/reading";
import { buildCourses, courseOutcomes } from "@analysis/outcomes/treatments";
import { groupComparison, type GroupingKey } from "@analysis/stats/groups";
import { companySettings } from "../settings/queries/company-settings";
import { db } from "../db/client";
import { companies, mailOutbox, memberships, user } from "../db/schema";
import { serverEnv } from "../env";
import { claimJob, type JobClaim, runClaimed } from "../jobs/claims";
import { keptEpisodeList, keptSpans, keptVersionAsOf, type AnswerSource } from "../analytics/kept/read-kept";
import { poolProfiles, type PoolLabel } from "../analytics/queries/pool-profiles";
import { observationInstants } from "~/lib/analytics/observation-points";
import { isWithin } from "../analytics/queries/tenant-and-window";
import { treatmentRows, waterTestReadings } from "../analytics/queries/metal-readings";
import { digestMail, type WeeklyDigest } from "./digest-message";
import { enqueueMail, signalMailQueued } from "./outbox";
import { preferencesFor } from "./preferences";

const WEEK_MS = 7 * DAY_MS;

/** Groupings the digest reports; heater age and exchanger metal need observed time split at equipment dates, which the risk page does. */
const DIGEST_GROUPINGS: Array<{ key: GroupingKey; label: string }> = [
  { key: "fill-source", label: "Fill source" },
  { key: "fill-source-kind", label: "Kind of fill source" },
  { key: "route", label: "Route" },
  { key: "neighbourhood", label: "Neighbourhood" },
  { key: "surface", label: "Surface" },
  { key: "sanitiser", label: "Sanitiser" },
];

function becameRecurring(episodes: readonly Episode[]): Array<{ episode: Episode; previous: Episode }> {
  const found: Array<{ episode: Episode; previous: Episode }> = [];
  const byPoolMetal = new Map<string, Episode[]>();
  for (const e of episodes) {
    const key = `${e.poolId}:${e.metal}`;
    byPoolMetal.set(key, [...(byPoolMetal.get(key) ?? []), e]);
  }
  for (const list of byPoolMetal.values()) {
    list.sort((a, b) => a.openedAt - b.openedAt);
    list.forEach((e, i) => {
      const previous = list[i - 1];
      if (e.recurrence && previous && !previous.recurrence) found.push({ episode: e, previous });
    });
  }
  return found;
}

/**
 * The company's week in figures, the same for every owner and manager: open
 * metal episodes, pools that became recurring, groups with more episodes than the
 * rest of the route book, and treatments whose follow-up came in this week.
 */
export async function weeklyDigestFor(companyId: number, now: Date): Promise<WeeklyDigest | null> {
  const company = await companySettings(companyId);
  if (!company) return null;
  const { thresholds } = company;
  const weekStart = now.getTime() - WEEK_MS;
  const week = { from: new Date(weekStart), to: now };
  const [book, applied, found] = await Promise.all([
    poolProfiles({ companyId }),
    treatmentRows({ companyId }, { window: { from: new Date(now.getTime() - 45 * DAY_MS), to: now } }),
    episodesAndSpans(companyId, thresholds, now),
  ]);
  // Treatment results need the treated pools' own tests (with pH), read alike either way.
  const treatedPools = new Set(applied.map((t) => t.poolId));
  const tests =
    found.tests?.filter((t) => treatedPools.has(t.poolId)) ??
    (await waterTestReadings({ companyId }, { poolIds: [...treatedPools].map(Number), window: { from: null, to: now }, with: { ph: true } }));
  const history = { episodes: found.episodes };
  const poolOf = (id: string): PoolLabel | undefined => book.labels.get(Number(id));

  const openCases = history.episodes
    .filter((e) => e.censored)
    .sort((a, b) => a.openedAt - b.openedAt)
    .map((e) => ({
      pool: poolOf(e.poolId)!,
      metal: e.metal,
      openedAt: e.openedAt,
      daysOpen: Math.floor((now.getTime() - e.openedAt) / DAY_MS),
      peak: e.peak,
    }))
    .filter((c) => c.pool);

  const newRecurring = becameRecurring(history.episodes)
    .filter(({ episode }) => isWithin(episode.openedAt, week))
    .map(({ episode, previous }) => ({ pool: poolOf(episode.poolId)!, metal: episode.metal, openedAt: episode.openedAt, previousOpenedAt: previous.openedAt }))
    .filter((r) => r.pool);

  const labels = [...book.labels.values()];
  const groupName = (key: GroupingKey, group: string): string => {
    if (key === "fill-source") return labels.find((p) => String(p.fillSourceId) === group)?.fillSourceName ?? group;
    if (key === "route") return labels.find((p) => String(p.routeId) === group)?.routeName ?? group;
    return group.replaceAll("-", " ");
  };
  const profiles = new Map(book.profiles.map((p) => [p.poolId, p]));
  const instantsOf = (key: GroupingKey) =>
    found.spans.flatMap((span) => {
      const pool = profiles.get(span.poolId);
      return pool ? observationInstants(pool, span.firstTestAt, span.lastTestAt, key).map((takenAt) => ({ poolId: span.poolId, takenAt })) : [];
    });
  const riskyGroups = DIGEST_GROUPINGS.flatMap(({ key, label }) =>
    groupComparison(book.profiles, instantsOf(key), history.episodes, key)
      .filter((g) => g.risky)
      .map((g) => ({
        grouping: label,
        group: groupName(key, g.group),
        pools: g.pools,
        openings: g.openings,
        perPoolYear: g.rate.estimate,
        rateRatio: g.rateRatio,
      })),
  );

  const courses = buildCourses(applied);
  const productName = new Map(applied.map((t) => [String(t.productId), t.productName]));
  const inWeek = (at: number | null | undefined) => typeof at === "number" && isWithin(at, week);
  const treatmentResults = METALS.flatMap((metal: Metal) =>
    courseOutcomes(courses, tests, metal, { thresholds })
      .filter((o) => o.ineligible === null && (inWeek(o.firstFollowUp?.takenAt) || inWeek(o.clearedAt)))
      .map((o) => ({
        pool: poolOf(o.course.poolId)!,
        treatment: o.course.productIds.map((id) => productName.get(id) ?? id).join(" + "),
        metal,
        startedAt: o.course.startAt,
        baseline: o.baseline!.value,
        followUp: o.firstFollowUp ? { value: o.firstFollowUp.value, belowDetection: o.firstFollowUp.belowDetection, daysAfter: o.firstFollowUp.daysAfter } : null,
        percentReduction: o.percentReduction,
        clearedAt: o.clearedAt,
      }))
      .filter((r) => r.pool),
  ).sort((a, b) => a.startedAt - b.startedAt);

  return {
    companyName: company.name,
    timeZone: company.timeZone,
    weekStart,
    weekEnd: now.getTime(),
    openCases,
    newRecurring,
    riskyGroups,
    treatmentResults,
    source: found.source,
  };
}

/**
 * The company's metal episodes (every metal) and each pool's observed span
 * (first and last test of any analyte) up to `now`: from the kept rows when
 * they answer as of `now`, else worked out from every test, which are then
 * handed back for the rest of the digest.
 */
async function episodesAndSpans(companyId: number, thresholds: MetalThresholds, now: Date) {
  const versionId = await keptVersionAsOf(companyId, thresholds, now);
  if (versionId !== null) {
    const [episodes, spans] = await Promise.all([keptEpisodeList({ companyId }, versionId, "all"), keptSpans({ companyId }, versionId, "any")]);
    return { episodes, spans, tests: null, source: "kept" as AnswerSource };
  }
  const tests = await waterTestReadings({ companyId }, { window: { from: null, to: now }, with: { ph: true } });
  // The episodes' openings, peaks and recurrence are those of the tests with a metal; the spans count every test.
  const episodes = analyseMetalHistory(testsReadAs(tests, "all"), { thresholds }).episodes;
  const spans: PoolObservation[] = [];
  for (const t of tests) {
    const last = spans[spans.length - 1];
    if (last?.poolId === t.poolId) {
      last.lastTestAt = t.takenAt;
      last.tests++;
    } else spans.push({ poolId: t.poolId, firstTestAt: t.takenAt, lastTestAt: t.takenAt, tests: 1 });
  }
  return { episodes, spans, tests, source: "recomputed" as AnswerSource };
}

/** ISO week of the moment in the company's time zone, e.g. "2026-W26": one digest per member and week. */
export function digestWeek(now: Date, timeZone: string): string {
  return format(new TZDate(now.getTime(), timeZone), "RRRR-'W'II");
}

/** Monday from 07:00 local time: when the scheduled run sends a company's digest. */
export function digestIsDue(now: Date, timeZone: string): boolean {
  const local = new TZDate(now.getTime(), timeZone);
  return local.getDay() === 1 && local.getHours() >= 7;
}

export type DigestRun = { companies: number; queued: number };

export const DIGEST_JOB = "digest";

/** One digest job per company and ISO week, whichever instance runs it. */
export function digestJobKey(companyId: number, week: string): string {
  return `digest:${companyId}:${week}`;
}

const digestJobPayload = z.object({ week: z.string().min(1), at: z.iso.datetime() });

/**
 * Queues the week's digest of one company for every owner and manager who has
 * not turned it off and has not had it yet (the outbox key is per member and
 * week, so a run taken over half-way queues only the rest).
 */
async function queueCompanyDigest(companyId: number, now: Date, week: string): Promise<{ computed: boolean; queued: number }> {
  const members = await db()
    .select({ membershipId: memberships.id, email: user.email, name: user.name })
    .from(memberships)
    .innerJoin(user, eq(user.id, memberships.userId))
    .where(and(eq(memberships.companyId, companyId), inArray(memberships.role, ["owner", "manager"])));
  const keyOf = (membershipId: number) => `digest:${membershipId}:${week}`;
  const already = new Set(
    members.length === 0
      ? []
      : (
          await db()
            .select({ key: mailOutbox.dedupeKey })
            .from(mailOutbox)
            .where(inArray(mailOutbox.dedupeKey, members.map((m) => keyOf(m.membershipId))))
        ).map((r) => r.key),
  );
  const waiting: Array<(typeof members)[number] & { unsubscribeToken: string }> = [];
  for (const member of members) {
    if (already.has(keyOf(member.membershipId))) continue;
    const preferences = await preferencesFor(member.membershipId);
    if (preferences.digest) waiting.push({ ...member, unsubscribeToken: preferences.unsubscribeToken });
  }
  if (waiting.length === 0) return { computed: false, queued: 0 };
  const digest = await weeklyDigestFor(companyId, now);
  if (!digest) return { computed: false, queued: 0 };
  let queued = 0;
  for (const member of waiting) {
    const added = await enqueueMail({
      companyId,
      dedupeKey: keyOf(member.membershipId),
      kind: "digest",
      recipient: member.email,
      mail: digestMail(digest, { baseUrl: serverEnv().PATINA_URL, recipientName: member.name, unsubscribeToken: member.unsubscribeToken, week }),
    });
    if (added) queued++;
  }
  return { computed: true, queued };
}

/**
 * Queues this week's digest for every owner and manager who has not turned it
 * off. Each company's week is one job (background_jobs): the instance that
 * claims it sends it, others leave it, and once done it is not run again that
 * week, so every instance's scheduler may call this every hour. A job whose
 * instance died is taken over when its lease ends. With onlyDue it leaves
 * companies alone until their Monday morning.
 */
export async function sendWeeklyDigests(now: Date = new Date(), options: { onlyDue?: boolean; companyIds?: number[] } = {}): Promise<DigestRun> {
  const all = await db()
    .select({ id: companies.id, timeZone: companies.timeZone })
    .from(companies)
    .where(options.companyIds ? inArray(companies.id, options.companyIds) : undefined);
  const run: DigestRun = { companies: 0, queued: 0 };
  for (const company of all) {
    if (options.onlyDue && !digestIsDue(now, company.timeZone)) continue;
    const week = digestWeek(now, company.timeZone);
    const claim = await claimJob({
      key: digestJobKey(company.id, week),
      kind: DIGEST_JOB,
      companyId: company.id,
      payload: { week, at: now.toISOString() },
    });
    if (!claim) continue;
    try {
      const result = await runClaimed(claim, () => queueCompanyDigest(company.id, now, week));
      if (result.computed) run.companies++;
      run.queued += result.queued;
    } catch (error) {
      // Its job is tried again later (by this or another instance); the other companies go on.
      console.error(`[patina] the weekly digest of company ${company.id} failed:`, error);
    }
  }
  if (run.queued > 0) signalMailQueued();
  return run;
}

/** Finishes a digest job taken over from an instance that died, for the week and moment it was started. */
export async function runDigestJob(claim: JobClaim): Promise<number> {
  const payload = digestJobPayload.parse(claim.payload);
  if (claim.companyId === null) throw new Error(`digest job ${claim.key} names no company`);
  const companyId = claim.companyId;
  const { queued } = await runClaimed(claim, () => queueCompanyDigest(companyId, new Date(payload.at), payload.week));
  if (queued > 0) signalMailQueued();
  return queued;
}
