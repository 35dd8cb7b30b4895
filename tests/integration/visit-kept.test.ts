import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDatabase, db } from "~/.server/db/client";
import { products, treatments, waterTests } from "~/.server/db/schema";
import * as visitPool from "~/routes/visit.$poolId";
import { postForm } from "../fixtures/forms";
import { EVERY_DAY, routeBookPerFile } from "../fixtures/route-book";

// Visits kept on a phone without signal arrive later, with the moment they were saved there.
const book = routeBookPerFile({
  routes: { kept: { name: "Kept loop", weekdays: EVERY_DAY } },
  pools: { garden: { route: "kept", accountCode: "K-1" } },
  members: { technician: { role: "technician", routes: ["kept"] } },
});
const { technician } = book.member;
let chlorine: number;

beforeAll(async () => {
  const [product] = await db()
    .insert(products)
    .values({ companyId: book.companyId, name: "Kept test chlorine", category: "chlorine", doseUnit: "L", unitCost: 2 })
    .$returningId();
  chlorine = product!.id;
});

afterAll(closeDatabase);

const post = (fields: Record<string, string | string[]>) =>
  postForm(visitPool.action, technician, `/visit/${book.pool.garden}`, fields, { poolId: String(book.pool.garden) });

async function storedUnder(submissionKey: string) {
  return db().select().from(waterTests).where(and(eq(waterTests.companyId, book.companyId), eq(waterTests.submissionKey, submissionKey)));
}

describe("a visit kept on the phone and sent later", () => {
  it("is stored, with its treatment, at the time it was saved on the phone", async () => {
    const submissionKey = `kept-${Date.now()}-a`;
    const takenAt = new Date(Date.now() - 3 * 60 * 60 * 1000);
    takenAt.setMilliseconds(0);
    const outcome = await post({
      submissionKey,
      takenAt: takenAt.toISOString(),
      keptPoolLabel: "12 Garden Row · A. Customer",
      keptBy: technician.userId,
      ph: "7.4",
      treatmentProduct: [String(chlorine)],
      treatmentAmount: ["1.5"],
      treatmentUnit: ["L"],
    });
    expect(outcome.status).toBe(302);
    const [stored] = await storedUnder(submissionKey);
    expect(stored).toMatchObject({ ph: 7.4, poolId: book.pool.garden });
    expect(stored!.sampledAt.toISOString()).toBe(takenAt.toISOString());
    const given = await db().select().from(treatments).where(eq(treatments.waterTestId, stored!.id));
    // 1.5 L x 2 per L = 3.00.
    expect(given).toMatchObject([{ amount: 1.5, unit: "L", cost: 3 }]);
    expect(given[0]!.appliedAt.toISOString()).toBe(takenAt.toISOString());
  });

  it("is stored once when sent again with the same key, whatever time the second copy carries", async () => {
    const submissionKey = `kept-${Date.now()}-b`;
    const first = await post({ submissionKey, takenAt: new Date(Date.now() - 60_000).toISOString(), ph: "7.2" });
    const second = await post({ submissionKey, takenAt: new Date(Date.now() - 30_000).toISOString(), ph: "7.2" });
    expect(second).toMatchObject({ status: 302, location: first.location });
    expect(await storedUnder(submissionKey)).toHaveLength(1);
  });

  it("is stored at the time it arrives when its time lies ahead of the server's clock or more than 30 days back", async () => {
    for (const [suffix, takenAt] of [
      ["ahead", new Date(Date.now() + 60 * 60 * 1000)],
      ["old", new Date(Date.now() - 31 * 24 * 60 * 60 * 1000)],
    ] as const) {
      const submissionKey = `kept-${Date.now()}-${suffix}`;
      const before = Date.now();
      await post({ submissionKey, takenAt: takenAt.toISOString(), freeChlorine: "2" });
      const [stored] = await storedUnder(submissionKey);
      // Stored "now": between the post and the check (the column keeps milliseconds).
      expect(stored!.sampledAt.getTime()).toBeGreaterThanOrEqual(before - 1);
      expect(stored!.sampledAt.getTime()).toBeLessThanOrEqual(Date.now() + 1);
    }
  });
});
