import { and, asc, eq, lte } from "drizzle-orm";
import { db, type Database } from "../db/client";
import { mailOutbox } from "../db/schema";
import { serverEnv } from "../env";
import type { RenderedMail } from "./templates";
import { sendMail } from "./transport";

/** The database or an open transaction: enqueueing joins the caller's transaction. */
export type Executor = Database | Parameters<Parameters<Database["transaction"]>[0]>[0];

export type MailKind = "invitation" | "password_reset" | "alert" | "digest";

export type EnqueueRequest = {
  companyId: number | null;
  /** One message per recipient and event: a second enqueue with the same key is ignored. */
  dedupeKey: string;
  kind: MailKind;
  recipient: string;
  mail: RenderedMail;
};

/**
 * Puts a message in the outbox. Returns false when the same key was already
 * there (nothing is sent twice). Call it inside the transaction that records
 * the event, so the event and its mail are stored together or not at all.
 */
export async function enqueueMail(request: EnqueueRequest, executor: Executor = db()): Promise<boolean> {
  // INSERT IGNORE rather than ON DUPLICATE KEY UPDATE: mysql2 counts a found
  // row as affected, so only IGNORE's 0 tells a duplicate apart.
  const [result] = await executor
    .insert(mailOutbox)
    .ignore()
    .values({
      companyId: request.companyId,
      dedupeKey: request.dedupeKey.slice(0, 191),
      kind: request.kind,
      recipient: request.recipient,
      subject: request.mail.subject.slice(0, 255),
      html: request.mail.html,
      text: request.mail.text,
    });
  return result.affectedRows === 1;
}

const signalHolder = globalThis as typeof globalThis & { __patinaMailQueued?: EventTarget };

function mailQueuedSignal(): EventTarget {
  signalHolder.__patinaMailQueued ??= new EventTarget();
  return signalHolder.__patinaMailQueued;
}

/**
 * Tells this process's sender, if it runs one, that mail is waiting. Call it
 * after the transaction that queued the mail has committed.
 */
export function signalMailQueued(): void {
  mailQueuedSignal().dispatchEvent(new Event("queued"));
}

/** The sender listens here; returns the function that stops listening. */
export function onMailQueued(listener: () => void): () => void {
  const signal = mailQueuedSignal();
  signal.addEventListener("queued", listener);
  return () => signal.removeEventListener("queued", listener);
}

/** After this many failed attempts a message is marked failed; the mailbox page can send it again. */
export const MAX_ATTEMPTS = 10;
/** While one worker sends a message, others leave it alone for this long. */
const CLAIM_MS = 5 * 60_000;

/** Wait before attempt n+1 after n failures: 1, 2, 4 ... minutes, at most 6 hours. */
export function retryDelayMs(failedAttempts: number): number {
  return Math.min(60_000 * 2 ** Math.max(0, failedAttempts - 1), 6 * 60 * 60_000);
}

export type DeliveryReport = { sent: number; failed: number; gaveUp: number };

/**
 * Sends every due message once. Each message is claimed first (its next
 * attempt moved into the future), so two server processes never send the
 * same message at the same time, and a crash mid-send only delays it.
 */
export async function deliverDueMail(options: { now?: Date; limit?: number } = {}): Promise<DeliveryReport> {
  const now = options.now ?? new Date();
  const report: DeliveryReport = { sent: 0, failed: 0, gaveUp: 0 };
  const due = await db()
    .select({ id: mailOutbox.id, nextAttemptAt: mailOutbox.nextAttemptAt })
    .from(mailOutbox)
    .where(and(eq(mailOutbox.status, "pending"), lte(mailOutbox.nextAttemptAt, now)))
    .orderBy(asc(mailOutbox.nextAttemptAt), asc(mailOutbox.id))
    .limit(options.limit ?? 50);

  for (const candidate of due) {
    const [claim] = await db()
      .update(mailOutbox)
      .set({ nextAttemptAt: new Date(now.getTime() + CLAIM_MS) })
      .where(
        and(
          eq(mailOutbox.id, candidate.id),
          eq(mailOutbox.status, "pending"),
          eq(mailOutbox.nextAttemptAt, candidate.nextAttemptAt),
        ),
      );
    if (claim.affectedRows !== 1) continue;
    const [message] = await db().select().from(mailOutbox).where(eq(mailOutbox.id, candidate.id));
    if (!message) continue;
    try {
      await sendMail({
        to: message.recipient,
        subject: message.subject,
        html: message.html,
        text: message.text,
        messageId: `<outbox-${message.id}@${new URL(serverEnv().PATINA_URL).hostname}>`,
      });
      await db()
        .update(mailOutbox)
        .set({ status: "sent", sentAt: new Date(), attempts: message.attempts + 1, lastError: null })
        .where(eq(mailOutbox.id, message.id));
      report.sent++;
    } catch (error) {
      const attempts = message.attempts + 1;
      const giveUp = attempts >= MAX_ATTEMPTS;
      await db()
        .update(mailOutbox)
        .set({
          attempts,
          status: giveUp ? "failed" : "pending",
          nextAttemptAt: new Date(now.getTime() + retryDelayMs(attempts)),
          lastError: String(error instanceof Error ? error.message : error).slice(0, 2000),
        })
        .where(eq(mailOutbox.id, message.id));
      if (giveUp) report.gaveUp++;
      else report.failed++;
    }
  }
  return report;
}

/** Puts a message that was given up on back in the queue (owners do this from the mailbox). */
export async function retryMessage(companyId: number, messageId: number): Promise<boolean> {
  const [result] = await db()
    .update(mailOutbox)
    .set({ status: "pending", attempts: 0, nextAttemptAt: new Date(), lastError: null })
    .where(and(eq(mailOutbox.id, messageId), eq(mailOutbox.companyId, companyId), eq(mailOutbox.status, "failed")));
  return result.affectedRows === 1;
}
