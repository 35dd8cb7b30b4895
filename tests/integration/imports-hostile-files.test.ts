import { and, count, eq } from "drizzle-orm";
import fc from "fast-check";
import mysql from "mysql2/promise";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { db } from "~/.server/db/client";
import { importBatches, pools, waterTests } from "~/.server/db/schema";
import type { PlanSummary } from "~/.server/imports/plan";
import { readAccountKey } from "~/lib/imports/match-keys";
import { TEST_DATABASE_URL } from "../fixtures/database";
import { createCompany, createMember, createPool, type FixtureMember } from "../fixtures/company";
import { checkPageData, postCheckForm, upload } from "./imports-helpers";

let companyId: number;
let member: FixtureMember;
let collation: mysql.Connection;

beforeAll(async () => {
  companyId = await createCompany();
  await createPool(companyId, { routeId: null, accountCode: "FZ-1" });
  await createPool(companyId, { routeId: null, accountCode: "FZ-2" });
  member = await createMember(companyId, "analyst");
  collation = await mysql.createConnection({ uri: TEST_DATABASE_URL, charset: "utf8mb4_unicode_ci" });
});

afterAll(async () => {
  await collation?.end();
});

async function counts() {
  const [tests] = await db().select({ n: count() }).from(waterTests).where(eq(waterTests.companyId, companyId));
  const [batches] = await db().select({ n: count() }).from(importBatches).where(eq(importBatches.companyId, companyId));
  const [poolCount] = await db().select({ n: count() }).from(pools).where(eq(pools.companyId, companyId));
  return { tests: tests!.n, batches: batches!.n, pools: poolCount!.n };
}

/** Never waits on a step for more than 10 s: a hang fails the run instead of stalling the suite. */
async function within10s<T>(step: string, work: Promise<T>): Promise<T> {
  let timer: NodeJS.Timeout | undefined;
  const hang = new Promise<never>((_, reject) => {
    timer = setTimeout(() => reject(new Error(`${step} hung for more than 10 s`)), 10_000);
  });
  try {
    return await Promise.race([work, hang]);
  } finally {
    clearTimeout(timer);
  }
}

/** Whether the stored column's collation takes two account codes for the same. */
async function databaseEquates(a: string, b: string): Promise<boolean> {
  const [[row]] = (await collation.query(
    "SELECT CAST(? AS CHAR CHARACTER SET utf8mb4) COLLATE utf8mb4_unicode_ci = CAST(? AS CHAR CHARACTER SET utf8mb4) COLLATE utf8mb4_unicode_ci AS same",
    [a, b],
  )) as unknown as [[{ same: number }]];
  return Number(row.same) === 1;
}

/** Characters that make a code look like another one. */
const LOOK_ALIKE = ["\u0000", "\u200b", "\u00ad", "\u200d", "\ufeff", "\u0301", "\u0308", " ", "\t", "\u00a0"];
const SWAPS: Record<string, string[]> = {
  "1": ["\uff11", "\u2460", "\u00b9"],
  "2": ["\uff12", "\u2461"],
  F: ["f", "\uff26", "\u0192"],
  Z: ["z", "\u017d", "\u017a", "\uff3a"],
  "-": ["\uff0d", "\u2010", "\u2011"],
};

const lookAlike = (base: string) =>
  fc
    .tuple(
      fc.array(fc.nat({ max: 2 }), { minLength: base.length, maxLength: base.length }),
      fc.array(fc.tuple(fc.nat({ max: base.length }), fc.constantFrom(...LOOK_ALIKE)), { maxLength: 3 }),
    )
    .map(([swaps, inserts]) => {
      const characters = [...base].map((c, i) => (swaps[i]! > 0 && SWAPS[c] ? SWAPS[c]![(swaps[i]! - 1) % SWAPS[c]!.length]! : c));
      for (const [at, extra] of inserts) characters.splice(at, 0, extra);
      return characters.join("");
    });

const hostileCell = fc.oneof(
  { weight: 4, arbitrary: fc.constantFrom("7.4", "0.3", "<0.05", "", "n/a", "2024-05-03 09:30", "03/05/2024", "12 Heron Walk") },
  { weight: 3, arbitrary: fc.string({ unit: "binary", maxLength: 20 }) },
  { weight: 2, arbitrary: fc.constantFrom('"unclosed', 'a"b', '""', '"x""y"', "\u0000", "=1+1", "\r", "\n", ";", "\t") },
  { weight: 2, arbitrary: lookAlike("FZ-1") },
  { weight: 1, arbitrary: fc.integer({ min: 201, max: 70_000 }).map((n) => "x".repeat(n)) },
);

