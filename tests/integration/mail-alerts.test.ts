import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";

import { db } from "~/.server/db/client";
import { alertEvents, companies, mailOutbox, memberships, pools, mailPreferences } from "~/.server/db/schema";
import { afterWaterTestsSaved, recordAlertsForPool } from "~/.server/mail/alerts";
import { deliverDueMail } from "~/.server/mail/outbox";
import { preferencesFor } from "~/.server/mail/preferences";
import { addTest, createCompany, createMember, type FixtureMember } from "../fixtures/company";
import { mailSinkPerFile, mailTo } from "../fixtures/mail-sink";
import { routeBookPerFile } from "../fixtures/route-book";

const sink = mailSinkPerFile(2603);

/** A pool of the east route filled from the shared well. */
const onTheWell = (key: string) => ({ route: "east", accountCode: `AL-${key}`, street: `${key.toUpperCase()} Heron Walk`, source: "ridgeback" }) as const;
const book = routeBookPerFile({
  company: "Alert company",
  routes: { east: "Tuesday east" },
  sources: { ridgeback: { name: "Ridgeback shared well", kind: "shared_well" } },
  pools: { p1: onTheWell("p1"), p2: onTheWell("p2"), p3: onTheWell("p3"), p4: onTheWell("p4"), p5: onTheWell("p5") },
  members: { manager1: "manager", manager2: "manager", quietManager: "manager", owner: "owner", technician: { role: "technician", routes: ["east"] } },
});
const { pool } = book;
const { manager1, manager2, quietManager, owner, technician } = book.member;
let otherCompanyManager: FixtureMember;

// Every figure below is worked out from this fixed "now".
const NOW = new Date("2026-06-20T12:00:00Z");

beforeAll(async () => {
  // P5 is on the source but no longer served: it does not count as active.
  await db().update(pools).set({ active: false }).where(eq(pools.id, pool.p5));
  const [quiet] = await db().select().from(memberships).where(eq(memberships.userId, quietManager.userId));
  await preferencesFor(quiet!.id);
  await db().update(mailPreferences).set({ alerts: false }).where(eq(mailPreferences.membershipId, quiet!.id));

  const other = await createCompany("Alert company elsewhere");
  otherCompanyManager = await createMember(other, "manager");
});

async function outboxCount(recipient: string) {
  return (await db().select().from(mailOutbox).where(eq(mailOutbox.recipient, recipient))).length;
}

