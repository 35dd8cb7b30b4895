import { randomBytes } from "node:crypto";
import { eq, sql } from "drizzle-orm";
import { db } from "../db/client";
import { companies, mailPreferences, memberships, user } from "../db/schema";
import type { Executor } from "./outbox";

export type MailPreferences = typeof mailPreferences.$inferSelect;

/** A member's preferences, created on first use with defaults and a fresh unsubscribe token. */
export async function preferencesFor(membershipId: number, executor: Executor = db()): Promise<MailPreferences> {
  await executor
    .insert(mailPreferences)
    .values({ membershipId, unsubscribeToken: randomBytes(24).toString("base64url") })
    .onDuplicateKeyUpdate({ set: { membershipId: sql`membership_id` } });
  const [row] = await executor.select().from(mailPreferences).where(eq(mailPreferences.membershipId, membershipId));
  return row!;
}

export type UnsubscribeResult = { ok: true; email: string; companyName: string } | { ok: false };

/** Turns the weekly digest off for the member the token belongs to; repeating it changes nothing. */
export async function unsubscribeFromDigest(token: string): Promise<UnsubscribeResult> {
  const [row] = await db()
    .select({ membershipId: mailPreferences.membershipId, email: user.email, companyName: companies.name })
    .from(mailPreferences)
    .innerJoin(memberships, eq(memberships.id, mailPreferences.membershipId))
    .innerJoin(user, eq(user.id, memberships.userId))
    .innerJoin(companies, eq(companies.id, memberships.companyId))
    .where(eq(mailPreferences.unsubscribeToken, token));
  if (!row) return { ok: false };
  await db()
    .update(mailPreferences)
    .set({ digest: false, updatedAt: new Date() })
    .where(eq(mailPreferences.membershipId, row.membershipId));
  return { ok: true, email: row.email, companyName: row.companyName };
}