const HEADERS = ["Account", "Date", "pH", "Cu", "Fe", "Customer", "Address", "Notes", "Product", "Amount"];
const hostileHeader = fc.oneof(
  { weight: 6, arbitrary: fc.constantFrom(...HEADERS) },
  { weight: 2, arbitrary: fc.string({ unit: "binary", maxLength: 12 }) },
  { weight: 1, arbitrary: fc.integer({ min: 150, max: 3_000 }).map((n) => "H".repeat(n)) },
);

const hostileFile = fc
  .record({
    headers: fc.oneof(
      { weight: 8, arbitrary: fc.array(hostileHeader, { minLength: 1, maxLength: 12 }) },
      { weight: 1, arbitrary: fc.integer({ min: 201, max: 5_000 }).map((n) => Array.from({ length: n }, (_, i) => `c${i}`)) },
    ),
    rows: fc.array(fc.array(hostileCell, { maxLength: 14 }), { maxLength: 12 }),
    delimiter: fc.constantFrom(",", ";", "\t"),
    newline: fc.constantFrom("\n", "\r\n", "\r"),
    encoding: fc.constantFrom("utf-8", "utf-8 with BOM", "latin1", "utf-16le"),
  })
  .map(({ headers, rows, delimiter, newline, encoding }) => {
    const text = [headers, ...rows].map((cells) => cells.join(delimiter)).join(newline);
    const bytes =
      encoding === "latin1" || encoding === "utf-16le" ? Buffer.from(text, encoding) : Buffer.from((encoding === "utf-8" ? "" : "\ufeff") + text, "utf8");
    return { bytes: new Uint8Array(bytes), columns: headers.length };
  });

describe("hostile files", () => {
  it("never answer 500 or hang, store all or nothing, and every refusal names its row and column", async () => {
    await fc.assert(
      fc.asyncProperty(hostileFile, async ({ bytes, columns }) => {
        const before = await counts();
        const sent = await within10s("upload", upload(member, "hostile.csv", bytes));
        if (sent.status !== 201) {
          expect(sent.status).toBe(400);
          expect((sent.body as { error: { message: string } }).error.message.length).toBeGreaterThan(10);
          return;
        }
        expect(columns).toBeLessThanOrEqual(200);
        const uploadId = (sent.body as { uploadId: string }).uploadId;
        const checked = await within10s("check", postCheckForm(member, uploadId, "check"));
        expect(checked.status).toBeLessThan(500);
        const summary = (await checkPageData(member, uploadId)).body.summary as PlanSummary | null;
        for (const refusal of summary?.refusedSample ?? []) {
          expect(refusal.row).toBeGreaterThanOrEqual(1);
          expect(refusal.column.length).toBeGreaterThan(0);
          expect(refusal.reason.length).toBeGreaterThan(0);
          expect(refusal.value.length).toBeLessThan(200);
        }
        const committed = await within10s(
          "commit",
          postCheckForm(member, uploadId, "commit", (form) => {
            for (const pool of summary?.unknownPools ?? []) form.append("createPool", pool.key);
            form.set("dateOrder", "dmy");
          }),
        );
        expect(committed.status).toBeLessThan(500);
        const after = await counts();
        if (committed.status === 302) {
          const planned = (await checkPageData(member, uploadId)).body.summary as PlanSummary;
          expect(after.batches).toBe(before.batches + 1);
          expect(after.tests).toBe(before.tests + planned.testsToAdd);
        } else {
          expect(after).toEqual(before);
        }
      }),
      { numRuns: 40, seed: 20261202, endOnFailure: true },
    );
  });

  it("account codes the database takes for the same are one key, and codes it tells apart are never merged into one stored code", async () => {
    await fc.assert(
      fc.asyncProperty(lookAlike("FZ-1"), lookAlike("FZ-1"), async (a, b) => {
        const keyA = readAccountKey(a);
        const keyB = readAccountKey(b);
        if (!keyA.ok || !keyB.ok) {
          // A refusal gives its reason.
          expect((keyA.ok ? keyB : keyA).ok === false && (keyA.ok ? (keyB as { reason: string }) : keyA).reason).toMatch(/Account code/);
          return;
        }
        if (await databaseEquates(a, b)) expect(keyA.key).toBe(keyB.key);
        // A key is what is stored: two different keys must be different to the database too.
        if (keyA.key !== keyB.key) expect(await databaseEquates(keyA.key, keyB.key)).toBe(false);
      }),
      { numRuns: 300, seed: 7 },
    );
  });

  it("look-alike codes match the stored pool instead of listing a new one", async () => {
    const codes = ["FZ-\u00001", "ｆｚ－１", "FZ\u200b-1", "fz-1", "F\u017d-1", "FZ-\u00b9", "FZ\u00ad-1"];
    const file = ["Account,Date,pH", ...codes.map((code, i) => `${code},2024-06-0${i + 1} 08:00,7.${i}`)].join("\n");
    const sent = await upload(member, "look-alikes.csv", new Uint8Array(Buffer.from(file, "utf8")));
    const uploadId = (sent.body as { uploadId: string }).uploadId;
    await postCheckForm(member, uploadId, "check");
    const summary = (await checkPageData(member, uploadId)).body.summary as PlanSummary;
    // 7 rows, all pool FZ-1: none unknown, none refused.
    expect(summary).toMatchObject({ unknownPools: [], refusedRows: 0, testsToAdd: 7 });
  });

  it("text longer than its column is refused at check with row, column, value and reason, and the rest commits", async () => {
    const before = await counts();
    const longAddress = "9 ".padEnd(300, "Long Road ");
    const longName = "N".repeat(250);
    const file = [
      "Account,Address,Customer,Date,pH",
      `NEW-1,${longAddress},Short Name,2024-07-01 08:00,7.2`,
      `NEW-2,3 Short Lane,${longName},2024-07-01 08:00,7.3`,
      `NEW-3,5 Fine Street,Fine Name,2024-07-01 08:00,7.4`,
      `FZ-\u{1F600},6 Odd Street,Odd Code,2024-07-01 08:00,7.5`,
    ].join("\n");
    const sent = await upload(member, "long-text.csv", new Uint8Array(Buffer.from(file, "utf8")));
    const uploadId = (sent.body as { uploadId: string }).uploadId;
    expect((await postCheckForm(member, uploadId, "check")).status).toBe(200);
    const summary = (await checkPageData(member, uploadId)).body.summary as PlanSummary;
    expect(summary.refusedSample).toEqual([
      { row: 2, column: "Address", value: expect.stringContaining("(300 characters)"), reason: "Street address is 300 characters long; at most 255 are stored" },
      { row: 3, column: "Customer", value: `${longName.slice(0, 120)}… (250 characters)`, reason: "Customer name is 250 characters long; at most 200 are stored" },
      { row: 5, column: "Account", value: "FZ-\u{1F600}", reason: expect.stringContaining("U+1F600") },
    ]);
    const committed = await postCheckForm(member, uploadId, "commit", (form) => form.append("createPool", "code:NEW-3"));
    expect(committed.status).toBe(302);
    // One row stored (NEW-3) and one pool created for it.
    expect(await counts()).toEqual({ tests: before.tests + 1, batches: before.batches + 1, pools: before.pools + 1 });
    const [created] = await db().select().from(pools).where(and(eq(pools.companyId, companyId), eq(pools.accountCode, "NEW-3")));
    expect(created).toMatchObject({ street: "5 Fine Street", customerName: "Fine Name" });
  });
});

