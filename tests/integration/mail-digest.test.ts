import { beforeAll, describe, expect, it } from "vitest";

import { db } from "~/.server/db/client";
import { products, treatments } from "~/.server/db/schema";
import { digestWeek, sendWeeklyDigests } from "~/.server/mail/digest";
import { deliverDueMail } from "~/.server/mail/outbox";
import * as unsubscribePage from "~/routes/unsubscribe.$token";
import { addTest } from "../fixtures/company";
import { linkIn, mailSinkPerFile, mailTo } from "../fixtures/mail-sink";
import { routeBookPerFile } from "../fixtures/route-book";
import { callRoute } from "../fixtures/route-call";

const sink = mailSinkPerFile(2604);

// Monday 22 June 2026, noon UTC (the company's time zone): the digest covers 15 June noon to now.
const NOW = new Date("2026-06-22T12:00:00Z");
const DAY = 86_400_000;

const digestPool = (route: "northLoop" | "quarryRun", source: "pine" | "quarry", code: string) =>
  ({ route, source, accountCode: `DG-${code}`, street: `DG-${code} Digest Lane` }) as const;
const book = routeBookPerFile({
  company: "Digest company",
  routes: { northLoop: "North loop", quarryRun: "Quarry run" },
  sources: { pine: { name: "Pine municipal", kind: "municipal" }, quarry: { name: "Quarry well", kind: "shared_well" } },
  pools: {
    a: digestPool("northLoop", "pine", "A"),
    b: digestPool("northLoop", "pine", "B"),
    c: digestPool("northLoop", "pine", "C"),
    g: digestPool("northLoop", "pine", "G"),
    h: digestPool("northLoop", "pine", "H"),
    i: digestPool("northLoop", "pine", "I"),
    d: digestPool("quarryRun", "quarry", "D"),
    e: digestPool("quarryRun", "quarry", "E"),
    f: digestPool("quarryRun", "quarry", "F"),
  },
  members: { owner: "owner", manager: "manager", technician: { role: "technician", routes: ["northLoop"] } },
});
const { owner, manager, technician } = book.member;

beforeAll(async () => {
  const { companyId } = book;
  const { a, b, c, d, e, f, g, h, i } = book.pool;
  // A: copper case open since 1 June (elevated at 0.30), highest 0.60.
  await addTest(companyId, a, "2026-06-01T12:00:00Z", { copper: 0.5 });
  await addTest(companyId, a, "2026-06-18T12:00:00Z", { copper: 0.6 });
  // B: iron case 1-10 Feb, again on 17 June: 136 days apart, so B became recurring this week.
  await addTest(companyId, b, "2026-02-01T12:00:00Z", { iron: 0.3 });
  await addTest(companyId, b, "2026-02-10T12:00:00Z", { iron: 0.05 });
  await addTest(companyId, b, "2026-06-17T12:00:00Z", { iron: 0.25 });
  // C: iron 0.40, sequestrant an hour later, 0.10 five days on, clear (0.05 < 0.10) on 20 June.
  await addTest(companyId, c, "2026-06-12T10:00:00Z", { iron: 0.4 });
  const [product] = await db()
    .insert(products)
    .values({ companyId, name: "Sequestrant S", category: "sequestrant" })
    .$returningId();
  await db()
    .insert(treatments)
    .values({ companyId, poolId: c, productId: product!.id, appliedAt: new Date("2026-06-12T11:00:00Z"), amount: 1, unit: "L" });
  await addTest(companyId, c, "2026-06-17T10:00:00Z", { iron: 0.1 });
  await addTest(companyId, c, "2026-06-20T10:00:00Z", { iron: 0.05 });
  // D, E, F on Quarry well: three copper cases each in the year to 21 June 2026.
  for (const poolId of [d, e, f]) {
    for (const [at, copper] of [
      ["2025-06-22", 0.05],
      ["2025-09-01", 0.4],
      ["2025-09-10", 0.05],
      ["2026-01-05", 0.4],
      ["2026-01-15", 0.05],
      ["2026-05-01", 0.4],
      ["2026-05-10", 0.05],
      ["2026-06-21", 0.05],
    ] as const) {
      await addTest(companyId, poolId, `${at}T12:00:00Z`, { copper });
    }
  }
  // G, H, I: three quiet years.
  for (const poolId of [g, h, i]) {
    await addTest(companyId, poolId, "2023-06-22T12:00:00Z", { copper: 0.02 });
    await addTest(companyId, poolId, "2026-06-21T12:00:00Z", { copper: 0.02 });
  }
});

