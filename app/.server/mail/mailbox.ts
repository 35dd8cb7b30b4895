import { and, desc, eq } from "drizzle-orm";
import { db } from "../db/client";
import { mailOutbox } from "../db/schema";
import type { Scope } from "../scope";

/** What the company's outbox holds, newest first: the development mail viewer reads this. */
export async function outboxMessages(scope: Scope, limit = 200) {
  return db()
    .select({
      id: mailOutbox.id,
      kind: mailOutbox.kind,
      recipient: mailOutbox.recipient,
      subject: mailOutbox.subject,
      status: mailOutbox.status,
      attempts: mailOutbox.attempts,
      nextAttemptAt: mailOutbox.nextAttemptAt,
      lastError: mailOutbox.lastError,
      sentAt: mailOutbox.sentAt,
      createdAt: mailOutbox.createdAt,
    })
    .from(mailOutbox)
    .where(eq(mailOutbox.companyId, scope.companyId))
    .orderBy(desc(mailOutbox.createdAt), desc(mailOutbox.id))
    .limit(limit);
}

export async function outboxMessage(scope: Scope, messageId: number) {
  const [message] = await db()
    .select()
    .from(mailOutbox)
    .where(and(eq(mailOutbox.id, messageId), eq(mailOutbox.companyId, scope.companyId)));
  return message ?? null;
}
