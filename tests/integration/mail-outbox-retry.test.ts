import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";

import { db } from "~/.server/db/client";
import { mailOutbox } from "~/.server/db/schema";
import { deliverDueMail, enqueueMail, MAX_ATTEMPTS, retryDelayMs } from "~/.server/mail/outbox";
import { startMailSink } from "../../.dev/mail-sink";
import { renderMail } from "~/.server/mail/templates";
import { createCompany } from "../fixtures/company";
import { mailTo, startTestSink } from "../fixtures/mail-sink";

// Read when the first mail is sent (the environment is parsed lazily), so after the imports is early enough.
process.env.PATINA_SMTP_URL = "smtp://127.0.0.1:2605";

let companyId: number;

beforeAll(async () => {
  companyId = await createCompany("Outbox company");
});

const MINUTE = 60_000;

function message(recipient: string, dedupeKey: string) {
  return {
    companyId,
    dedupeKey,
    kind: "alert" as const,
    recipient,
    mail: renderMail({ subject: "Outbox check", preview: "check", blocks: [{ kind: "paragraph", text: "Kept until delivered." }] }),
  };
}

async function rowFor(dedupeKey: string) {
  const [row] = await db().select().from(mailOutbox).where(eq(mailOutbox.dedupeKey, dedupeKey));
  return row!;
}

describe("the outbox", () => {
  it("keeps a message while the SMTP server is down and delivers it once the server is back", async () => {
    const recipient = `retry-${Date.now()}@fixture.example`;
    const key = `retry-check:${recipient}`;
    expect(await enqueueMail(message(recipient, key))).toBe(true);

    // Nothing listens on the port yet: the attempt fails, the message stays queued.
    const t0 = new Date();
    const first = await deliverDueMail({ now: t0 });
    expect(first.failed).toBeGreaterThanOrEqual(1);
    let row = await rowFor(key);
    expect(row.status).toBe("pending");
    expect(row.attempts).toBe(1);
    expect(row.lastError).toMatch(/ECONNREFUSED|connect/i);
    // First retry after 1 minute: retryDelayMs(1) = 60,000 ms.
    expect(row.nextAttemptAt.getTime()).toBe(t0.getTime() + MINUTE);

    // Before the retry is due, nothing is attempted.
    await deliverDueMail({ now: new Date(t0.getTime() + 30_000) });
    expect((await rowFor(key)).attempts).toBe(1);

    const sink = await startTestSink(2605);
    try {
      const later = await deliverDueMail({ now: new Date(t0.getTime() + MINUTE) });
      expect(later.sent).toBeGreaterThanOrEqual(1);
      row = await rowFor(key);
      expect(row).toMatchObject({ status: "sent", attempts: 2, lastError: null });
      const received = await mailTo(sink, recipient);
      expect(received).toHaveLength(1);
      expect(received[0]!.text).toContain("Kept until delivered.");
      // Sent messages are never sent again.
      await deliverDueMail({ now: new Date(t0.getTime() + 10 * MINUTE) });
      expect((await rowFor(key)).attempts).toBe(2);
      expect(await mailTo(sink, recipient)).toHaveLength(1);
    } finally {
      await sink.dispose();
    }
  });

  it("survives a server that stops in the middle: what failed is sent after the restart, nothing twice", async () => {
    const storeDir = await import("node:os").then((os) => `${os.tmpdir()}/patina-mail-restart-${Date.now()}`);
    const first = await startMailSink({ port: 2605, storeDir });
    const a = `before-${Date.now()}@fixture.example`;
    const b = `during-${Date.now()}@fixture.example`;
    await enqueueMail(message(a, `restart:${a}`));
    const t0 = new Date();
    expect((await deliverDueMail({ now: t0 })).sent).toBeGreaterThanOrEqual(1);
    await first.stop();

    await enqueueMail(message(b, `restart:${b}`));
    const t1 = new Date();
    await deliverDueMail({ now: t1 });
    expect(await rowFor(`restart:${b}`)).toMatchObject({ status: "pending", attempts: 1 });

    const second = await startMailSink({ port: 2605, storeDir });
    try {
      await deliverDueMail({ now: new Date(t1.getTime() + MINUTE) });
      expect(await rowFor(`restart:${a}`)).toMatchObject({ status: "sent", attempts: 1 });
      expect(await rowFor(`restart:${b}`)).toMatchObject({ status: "sent", attempts: 2 });
      const all = await second.messages();
      expect(all.filter((m) => m.to.includes(a))).toHaveLength(1);
      expect(all.filter((m) => m.to.includes(b))).toHaveLength(1);
    } finally {
      await second.stop();
      await import("node:fs/promises").then((fs) => fs.rm(storeDir, { recursive: true, force: true }));
    }
  });

  it("ignores a second enqueue of the same event for the same recipient", async () => {
    const recipient = `dedupe-${Date.now()}@fixture.example`;
    expect(await enqueueMail(message(recipient, `dedupe:${recipient}`))).toBe(true);
    expect(await enqueueMail(message(recipient, `dedupe:${recipient}`))).toBe(false);
    expect(await db().select().from(mailOutbox).where(eq(mailOutbox.recipient, recipient))).toHaveLength(1);
  });

  it("backs off 1, 2, 4 ... minutes up to 6 hours, and marks a message failed after the last attempt", async () => {
    // 2^(n-1) minutes after the n-th failure, capped at 360 minutes.
    expect([1, 2, 3, 4, 9, 10].map((n) => retryDelayMs(n) / MINUTE)).toEqual([1, 2, 4, 8, 256, 360]);

    const recipient = `gives-up-${Date.now()}@fixture.example`;
    const key = `gives-up:${recipient}`;
    await enqueueMail(message(recipient, key));
    // Nothing listens on 2605 here; stand at the moment of the last allowed attempt.
    await db().update(mailOutbox).set({ attempts: MAX_ATTEMPTS - 1 }).where(eq(mailOutbox.dedupeKey, key));
    const report = await deliverDueMail({ now: new Date(Date.now() + MINUTE) });
    expect(report.gaveUp).toBeGreaterThanOrEqual(1);
    const row = await rowFor(key);
    expect(row).toMatchObject({ status: "failed", attempts: MAX_ATTEMPTS });
    // Still stored: the mailbox page can send it again.
    expect(row.html).toContain("Kept until delivered.");
  });
});

afterAll(async () => {
  // Leave no pending test messages behind for other files sharing this database.
  await db().update(mailOutbox).set({ status: "failed" }).where(eq(mailOutbox.companyId, companyId));
});
