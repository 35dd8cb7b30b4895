import { randomUUID } from "node:crypto";
import { and, eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { db } from "~/.server/db/client";
import { waterTests } from "~/.server/db/schema";
import type { Scope } from "~/.server/scope";
import { logVisit } from "~/.server/visits/commands/save-visit";
import * as visitPool from "~/routes/visit.$poolId";
import { postForm } from "../fixtures/forms";
import { EVERY_DAY, routeBookPerFile } from "../fixtures/route-book";
import { visitForm } from "../fixtures/visit-input";

const PARALLEL = 20;
const book = routeBookPerFile({
  routes: { busy: { name: "Busy route", weekdays: EVERY_DAY } },
  pools: { busy: { route: "busy", accountCode: "CC-1" } },
  members: { technician: { role: "technician", routes: ["busy"] } },
});
const { technician } = book.member;

const testsOfPool = () => db().select().from(waterTests).where(and(eq(waterTests.companyId, book.companyId), eq(waterTests.poolId, book.pool.busy)));

const post = (submissionKey: string, ph: string) =>
  postForm(visitPool.action, technician, `/visit/${book.pool.busy}`, { submissionKey, ph, freeChlorine: "3" }, { poolId: String(book.pool.busy) });

describe("visits saved at the same moment", () => {
  it("parallel posts of one form store one visit, and every post is answered with it", async () => {
    const before = (await testsOfPool()).length;
    const submissionKey = `same-form-${randomUUID()}`;
    const outcomes = await Promise.all(Array.from({ length: PARALLEL }, () => post(submissionKey, "7.4")));
    const stored = await db().select().from(waterTests).where(and(eq(waterTests.companyId, book.companyId), eq(waterTests.submissionKey, submissionKey)));
    expect(stored).toHaveLength(1);
    // All 20 answers send the technician to the one stored visit; none is an error.
    expect(outcomes.map((o) => o.status)).toEqual(Array(PARALLEL).fill(302));
    expect(new Set(outcomes.map((o) => o.location))).toEqual(new Set([`/pools/${book.pool.busy}?saved=${stored[0]!.id}`]));
    expect((await testsOfPool()).length).toBe(before + 1);
  });

  it("different visits posted in parallel are all stored", async () => {
    const before = (await testsOfPool()).length;
    const outcomes = await Promise.all(Array.from({ length: PARALLEL }, (_, i) => post(`parallel-${i}-${randomUUID()}`, `7.${i % 10}`)));
    expect(outcomes.map((o) => o.status)).toEqual(Array(PARALLEL).fill(302));
    expect((await testsOfPool()).length).toBe(before + PARALLEL);
  });

  it("different visits at the very same millisecond are all stored: the submission key decides, not the clock", async () => {
    const scope: Scope = { userId: technician.userId, userName: "Tech", email: technician.email, companyId: book.companyId, companyName: "", timeZone: "UTC", role: "technician", routeIds: [book.route.busy] };
    const now = new Date(Date.UTC(2025, 5, 1, 9, 30, 0, 123));
    const input = (i: number) => visitForm({ ph: 7.2 }, { submissionKey: `same-ms-${i}-${randomUUID()}` });
    const results = await Promise.all(Array.from({ length: PARALLEL }, (_, i) => logVisit(scope, book.pool.busy, input(i), now)));
    expect(results.filter((r) => r.ok && !r.repeated)).toHaveLength(PARALLEL);
    const atThatMoment = (await testsOfPool()).filter((t) => t.sampledAt.getTime() === now.getTime());
    expect(atThatMoment).toHaveLength(PARALLEL);
  });
});