describe("very wide files", () => {
  it("a header of 110,000 columns is refused at upload with the limit named", async () => {
    const header = Array.from({ length: 110_000 }, (_, i) => `col${i}`).join(",");
    const sent = await upload(member, "wide.csv", new Uint8Array(Buffer.from(`${header}\n1,2,3`, "utf8")));
    expect(sent.status).toBe(400);
    expect((sent.body as { error: { message: string; field: string } }).error).toMatchObject({
      field: "file",
      message: expect.stringMatching(/header row has more than [\d,]+ columns \(column 201 is "col200"\); a log may have at most 200/),
    });
  });

  it("201 columns are refused and 200 accepted", async () => {
    const file = (n: number) => new Uint8Array(Buffer.from(`${["Account", "Date", ...Array.from({ length: n - 2 }, (_, i) => `x${i}`)].join(",")}\nFZ-1,2024-01-01,${Array(n - 2).fill("1").join(",")}`, "utf8"));
    expect((await upload(member, "201.csv", file(201))).status).toBe(400);
    const accepted = await upload(member, "200.csv", file(200));
    expect(accepted.status).toBe(201);
    const uploadId = (accepted.body as { uploadId: string }).uploadId;
    expect((await postCheckForm(member, uploadId, "check")).status).toBe(200);
  });

  it("a header cell of 5,000 characters is refused at upload, naming its column", async () => {
    const sent = await upload(member, "long-header.csv", new Uint8Array(Buffer.from(`Account,${"H".repeat(5000)}\nFZ-1,1`, "utf8")));
    expect(sent.status).toBe(400);
    expect((sent.body as { error: { message: string } }).error.message).toMatch(/header of column 2 in the header row is 5,000 characters long/);
  });
});
