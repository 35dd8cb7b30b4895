import { and, eq } from "drizzle-orm";
import { afterAll, describe, expect, it } from "vitest";
import { closeDatabase, db } from "~/.server/db/client";
import { alertEvents, mailOutbox } from "~/.server/db/schema";
import * as visitPool from "~/routes/visit.$poolId";
import { postForm } from "../fixtures/forms";
import { EVERY_DAY, routeBookPerFile } from "../fixtures/route-book";

const book = routeBookPerFile({
  routes: { alert: { name: "Alert loop", weekdays: EVERY_DAY } },
  pools: { alerting: { route: "alert", accountCode: "AL-1" } },
  members: { technician: { role: "technician", routes: ["alert"] }, manager: "manager" },
});
const { technician, manager } = book.member;

afterAll(closeDatabase);

async function waitFor<T>(read: () => Promise<T[]>, count: number): Promise<T[]> {
  // The alert work runs after the visit's commit; poll briefly for its rows.
  for (let attempt = 0; attempt < 50; attempt++) {
    const rows = await read();
    if (rows.length >= count) return rows;
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
  return read();
}

describe("a visit that opens a metal episode", () => {
  it("records one alert event and queues one e-mail to the manager, also when the visit is resent", async () => {
    const fields = { submissionKey: `alert-${Date.now()}`, copper: "0.45", ph: "7.4" };
    const first = await postForm(visitPool.action, technician, `/visit/${book.pool.alerting}`, fields, { poolId: String(book.pool.alerting) });
    expect(first.status).toBe(302);
    // Copper 0.45 mg/L is at or above the elevated level 0.3 (common practice), so an episode opens.
    const events = await waitFor(
      () => db().select().from(alertEvents).where(and(eq(alertEvents.companyId, book.companyId), eq(alertEvents.poolId, book.pool.alerting))),
      1,
    );
    expect(events.map((e) => [e.kind, e.metal])).toEqual([["episode_opened", "copper"]]);
    const mail = await waitFor(
      () => db().select().from(mailOutbox).where(and(eq(mailOutbox.companyId, book.companyId), eq(mailOutbox.recipient, manager.email))),
      1,
    );
    expect(mail).toHaveLength(1);

    // The same form sent again stores nothing new and mails nobody twice.
    await postForm(visitPool.action, technician, `/visit/${book.pool.alerting}`, fields, { poolId: String(book.pool.alerting) });
    await new Promise((resolve) => setTimeout(resolve, 500));
    const eventsAfter = await db().select().from(alertEvents).where(eq(alertEvents.companyId, book.companyId));
    const mailAfter = await db().select().from(mailOutbox).where(eq(mailOutbox.companyId, book.companyId));
    expect(eventsAfter).toHaveLength(1);
    expect(mailAfter).toHaveLength(1);
  });
});