describe("metal alerts by e-mail", () => {
  it("a new test opening an episode that makes the pool recurring sends one mail per event to each manager", async () => {
    // Copper: elevated at 0.30 mg/L, clear below 0.10 (common-practice defaults).
    await addTest(book.companyId, pool.p1, "2026-01-10T15:00:00Z", { copper: 0.4 }); // opens case 1 (too old to announce)
    await addTest(book.companyId, pool.p1, "2026-01-20T15:00:00Z", { copper: 0.05 }); // 0.05 < 0.10 closes it
    await addTest(book.companyId, pool.p1, "2026-06-15T15:00:00Z", { copper: 0.35 }); // opens case 2: 156 days later, inside 365

    const recorded = await recordAlertsForPool(book.companyId, pool.p1, { now: NOW });
    expect(recorded.map((r) => r.kind).sort()).toEqual(["episode_opened", "pool_recurring"]);
    // Recipients: the two managers with alerts on; not the quiet manager, the owner (alertOwners unset) or the technician.
    for (const r of recorded) expect(r.recipients.sort()).toEqual([manager1.email, manager2.email].sort());

    await deliverDueMail();
    const received = await mailTo(sink, manager1.email);
    expect(received).toHaveLength(2);
    const opened = received.find((m) => m.subject.startsWith("Copper elevated"))!;
    expect(opened.subject).toBe("Copper elevated at P1 Heron Walk: 0.35 mg/L");
    expect(opened.text).toMatch(/Reading:\s+0\.35 mg\/L/);
    expect(opened.text).toMatch(/Elevated from:\s+0\.30 mg\/L/);
    expect(opened.text).toMatch(/Test of:\s+15 Jun 2026/);
    expect(opened.text).toContain(`http://localhost:3000/pools/${pool.p1}`);
    expect(opened.text).toContain("add acid to water");
    expect(opened.html).toContain(`href="http://localhost:3000/pools/${pool.p1}"`);

    const recurring = received.find((m) => m.subject.startsWith("Copper keeps coming back"))!;
    // 10 Jan -> 15 Jun 2026: 21 (rest of Jan) + 28 + 31 + 30 + 31 + 15 = 156 days.
    expect(recurring.text).toMatch(/Days between:\s+156/);
    expect(recurring.text).toMatch(/Episodes in the last 365 days:\s+2/);

    for (const quiet of [quietManager, owner, technician, otherCompanyManager]) expect(await outboxCount(quiet.email)).toBe(0);
  });

  it("running again, or saving the same pool twice, records nothing new and sends nothing twice", async () => {
    expect(await recordAlertsForPool(book.companyId, pool.p1, { now: NOW })).toEqual([]);
    expect(await afterWaterTestsSaved(book.companyId, [pool.p1, pool.p1], { now: NOW })).toEqual([]);
    await deliverDueMail();
    expect(await mailTo(sink, manager1.email)).toHaveLength(2);
    expect(await outboxCount(manager1.email)).toBe(2);
    const events = await db().select().from(alertEvents).where(eq(alertEvents.companyId, book.companyId));
    expect(events).toHaveLength(2);
  });

  it("three pools on one fill source opening iron within 21 days raise one shared-source alert, owners included when asked", async () => {
    await db().update(companies).set({ settings: { alertOwners: true } }).where(eq(companies.id, book.companyId));
    // Iron: elevated at 0.20 mg/L. Openings on 8, 12 and 18 June: 10 days apart at most, inside 21.
    await addTest(book.companyId, pool.p2, "2026-06-08T14:00:00Z", { iron: 0.25 });
    await addTest(book.companyId, pool.p3, "2026-06-12T14:00:00Z", { iron: 0.3 });
    await addTest(book.companyId, pool.p4, "2026-06-18T14:00:00Z", { iron: 0.22 });

    const recorded = await afterWaterTestsSaved(book.companyId, [pool.p2, pool.p3, pool.p4], { now: NOW });
    expect(recorded.map((r) => r.kind).sort()).toEqual(["episode_opened", "episode_opened", "episode_opened", "shared_source"]);
    const expectedRecipients = [manager1.email, manager2.email, owner.email].sort();
    for (const r of recorded) expect(r.recipients.sort()).toEqual(expectedRecipients);

    await deliverDueMail();
    const ownerMail = await mailTo(sink, owner.email);
    expect(ownerMail).toHaveLength(4);
    const shared = ownerMail.find((m) => m.subject.includes("filled from"))!;
    expect(shared.subject).toBe("Iron on 3 pools filled from Ridgeback shared well");
    // Active pools on the source: P1-P4 = 4 (P5 inactive). Needed: max(3, ceil(0.25 x 4) = 1) = 3.
    expect(shared.text).toContain("3 of the 4 active pools filled from Ridgeback shared well (shared well)");
    expect(shared.text).toMatch(/Pools needed for this alert:\s+3/);
    expect(shared.text).toMatch(/First episode opened:\s+8 Jun 2026/);
    expect(shared.text).toMatch(/Latest episode opened:\s+18 Jun 2026/);
    for (const street of ["P2 Heron Walk", "P3 Heron Walk", "P4 Heron Walk"]) expect(shared.text).toContain(street);
    expect(shared.html).toContain(`http://localhost:3000/sources/${book.source.ridgeback}`);
    expect(shared.html).toContain("<caption");
    expect(await mailTo(sink, manager1.email)).toHaveLength(2 + 4);
  });

  it("a fourth pool joining the same wave is a new episode, not a second shared-source alert", async () => {
    await addTest(book.companyId, pool.p1, "2026-06-19T14:00:00Z", { iron: 0.31 });
    const recorded = await afterWaterTestsSaved(book.companyId, [pool.p1], { now: NOW });
    expect(recorded.map((r) => r.kind)).toEqual(["episode_opened"]);
    const shared = await db().select().from(alertEvents).where(eq(alertEvents.kind, "shared_source"));
    expect(shared.filter((e) => e.companyId === book.companyId)).toHaveLength(1);
    await deliverDueMail();
    expect(await mailTo(sink, manager1.email)).toHaveLength(2 + 4 + 1);
    expect(await afterWaterTestsSaved(book.companyId, [pool.p1, pool.p2, pool.p3, pool.p4], { now: NOW })).toEqual([]);
  });

  it("records nothing for a company that does not exist, and does not throw", async () => {
    await expect(afterWaterTestsSaved(999_999_999, [1, 2])).resolves.toEqual([]);
  });
});
