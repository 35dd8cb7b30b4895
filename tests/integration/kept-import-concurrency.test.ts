import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { verifyKeptResults } from "~/.server/analytics/kept/verify";
import { db } from "~/.server/db/client";
import { companies, pools } from "~/.server/db/schema";
import { commitUpload, INSERT_CHUNK } from "~/.server/imports/commit";
import { storeUpload } from "~/.server/imports/uploads";
import type { Scope } from "~/.server/scope";
import { logVisit } from "~/.server/visits/commands/save-visit";
import { keptReady } from "../fixtures/kept";
import { visitForm } from "../fixtures/visit-input";
import { analystWithPools, hourlyReadingsFile } from "./imports-helpers";

const POOLS = 4;
let scope: Scope;

beforeAll(async () => {
  ({ scope } = await analystWithPools("KC", POOLS));
  await keptReady(scope.companyId);
});

afterAll(async () => {
  await db().delete(companies).where(eq(companies.id, scope.companyId));
});

describe("an import's kept results beside a visit on one of its pools", () => {
  it("the visit waits for the import, and both writes' tests are in the kept rows", async () => {
    // 3,000 hourly copper readings over four pools (elevated and clear by turns: episodes open and close).
    const uploadId = await storeUpload(scope, "kc.csv", hourlyReadingsFile("KC", 3000, POOLS, Date.UTC(2024, 0, 1)));
    const [pool] = await db().select({ id: pools.id }).from(pools).where(eq(pools.accountCode, "KC-2"));
    const owner: Scope = { ...scope, role: "owner" };
    let visit: ReturnType<typeof logVisit> | null = null;
    const committed = await commitUpload(scope, uploadId, {
      afterChunk: async ({ stored }) => {
        // While the import's rows are still being sent, a technician logs an elevated reading on one of its pools.
        if (stored === INSERT_CHUNK) {
          visit = logVisit(owner, pool!.id, visitForm({ copper: { value: 0.9, belowDetection: false } }), new Date(Date.UTC(2024, 6, 1)));
          visit.catch(() => undefined);
        }
      },
    });
    expect(committed).toMatchObject({ ok: true, testsAdded: 3000 });
    expect(await visit).toMatchObject({ ok: true });
    const check = await verifyKeptResults(scope.companyId);
    expect(check.versionId).not.toBeNull();
    expect(check.differences).toEqual([]);
    expect(check.tests).toBe(3001);
  });
});
