import { randomUUID } from "node:crypto";
import { hostname } from "node:os";
import { and, asc, eq, isNotNull, isNull, lte, or, sql } from "drizzle-orm";
import { db } from "../db/client";
import { backgroundJobs } from "../db/schema";
import { serverEnv } from "../env";

/**
 * Claims on background jobs, so that work any instance may start runs on one
 * instance at a time and is finished once: a row per job (unique key per job
 * and period), claimed with a conditional write, held by a lease renewed while
 * the work runs. A lease that ran out (its instance died or hung) lets the
 * next instance take the job over. Lease times are the database's clock, so
 * instances with clocks apart agree on them.
 */

export type JobSpec = { key: string; kind: string; companyId: number | null; payload: Record<string, unknown> };

export type JobClaim = { id: number; key: string; kind: string; companyId: number | null; token: string; payload: Record<string, unknown>; attempts: number };

/** After this many failed attempts a job is marked failed and left alone. */
export const MAX_JOB_ATTEMPTS = 5;

/** This process, as the claim records it. */
export function claimHolder(): string {
  return `${hostname()}:${process.pid}`.slice(0, 255);
}

export function jobLeaseMs(): number {
  return serverEnv().PATINA_JOB_LEASE_SECONDS * 1000;
}

const leaseEnd = (ms: number) => sql`NOW(3) + INTERVAL ${Math.round(ms * 1000)} MICROSECOND`;
/** Claimable: pending, and no lease or a lease that has ended. */
const lapsed = or(isNull(backgroundJobs.claimExpiresAt), lte(backgroundJobs.claimExpiresAt, sql`NOW(3)`));

/** Two instances writing the same row at once: on a cluster one of them gets a deadlock; that one has lost the claim. */
function isLostRace(error: unknown): boolean {
  const errno = (error as { errno?: number; cause?: { errno?: number } }).errno ?? (error as { cause?: { errno?: number } }).cause?.errno;
  return errno === 1213 || errno === 1205;
}

async function readClaim(where: ReturnType<typeof eq>, token: string): Promise<JobClaim | null> {
  const [row] = await db().select().from(backgroundJobs).where(and(where, eq(backgroundJobs.claimToken, token)));
  return row
    ? { id: row.id, key: row.jobKey, kind: row.kind, companyId: row.companyId, token, payload: row.payload, attempts: row.attempts }
    : null;
}

/**
 * Claims the job, creating its row the first time it is asked for. Null when
 * another instance holds it, or when it is already done (or gave up).
 */
export async function claimJob(spec: JobSpec, leaseMs = jobLeaseMs()): Promise<JobClaim | null> {
  const token = randomUUID();
  try {
    const [inserted] = await db()
      .insert(backgroundJobs)
      .ignore()
      .values({
        jobKey: spec.key.slice(0, 191),
        kind: spec.kind,
        companyId: spec.companyId,
        payload: spec.payload,
        attempts: 1,
        claimToken: token,
        claimedBy: claimHolder(),
        claimExpiresAt: leaseEnd(leaseMs),
      });
    if (inserted.affectedRows === 1) return readClaim(eq(backgroundJobs.jobKey, spec.key.slice(0, 191)), token);
    return await takeOver(eq(backgroundJobs.jobKey, spec.key.slice(0, 191)), token, leaseMs);
  } catch (error) {
    if (isLostRace(error)) return null;
    throw error;
  }
}

/** Claims a job already in the table (the sweeper's way in) if it is pending and its lease has ended. */
export async function claimJobById(id: number, leaseMs = jobLeaseMs()): Promise<JobClaim | null> {
  try {
    return await takeOver(eq(backgroundJobs.id, id), randomUUID(), leaseMs);
  } catch (error) {
    if (isLostRace(error)) return null;
    throw error;
  }
}

async function takeOver(which: ReturnType<typeof eq>, newToken: string, leaseMs: number): Promise<JobClaim | null> {
  const [claimed] = await db()
    .update(backgroundJobs)
    .set({
      claimToken: newToken,
      claimedBy: claimHolder(),
      claimExpiresAt: leaseEnd(leaseMs),
      attempts: sql`${backgroundJobs.attempts} + 1`,
    })
    .where(and(which, eq(backgroundJobs.status, "pending"), lapsed));
  return claimed.affectedRows === 1 ? readClaim(which, newToken) : null;
}