describe("the weekly digest", () => {
  it("goes to owners and managers once per week, with the week's figures in HTML tables and plain text", async () => {
    expect(digestWeek(NOW, "UTC")).toBe("2026-W26");
    const run = await sendWeeklyDigests(NOW, { companyIds: [book.companyId] });
    expect(run).toEqual({ companies: 1, queued: 2 });
    await deliverDueMail();

    expect(await mailTo(sink, technician.email)).toHaveLength(0);
    const [mail, ...more] = await mailTo(sink, owner.email);
    expect(more).toHaveLength(0);
    expect(mail!.subject).toBe("Digest company: your week in metals (15 Jun 2026 to 22 Jun 2026)");
    const text = mail!.text;

    // Open cases: A copper opened 1 Jun, 22 Jun - 1 Jun = 21 days, highest 0.60; B iron opened 17 Jun, 5 days, 0.25.
    // C's case closed on 20 Jun; D-I have none open.
    expect(text).toMatch(/DG-A Digest Lane \(Customer DG-A\)\s+Copper\s+1 Jun 2026\s+21\s+0\.60/);
    expect(text).toMatch(/DG-B Digest Lane \(Customer DG-B\)\s+Iron\s+17 Jun 2026\s+5\s+0\.25/);
    expect(text).toContain("2 open metal episodes, 1 newly recurring pool, 1 treatment result.");
    expect(text).not.toMatch(/DG-C Digest Lane \(Customer DG-C\)\s+Iron\s+12 Jun 2026/);

    // Recurring this week: B (17 Jun, previous case 1 Feb). D-F became recurring on 5 Jan, not this week.
    expect(text).toMatch(/DG-B Digest Lane \(Customer DG-B\)\s+Iron\s+17 Jun 2026\s+1 Feb 2026/);
    expect(text).not.toMatch(/DG-D Digest Lane \(Customer DG-D\)\s+Copper\s+5 Jan 2026/);

    // Quarry well: 3 pools x 3 cases = 9 over 3 x 364/365.25 = 2.98973 pool-years -> 3.01 per pool-year.
    // The rest: 4 cases (A 1, B 2, C 1) over G-I 3 x 1095 d + A 17 d + B 136 d + C 8 d = 3446 d = 9.43463 pool-years
    // -> 0.42397 per pool-year; ratio 3.01031 / 0.42397 = 7.1. The route and the kind of source split the book the same way.
    // Lower bound (conditional exact interval: Clopper-Pearson for the share 9 of 13 cases, then mapped onto the ratio;
    // Breslow & Day, Statistical Methods in Cancer Research II, 1987): p_low = 0.3857 -> 0.3857 / 0.6143 x 9.43463 / 2.98973 = 1.98.
    expect(text).toMatch(/Fill source\s+Quarry well\s+3\s+9\s+3\.01\s+7\.1 \(2\.0 to /);
    expect(text).toMatch(/Route\s+Quarry run\s+3\s+9\s+3\.01\s+7\.1 \(/);
    expect(text).toMatch(/Kind of fill source\s+shared well\s+3\s+9\s+3\.01\s+7\.1 \(/);
    expect(text).not.toMatch(/Pine municipal\s+6/);

    // C: before 0.40, first follow-up 0.10 after 4 d 23 h (rounds to 5 d), (0.40 - 0.10) / 0.40 = 75% lower, clear on 20 Jun.
    expect(text).toMatch(/DG-C Digest Lane \(Customer DG-C\)\s+Sequestrant S\s+Iron\s+0\.40\s+0\.10 after 5 d\s+-75%\s+20 Jun 2026/);

    expect(text).toContain("add acid to water");
    const html = mail!.html;
    expect(html.match(/<caption/g)).toHaveLength(4);
    expect(html).toContain('<th scope="col"');
    expect(html).toContain("Stop receiving the weekly digest");

    expect((await sendWeeklyDigests(NOW, { companyIds: [book.companyId] })).queued).toBe(0);
    await deliverDueMail();
    expect(await mailTo(sink, owner.email)).toHaveLength(1);
  });

  it("waits for Monday morning when run on a schedule", async () => {
    const sunday = new Date("2026-07-05T12:00:00Z");
    expect(await sendWeeklyDigests(sunday, { onlyDue: true, companyIds: [book.companyId] })).toEqual({ companies: 0, queued: 0 });
    const earlyMonday = new Date("2026-06-29T06:59:00Z");
    expect(await sendWeeklyDigests(earlyMonday, { onlyDue: true, companyIds: [book.companyId] })).toEqual({ companies: 0, queued: 0 });
  });

  it("the unsubscribe link turns the digest off for that member only", async () => {
    const [managerMail] = await mailTo(sink, manager.email);
    const link = linkIn(managerMail!, "/unsubscribe/");
    const token = link.pathname.split("/").at(-1)!;
    const page = await callRoute(unsubscribePage.loader, new Request(link), { token });
    expect(page.body).toEqual({ valid: true });
    const done = await callRoute(unsubscribePage.action, new Request(link, { method: "POST" }), { token });
    expect(done).toMatchObject({ status: 200, body: { done: true, email: manager.email } });
    const bogus = await callRoute(unsubscribePage.action, new Request(link, { method: "POST" }), { token: "x".repeat(32) });
    expect(bogus.status).toBe(404);

    const nextWeek = new Date(NOW.getTime() + 7 * DAY);
    expect(await sendWeeklyDigests(nextWeek, { companyIds: [book.companyId] })).toEqual({ companies: 1, queued: 1 });
    await deliverDueMail();
    expect(await mailTo(sink, owner.email)).toHaveLength(2);
    expect(await mailTo(sink, manager.email)).toHaveLength(1);
  });
});
