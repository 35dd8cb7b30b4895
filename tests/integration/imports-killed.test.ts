import { type ChildProcess, spawn } from "node:child_process";
import { once } from "node:events";
import { hostname } from "node:os";
import { eq } from "drizzle-orm";
import { afterEach, beforeAll, describe, expect, it } from "vitest";
import { db } from "~/.server/db/client";
import { importBatches, importUploads, waterTests } from "~/.server/db/schema";
import type { Scope } from "~/.server/scope";
import { releaseDeadClaims, STOPPED_MESSAGE } from "~/.server/imports/claims";
import { commitUpload, INSERT_CHUNK } from "~/.server/imports/commit";
import { storeUpload } from "~/.server/imports/uploads";
import type { FixtureMember } from "../fixtures/company";
import { analystWithPools, checkPageData, hourlyReadingsFile, postCheckForm, storedCounts } from "./imports-helpers";

const ROWS = 3_000;
const POOLS = 6;
let scope: Scope;
let member: FixtureMember;
let child: ChildProcess | null = null;

/** 3,000 hourly readings over 6 pools, all valid: three chunks of 1,000. */
const file = () => hourlyReadingsFile("KT", ROWS, POOLS, Date.UTC(2022, 0, 1));
const stored = () => storedCounts(scope.companyId);

async function uploadRow(uploadId: string) {
  const [row] = await db().select().from(importUploads).where(eq(importUploads.id, uploadId));
  return row!;
}

/** Starts a commit in a process of its own and resolves once its first chunk is inside the open transaction. */
async function commitInChild(uploadId: string, env: Record<string, string> = {}) {
  const started = spawn(process.execPath, ["--import", "tsx", "tests/fixtures/commit-child.ts", uploadId, JSON.stringify(scope)], {
    env: { ...process.env, ...env },
    stdio: ["ignore", "pipe", "pipe"],
  });
  child = started;
  let output = "";
  started.stderr!.on("data", (piece) => (output += piece));
  await new Promise<void>((resolve, reject) => {
    started.stdout!.on("data", (piece) => {
      output += piece;
      if (output.includes(`stored ${INSERT_CHUNK}`)) resolve();
    });
    started.once("exit", (code) => reject(new Error(`the committing process exited (${code}) before its first chunk:\n${output}`)));
  });
  return started;
}

async function kill(process: ChildProcess) {
  const exited = once(process, "exit");
  process.kill("SIGKILL");
  await exited;
  child = null;
}

beforeAll(async () => {
  ({ member, scope } = await analystWithPools("KT", POOLS));
});

afterEach(async () => {
  if (child) await kill(child);
});

describe("a server process killed during a commit", () => {
  it("leaves nothing stored; the upload then shows stopped and is committed whole from the page", async () => {
    const uploadId = await storeUpload(scope, "killed-process.csv", file());
    expect((await postCheckForm(member, uploadId, "check")).status).toBe(200);
    const committing = await commitInChild(uploadId);

    // While the other process lives, its claim holds: a second commit is refused.
    const during = await uploadRow(uploadId);
    expect(during).toMatchObject({ phase: "committing", claimHost: hostname(), claimPid: committing.pid });
    expect(await commitUpload(scope, uploadId)).toMatchObject({ ok: false, status: 409 });

    await kill(committing);
    expect(await stored()).toEqual({ tests: 0, batches: 0 });

    // Same host, process gone: the page shows the commit stopped without waiting for the timeout.
    const page = await checkPageData(member, uploadId);
    expect(page.body.upload.phase).toBe("failed");
    expect(page.body.upload.error).toBe(STOPPED_MESSAGE);
    expect(await uploadRow(uploadId)).toMatchObject({ claimId: null, claimHost: null, claimPid: null });

    const again = await postCheckForm(member, uploadId, "commit");
    expect(again.status).toBe(302);
    // 3,000 rows, every one a new test, in one batch.
    expect(await stored()).toEqual({ tests: ROWS, batches: 1 });
    expect((await uploadRow(uploadId)).phase).toBe("committed");
  });

  it("on start, a claim of a process of this host that is gone is released", async () => {
    await db().delete(waterTests).where(eq(waterTests.companyId, scope.companyId));
    await db().delete(importBatches).where(eq(importBatches.companyId, scope.companyId));
    const uploadId = await storeUpload(scope, "killed-before-restart.csv", file());
    const committing = await commitInChild(uploadId);
    await kill(committing);
    expect((await uploadRow(uploadId)).phase).toBe("committing");
    expect(await releaseDeadClaims()).toBeGreaterThanOrEqual(1);
    expect(await uploadRow(uploadId)).toMatchObject({ phase: "failed", error: STOPPED_MESSAGE, claimId: null });
    expect(await stored()).toEqual({ tests: 0, batches: 0 });
  });

  it("a claim of another host is honoured while its heartbeat goes on, and taken over once it stops", async () => {
    const uploadId = await storeUpload(scope, "other-host.csv", file());
    const committing = await commitInChild(uploadId, { PATINA_IMPORT_CLAIM_STALE_SECONDS: "1" });
    const first = (await uploadRow(uploadId)).claimHeartbeatAt!.getTime();
    // The process beats while its commit waits: wait for the next beat (every 1/3 s here).
    let beat = first;
    while (beat === first) beat = (await uploadRow(uploadId)).claimHeartbeatAt!.getTime();
    expect(beat).toBeGreaterThan(first);
    // Seen as another machine's claim, it cannot be proved dead, only timed out.
    await db().update(importUploads).set({ claimHost: "another-host.invalid" }).where(eq(importUploads.id, uploadId));
    await kill(committing);
    expect(await releaseDeadClaims({ uploadId })).toBe(0);
    expect((await checkPageData(member, uploadId)).body.upload.phase).toBe("committing");
    expect(await commitUpload(scope, uploadId)).toMatchObject({ ok: false, status: 409 });

    // No heartbeat for longer than the claim timeout (30 s by default): shown stopped.
    await db()
      .update(importUploads)
      .set({ claimHeartbeatAt: new Date(Date.now() - 3_600_000) })
      .where(eq(importUploads.id, uploadId));
    const page = await checkPageData(member, uploadId);
    expect(page.body.upload).toMatchObject({ phase: "failed", error: STOPPED_MESSAGE });
    expect(await stored()).toEqual({ tests: 0, batches: 0 });
    expect(await commitUpload(scope, uploadId)).toMatchObject({ ok: true, testsAdded: ROWS });
    expect(await stored()).toEqual({ tests: ROWS, batches: 1 });
  });

  it("a commit whose claim was taken over after it went quiet rolls back instead of storing twice", async () => {
    await db().delete(waterTests).where(eq(waterTests.companyId, scope.companyId));
    await db().delete(importBatches).where(eq(importBatches.companyId, scope.companyId));
    const uploadId = await storeUpload(scope, "taken-over.csv", file());
    await expect(
      commitUpload(scope, uploadId, {
        afterChunk: async ({ stored: done }) => {
          // As if this commit had stalled past the timeout and been released meanwhile.
          if (done === INSERT_CHUNK) {
            await db()
              .update(importUploads)
              .set({ claimHeartbeatAt: new Date(Date.now() - 3_600_000) })
              .where(eq(importUploads.id, uploadId));
            await releaseDeadClaims({ uploadId });
          }
        },
      }),
    ).rejects.toThrow(/took this upload over/);
    expect(await stored()).toEqual({ tests: 0, batches: 0 });
    expect(await uploadRow(uploadId)).toMatchObject({ phase: "failed", error: STOPPED_MESSAGE });
  });
});