/** Extends the lease; false when the claim was lost (taken over after it lapsed). */
export async function renewClaim(claim: JobClaim, leaseMs = jobLeaseMs()): Promise<boolean> {
  const [renewed] = await db()
    .update(backgroundJobs)
    .set({ claimExpiresAt: leaseEnd(leaseMs) })
    .where(and(eq(backgroundJobs.id, claim.id), eq(backgroundJobs.claimToken, claim.token), eq(backgroundJobs.status, "pending")));
  return renewed.affectedRows === 1;
}

/** Marks the job done; false when another instance had taken it over meanwhile. */
export async function finishJob(claim: JobClaim): Promise<boolean> {
  const [finished] = await db()
    .update(backgroundJobs)
    .set({ status: "done", finishedAt: sql`NOW(3)`, claimExpiresAt: null, lastError: null })
    .where(and(eq(backgroundJobs.id, claim.id), eq(backgroundJobs.claimToken, claim.token)));
  return finished.affectedRows === 1;
}

/** Wait before the next attempt after n failed ones: 1, 2, 4, 8 minutes. */
export function jobRetryDelayMs(attempts: number): number {
  return 60_000 * 2 ** Math.max(0, attempts - 1);
}

/** Gives the job back after a failure: tried again after a pause, or marked failed after the last attempt. */
export async function failJob(claim: JobClaim, error: unknown): Promise<void> {
  const giveUp = claim.attempts >= MAX_JOB_ATTEMPTS;
  await db()
    .update(backgroundJobs)
    .set({
      status: giveUp ? "failed" : "pending",
      claimToken: null,
      claimExpiresAt: giveUp ? null : leaseEnd(jobRetryDelayMs(claim.attempts)),
      finishedAt: giveUp ? sql`NOW(3)` : null,
      lastError: String(error instanceof Error ? error.message : error).slice(0, 2000),
    })
    .where(and(eq(backgroundJobs.id, claim.id), eq(backgroundJobs.claimToken, claim.token)));
}

/**
 * Runs the work under the claim, renewing its lease every third of it, and
 * marks the job done or failed. The work's own result or error is passed on.
 */
export async function runClaimed<T>(claim: JobClaim, work: (claim: JobClaim) => Promise<T>, leaseMs = jobLeaseMs()): Promise<T> {
  const heartbeat = setInterval(() => {
    renewClaim(claim, leaseMs).catch((error: unknown) => console.error(`[patina] could not renew the claim on job ${claim.key}:`, error));
  }, Math.max(200, Math.floor(leaseMs / 3)));
  heartbeat.unref();
  try {
    const result = await work(claim);
    clearInterval(heartbeat);
    await finishJob(claim);
    return result;
  } catch (error) {
    clearInterval(heartbeat);
    await failJob(claim, error).catch((failure: unknown) => console.error(`[patina] could not record the failure of job ${claim.key}:`, failure));
    throw error;
  }
}

/** Pending jobs whose lease has ended (their instance died, or a retry is due), oldest first. */
export async function lapsedJobs(limit = 20): Promise<Array<{ id: number; kind: string }>> {
  return db()
    .select({ id: backgroundJobs.id, kind: backgroundJobs.kind })
    .from(backgroundJobs)
    .where(and(eq(backgroundJobs.status, "pending"), isNotNull(backgroundJobs.claimExpiresAt), lte(backgroundJobs.claimExpiresAt, sql`NOW(3)`)))
    .orderBy(asc(backgroundJobs.claimExpiresAt))
    .limit(limit);
}

/** Finished jobs are kept this long (a week's digest must stay marked done through its week), then removed. */
const KEEP_FINISHED_DAYS = 35;

export async function pruneFinishedJobs(): Promise<number> {
  const [pruned] = await db().execute(
    sql`DELETE FROM ${backgroundJobs} WHERE ${backgroundJobs.finishedAt} < NOW(3) - INTERVAL ${KEEP_FINISHED_DAYS} DAY LIMIT 1000`,
  );
  return (pruned as unknown as { affectedRows: number }).affectedRows;
}
