import mysql from "mysql2/promise";
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { db } from "~/.server/db/client";
import { importUploads } from "~/.server/db/schema";
import type { Scope } from "~/.server/scope";
import { commitUpload, INSERT_CHUNK } from "~/.server/imports/commit";
import { storeUpload } from "~/.server/imports/uploads";
import { TEST_DATABASE_URL } from "../fixtures/database";
import { analystWithPools, hourlyReadingsFile, storedCounts } from "./imports-helpers";

const ROWS = 5_000;
const POOLS = 10;
let scope: Scope;
let other: mysql.Connection;

/** 5,000 hourly readings spread over 10 pools, all valid. */
const largeFile = () => hourlyReadingsFile("AT", ROWS, POOLS, Date.UTC(2023, 0, 1));
const stored = () => storedCounts(scope.companyId);

beforeAll(async () => {
  ({ scope } = await analystWithPools("AT", POOLS));
  other = await mysql.createConnection({ uri: TEST_DATABASE_URL, timezone: "Z" });
});

afterAll(async () => {
  await other?.end();
});

describe("a commit that fails half-way stores nothing", () => {
  it("the database connection is killed after the second chunk", async () => {
    const uploadId = await storeUpload(scope, "killed.csv", largeFile());
    let killedAt = 0;
    await expect(
      commitUpload(scope, uploadId, {
        afterChunk: async ({ stored: done, connectionId }) => {
          if (done === 2 * INSERT_CHUNK) {
            killedAt = done;
            await other.query(`KILL CONNECTION ${Number(connectionId)}`);
          }
        },
      }),
    ).rejects.toThrow();
    // 2,000 rows had been sent inside the transaction when the connection died.
    expect(killedAt).toBe(2000);
    expect(await stored()).toEqual({ tests: 0, batches: 0 });
    const [upload] = await db().select().from(importUploads).where(eq(importUploads.id, uploadId));
    expect(upload!.phase).toBe("failed");
    expect(upload!.error).toMatch(/^Nothing was stored/);
  });

  it("a test written for one of its pools while it runs waits for it, then finds the row already stored", async () => {
    const uploadId = await storeUpload(scope, "late-failure.csv", largeFile());
    // The file's last row: i = 4999 -> pool AT-9 at 2023-01-01 00:00 + 4999 h.
    const [[lastPool]] = (await other.query("SELECT id FROM pools WHERE company_id = ? AND account_code = 'AT-9'", [scope.companyId])) as unknown as [[{ id: number }]];
    const lastAt = new Date(Date.UTC(2023, 0, 1) + 4999 * 3_600_000);
    let concurrent: Promise<unknown> | null = null;
    const committed = await commitUpload(scope, uploadId, {
      afterChunk: async ({ stored: done }) => {
        // Another write for the same pool and time while the import runs: the import holds the pool
        // (its kept results are worked out at the end), so the write waits for the import to finish.
        if (done === INSERT_CHUNK) {
          concurrent = other.query("INSERT INTO water_tests (company_id, pool_id, sampled_at, ph) VALUES (?, ?, ?, 7.2)", [scope.companyId, lastPool.id, lastAt]);
          concurrent.catch(() => undefined);
        }
      },
    });
    expect(committed).toMatchObject({ ok: true, testsAdded: 5000 });
    await expect(concurrent).rejects.toThrow(/Duplicate entry/);
    // The whole file, once, and nothing of the write that came second.
    expect(await stored()).toEqual({ tests: 5000, batches: 1 });
    await other.query("DELETE FROM import_batches WHERE company_id = ?", [scope.companyId]);
    await other.query("DELETE FROM water_tests WHERE company_id = ?", [scope.companyId]);
  });

  it("after a failure the same upload can be committed, and then stores every row once", async () => {
    const [failed] = await db().select({ id: importUploads.id }).from(importUploads).where(eq(importUploads.fileName, "killed.csv"));
    const result = await commitUpload(scope, failed!.id);
    expect(result).toMatchObject({ ok: true, testsAdded: ROWS });
    expect(await stored()).toEqual({ tests: ROWS, batches: 1 });
    const again = await storeUpload(scope, "killed-again.csv", largeFile());
    // Every row is already stored: nothing to import, said so, and no empty batch is written.
    expect(await commitUpload(scope, again)).toMatchObject({
      ok: false,
      status: 422,
      message: expect.stringMatching(/^Nothing to import: no row would add a water test or a treatment\. Of its rows: 5,000 already stored\./),
    });
    expect(await stored()).toEqual({ tests: ROWS, batches: 1 });
  });
});
