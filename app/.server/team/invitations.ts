import { createHash, randomBytes, randomUUID } from "node:crypto";
import { hashPassword } from "better-auth/crypto";
import { and, desc, eq, gt, isNull, sql } from "drizzle-orm";
import type { RoleName } from "~/lib/roles";
import { db } from "../db/client";
import { account, companies, invitations, memberships, user } from "../db/schema";
import { serverEnv } from "../env";
import type { Scope } from "../scope";
import { invitationMail } from "../mail/messages";
import { enqueueMail, signalMailQueued } from "../mail/outbox";

export const INVITATION_DAYS = 7;
const DAY_MS = 86_400_000;

export function hashToken(token: string): string {
  return createHash("sha256").update(token).digest("hex");
}

export function normaliseEmail(email: string): string {
  return email.trim().toLowerCase();
}

export type InviteResult =
  | { ok: true; invitationId: number; expiresAt: Date }
  | { ok: false; field: "email"; message: string };

/** Records the invitation and its e-mail together; only the token's hash is kept. */
export async function inviteMember(
  scope: Scope,
  input: { email: string; role: RoleName },
  now = new Date(),
): Promise<InviteResult> {
  const email = normaliseEmail(input.email);
  const [existing] = await db()
    .select({ id: memberships.id })
    .from(memberships)
    .innerJoin(user, eq(user.id, memberships.userId))
    .where(and(eq(memberships.companyId, scope.companyId), eq(user.email, email)));
  if (existing) return { ok: false, field: "email", message: `${email} is already a member of ${scope.companyName}.` };

  const token = randomBytes(32).toString("base64url");
  const expiresAt = new Date(now.getTime() + INVITATION_DAYS * DAY_MS);
  const invitationId = await db().transaction(async (tx) => {
    const [created] = await tx
      .insert(invitations)
      .values({ companyId: scope.companyId, email, role: input.role, tokenHash: hashToken(token), invitedBy: scope.userId, expiresAt })
      .$returningId();
    await enqueueMail(
      {
        companyId: scope.companyId,
        dedupeKey: `invitation:${created!.id}`,
        kind: "invitation",
        recipient: email,
        mail: invitationMail({
          baseUrl: serverEnv().PATINA_URL,
          companyName: scope.companyName,
          invitedByName: scope.userName,
          role: input.role,
          token,
          expiresAt,
        }),
      },
      tx,
    );
    return created!.id;
  });
  signalMailQueued();
  return { ok: true, invitationId, expiresAt };
}

export type PendingInvitation = { id: number; email: string; role: RoleName; expiresAt: Date; createdAt: Date };

export async function pendingInvitations(scope: Scope, now = new Date()): Promise<PendingInvitation[]> {
  return db()
    .select({
      id: invitations.id,
      email: invitations.email,
      role: invitations.role,
      expiresAt: invitations.expiresAt,
      createdAt: invitations.createdAt,
    })
    .from(invitations)
    .where(and(eq(invitations.companyId, scope.companyId), isNull(invitations.acceptedAt), gt(invitations.expiresAt, now)))
    .orderBy(desc(invitations.createdAt));
}

/** Withdraws a pending invitation of the member's own company (its link stops working). */
export async function withdrawInvitation(scope: Scope, invitationId: number, now = new Date()): Promise<boolean> {
  const [result] = await db()
    .update(invitations)
    .set({ expiresAt: now })
    .where(and(eq(invitations.id, invitationId), eq(invitations.companyId, scope.companyId), isNull(invitations.acceptedAt)));
  return result.affectedRows === 1;
}

export type InvitationView =
  | { state: "open"; email: string; role: RoleName; companyName: string; expiresAt: Date }
  | { state: "expired" | "used" | "unknown" };

export async function invitationByToken(token: string, now = new Date()): Promise<InvitationView> {
  const [row] = await db()
    .select({
      email: invitations.email,
      role: invitations.role,
      expiresAt: invitations.expiresAt,
      acceptedAt: invitations.acceptedAt,
      companyName: companies.name,
    })
    .from(invitations)
    .innerJoin(companies, eq(companies.id, invitations.companyId))
    .where(eq(invitations.tokenHash, hashToken(token)));
  if (!row) return { state: "unknown" };
  if (row.acceptedAt) return { state: "used" };
  if (row.expiresAt <= now) return { state: "expired" };
  return { state: "open", email: row.email, role: row.role, companyName: row.companyName, expiresAt: row.expiresAt };
}

export type AcceptResult =
  | { ok: true; email: string; companyId: number; role: RoleName }
  | { ok: false; reason: "unknown" | "expired" | "used" | "account_exists"; message: string };

const REFUSALS = {
  unknown: "This invitation link is not valid. Ask the person who invited you for a new one.",
  expired: "This invitation has expired. Ask the person who invited you for a new one.",
  used: "This invitation has already been used. Sign in with the account it created.",
  account_exists: "There is already a Patina account for this e-mail address. Sign in with it, or ask for an invitation to another address.",
} as const;

/**
 * Creates the account, its password and the membership named by the
 * invitation, all in one transaction that also spends the invitation. The
 * company and role come only from the invitation row, never from the form.
 */
export async function acceptInvitation(
  token: string,
  input: { name: string; password: string },
  now = new Date(),
): Promise<AcceptResult> {
  const passwordHash = await hashPassword(input.password);
  return db().transaction(async (tx) => {
    const [invitation] = await tx
      .select()
      .from(invitations)
      .where(eq(invitations.tokenHash, hashToken(token)))
      .for("update");
    if (!invitation) return { ok: false, reason: "unknown", message: REFUSALS.unknown };
    if (invitation.acceptedAt) return { ok: false, reason: "used", message: REFUSALS.used };
    if (invitation.expiresAt <= now) return { ok: false, reason: "expired", message: REFUSALS.expired };
    const email = normaliseEmail(invitation.email);
    const [taken] = await tx.select({ id: user.id }).from(user).where(eq(user.email, email));
    if (taken) return { ok: false, reason: "account_exists", message: REFUSALS.account_exists };

    const userId = randomUUID().replaceAll("-", "");
    await tx.insert(user).values({ id: userId, name: input.name, email, emailVerified: true });
    await tx.insert(account).values({
      id: randomUUID().replaceAll("-", ""),
      accountId: userId,
      providerId: "credential",
      userId,
      password: passwordHash,
    });
    await tx.insert(memberships).values({ companyId: invitation.companyId, userId, role: invitation.role });
    const [spent] = await tx
      .update(invitations)
      .set({ acceptedAt: now, acceptedBy: userId })
      .where(and(eq(invitations.id, invitation.id), isNull(invitations.acceptedAt), sql`${invitations.expiresAt} > ${now}`));
    if (spent.affectedRows !== 1) throw new Error("invitation changed while it was being accepted");
    return { ok: true, email, companyId: invitation.companyId, role: invitation.role };
  });
}
