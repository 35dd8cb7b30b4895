import { spawn } from "node:child_process";
import { createHash } from "node:crypto";
import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/.server/db/client";
import { importUploads } from "~/.server/db/schema";
import { uploadKeyPrefix } from "~/.server/imports/uploads";
import type { Scope } from "~/.server/scope";
import { listObjectKeys, readObject } from "~/.server/storage/object-store";
import type { FixtureMember } from "../fixtures/company";
import { analystWithPools, hourlyReadingsFile, storedCounts, upload } from "./imports-helpers";

let member: FixtureMember;
let scope: Scope;

beforeAll(async () => {
  ({ member, scope } = await analystWithPools("OS", 5));
});

async function uploadRow(uploadId: string) {
  const [row] = await db().select().from(importUploads).where(eq(importUploads.id, uploadId));
  return row!;
}

async function sha256Of(source: AsyncIterable<Uint8Array>) {
  const hash = createHash("sha256");
  let bytes = 0;
  for await (const piece of source) {
    hash.update(piece);
    bytes += piece.byteLength;
  }
  return { sha256: hash.digest("hex"), bytes };
}

/** Another instance: a process of its own that checks and commits the upload (tests/fixtures/import-child.ts). */
function checkAndCommitElsewhere(uploadId: string): Promise<unknown> {
  const child = spawn(process.execPath, ["--import", "tsx", "tests/fixtures/import-child.ts", uploadId, JSON.stringify(scope)], {
    env: process.env,
    stdio: ["ignore", "pipe", "pipe"],
  });
  let output = "";
  child.stdout.on("data", (piece) => (output += piece));
  child.stderr.on("data", (piece) => (output += piece));
  return new Promise((resolve, reject) =>
    child.once("exit", (code) => {
      const line = output.split("\n").find((l) => l.startsWith("committed "));
      if (code === 0 && line) resolve(JSON.parse(line.slice("committed ".length)));
      else reject(new Error(`the other instance exited with ${code}:\n${output}`));
    }),
  );
}

describe("uploaded files in the object store", () => {
  it("a file larger than three 5 MB parts is kept byte for byte under the company's prefix, and read back whole", async () => {
    // 420,000 hourly rows of about 30 bytes: well over 12 MB, so the upload goes in three or more parts.
    const rows = 420_000;
    const bytes = hourlyReadingsFile("OS", rows, 5, Date.UTC(2015, 0, 1));
    expect(bytes.byteLength).toBeGreaterThan(12 * 1024 * 1024);
    const outcome = await upload(member, "large-log.csv", new Uint8Array(bytes));
    expect(outcome.status).toBe(201);
    const { uploadId } = outcome.body as { uploadId: string };

    const row = await uploadRow(uploadId);
    const expected = createHash("sha256").update(bytes).digest("hex");
    expect(row.storedAs).toBe(`${uploadKeyPrefix(scope.companyId)}${uploadId}.csv`);
    expect(row).toMatchObject({ byteSize: bytes.byteLength, fileSha256: expected, rowsTotal: rows, encoding: "utf-8" });
    expect(await listObjectKeys(uploadKeyPrefix(scope.companyId))).toContain(row.storedAs);
    expect(await sha256Of(readObject(row.storedAs))).toEqual({ sha256: expected, bytes: bytes.byteLength });
    // Only the start, when a range is asked for.
    expect((await sha256Of(readObject(row.storedAs, 1000))).bytes).toBe(1000);
  });

  it("another instance checks and commits an upload this one received, reading the file from the store", async () => {
    // 60 hourly readings over pools OS-0 to OS-4, all valid.
    const bytes = hourlyReadingsFile("OS", 60, 5, Date.UTC(2024, 2, 1));
    const outcome = await upload(member, "small-log.csv", new Uint8Array(bytes));
    expect(outcome.status).toBe(201);
    const { uploadId } = outcome.body as { uploadId: string };
    const before = await storedCounts(scope.companyId);

    const committed = await checkAndCommitElsewhere(uploadId);
    expect(committed).toMatchObject({ ok: true, testsAdded: 60, treatmentsAdded: 0 });
    expect(await storedCounts(scope.companyId)).toEqual({ tests: before.tests + 60, batches: before.batches + 1 });
    expect(await uploadRow(uploadId)).toMatchObject({ phase: "committed", rowsDone: 60 });
  });
});
