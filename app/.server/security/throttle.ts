import { sql } from "drizzle-orm";
import { db } from "../db/client";
import { authThrottle } from "../db/schema";

export type ThrottledAction = "sign-in" | "reset";
type Rule = { max: number; windowSeconds: number };

/**
 * Per account and per client address. An address gets more room than an
 * account, so one office behind one address is not locked out by a single
 * forgetful member; an account's limit holds whatever address asks.
 * Sign-in counts failures; a reset request counts every request (each sends mail).
 */
export const THROTTLE_RULES: Record<
  ThrottledAction,
  { account: Rule; address: Rule }
> = {
  "sign-in": {
    account: { max: 5, windowSeconds: 15 * 60 },
    address: { max: 30, windowSeconds: 15 * 60 },
  },
  reset: {
    account: { max: 8, windowSeconds: 60 * 60 },
    address: { max: 5, windowSeconds: 15 * 60 },
  },
};

export type Subjects = { account: string; address: string };
export type ThrottleVerdict =
  | { allowed: true }
  | { allowed: false; retryAfterSeconds: number; retryAt: Date };

function buckets(action: ThrottledAction, subjects: Subjects) {
  const rules = THROTTLE_RULES[action];
  return [
    {
      bucket:
        `${action}:account:${subjects.account.trim().toLowerCase()}`.slice(
          0,
          320,
        ),
      rule: rules.account,
    },
    {
      bucket: `${action}:address:${subjects.address}`.slice(0, 320),
      rule: rules.address,
    },
  ];
}

/** Refused while any of the two buckets is full in its current window. */
export async function checkThrottle(
  action: ThrottledAction,
  subjects: Subjects,
): Promise<ThrottleVerdict> {
  let retryAfterSeconds = 0;
  for (const { bucket, rule } of buckets(action, subjects)) {
    const [row] = await db()
      .select({
        attempts: authThrottle.attempts,
        secondsLeft: sql<number>`CEIL(TIMESTAMPDIFF(MICROSECOND, UTC_TIMESTAMP(3), ${authThrottle.windowEndsAt}) / 1000000)`,
      })
      .from(authThrottle)
      .where(sql`${authThrottle.bucket} = ${bucket}`);
    const secondsLeft = Number(row?.secondsLeft ?? 0);
    if (row && secondsLeft > 0 && row.attempts >= rule.max)
      retryAfterSeconds = Math.max(retryAfterSeconds, secondsLeft);
  }
  if (retryAfterSeconds === 0) return { allowed: true };
  return {
    allowed: false,
    retryAfterSeconds,
    retryAt: new Date(Date.now() + retryAfterSeconds * 1000),
  };
}

/** Counts one attempt in both buckets; a bucket whose window has passed starts a new one. */
export async function recordAttempt(
  action: ThrottledAction,
  subjects: Subjects,
): Promise<void> {
  for (const { bucket, rule } of buckets(action, subjects)) {
    await db().execute(sql`
      INSERT INTO auth_throttle (bucket, attempts, window_ends_at)
      VALUES (${bucket}, 1, UTC_TIMESTAMP(3) + INTERVAL ${rule.windowSeconds} SECOND)
      ON DUPLICATE KEY UPDATE
        attempts = IF(window_ends_at <= UTC_TIMESTAMP(3), 1, attempts + 1),
        window_ends_at = IF(window_ends_at <= UTC_TIMESTAMP(3), UTC_TIMESTAMP(3) + INTERVAL ${rule.windowSeconds} SECOND, window_ends_at)`);
  }
}

/** A correct password clears its account's failures (the address keeps its count). */
export async function clearAccount(
  action: ThrottledAction,
  account: string,
): Promise<void> {
  const accountBucket = buckets(action, { account, address: "" })[0]!.bucket;
  await db()
    .delete(authThrottle)
    .where(sql`${authThrottle.bucket} = ${accountBucket}`);
}

/** "Try again in 12 minutes (at 14:05 UTC)." */
export function retryMessage(verdict: {
  retryAfterSeconds: number;
  retryAt: Date;
}): string {
  const minutes = Math.max(1, Math.ceil(verdict.retryAfterSeconds / 60));
  const at = verdict.retryAt.toISOString().slice(11, 16);
  return `Try again in ${minutes} minute${minutes === 1 ? "" : "s"} (at ${at} UTC).`;
}
