import { asc, eq } from "drizzle-orm";
import { db } from "../db/client";
import { memberships } from "../db/schema";
import { serverEnv } from "../env";
import { passwordResetMail } from "./messages";
import { enqueueMail, signalMailQueued } from "./outbox";

export const RESET_LINK_MINUTES = 60;

/** better-auth calls this from its own reset flow; the mail goes through the outbox like every other. */
export async function enqueuePasswordResetMail(account: { id: string; name: string; email: string }, token: string) {
  const [membership] = await db()
    .select({ companyId: memberships.companyId })
    .from(memberships)
    .where(eq(memberships.userId, account.id))
    .orderBy(asc(memberships.id))
    .limit(1);
  await enqueueMail({
    companyId: membership?.companyId ?? null,
    dedupeKey: `password-reset:${token}`,
    kind: "password_reset",
    recipient: account.email,
    mail: passwordResetMail({ baseUrl: serverEnv().PATINA_URL, name: account.name, token, validMinutes: RESET_LINK_MINUTES }),
  });
  signalMailQueued();
}
