import { and, count, eq, isNull } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/.server/db/client";
import { companies, importBatches, importUploads, pools, products, treatments, waterTests } from "~/.server/db/schema";
import * as progressApi from "~/routes/api.imports.$uploadId";
import * as refusedApi from "~/routes/api.imports.$uploadId.refused[.csv]";
import * as historyPage from "~/routes/imports";
import { addTest, createCompany, createMember, createPool, createRoute, type FixtureMember, requestAs } from "../fixtures/company";
import { callRoute } from "../fixtures/route-call";
import { checkPageData, fixtureBytes, postCheckForm, upload, uploadFixture } from "./imports-helpers";
import type { PlanSummary } from "~/.server/imports/plan";
import { uploadKeyPrefix } from "~/.server/imports/uploads";
import { listObjectKeys } from "~/.server/storage/object-store";

/** Every file the company has in the object store, by key. */
function storedFiles(): Promise<string[]> {
  return listObjectKeys(uploadKeyPrefix(companyId));
}

let companyId: number;
let analyst: FixtureMember;
let owner: FixtureMember;
let manager: FixtureMember;
let technician: FixtureMember;
let outsider: FixtureMember;
const poolIds: Record<string, number> = {};

async function testsOf(batchId: number | null) {
  return db()
    .select()
    .from(waterTests)
    .where(and(eq(waterTests.companyId, companyId), batchId === null ? isNull(waterTests.importBatchId) : eq(waterTests.importBatchId, batchId)))
    .orderBy(waterTests.sampledAt);
}

async function companyTestCount() {
  const [row] = await db().select({ n: count() }).from(waterTests).where(eq(waterTests.companyId, companyId));
  return row!.n;
}

function summaryOf(page: Awaited<ReturnType<typeof checkPageData>>): PlanSummary {
  return page.body.summary!;
}

beforeAll(async () => {
  companyId = await createCompany();
  await db().update(companies).set({ timeZone: "America/New_York" }).where(eq(companies.id, companyId));
  const routeId = await createRoute(companyId, "North");
  poolIds["LF-001"] = await createPool(companyId, { routeId, accountCode: "LF-001", street: "12 Heron Walk" });
  poolIds["LF-002"] = await createPool(companyId, { routeId, accountCode: "LF-002", street: "4 Copse Lane" });
  poolIds["LF-003"] = await createPool(companyId, { routeId, accountCode: "LF-003", street: "7 Flint Ridge" });
  await db().insert(products).values({ companyId, name: "metal binder", category: "sequestrant" });
  // A test logged on the route before any import; undo must never touch it.
  await addTest(companyId, poolIds["LF-001"]!, "2024-04-26T13:00:00Z", { ph: 7.5 });
  analyst = await createMember(companyId, "analyst");
  owner = await createMember(companyId, "owner");
  manager = await createMember(companyId, "manager");
  technician = await createMember(companyId, "technician", [routeId]);
  outsider = await createMember(await createCompany(), "analyst");
});

describe("upload, check, import, import again, undo", () => {
  let uploadId: string;
  let batchId: number;

  it("uploads the file and proposes a mapping from its headers", async () => {
    uploadId = await uploadFixture(analyst, "route-sheet-bom-crlf.csv");
    const page = await checkPageData(analyst, uploadId);
    expect(page.status).toBe(200);
    expect(page.body.upload.delimiter).toBe("comma");
    expect(page.body.sample.encodingNote).toBe("Read as UTF-8.");
    // The BOM is gone from the first header; the trailing separator adds no column.
    expect(page.body.sample.headers[0]).toBe("Account");
    expect(page.body.sample.headers).toHaveLength(16);
    expect(page.body.options?.columns.map((c) => c.field)).toEqual([
      "accountCode", "address", "sampledAt", "ph", "freeChlorine", "totalAlkalinity", "calciumHardness", "cyanuricAcid",
      "temperatureC", "copper", "iron", "manganese", "note", "product", "amount", "amountUnit",
    ]);
    expect(page.body.options?.columns[8]).toEqual({ field: "temperatureC", unit: "degF" });
    expect(page.body.options?.columns[9]).toEqual({ field: "copper", unit: "ugL" });
    const [row] = await db().select().from(importUploads).where(eq(importUploads.id, uploadId));
    // 6 data records (rows 2, 3, 5, 6, 7, 8): the blank line 4 is skipped, the quoted line break stays inside row 3.
    expect(row!.rowsTotal).toBe(6);
  });

  it("previews without storing anything", async () => {
    const before = await companyTestCount();
    const checked = await postCheckForm(analyst, uploadId, "check");
    expect(checked.status).toBe(200);
    const summary = summaryOf(await checkPageData(analyst, uploadId));
    // rows 2, 3, 5, 6 are accepted (row 6 by its address); row 7 has pH 15; row 8 is an unknown pool.
    expect(summary).toMatchObject({
      rowsRead: 6,
      testsToAdd: 4,
      treatmentsToAdd: 1,
      duplicates: 0,
      refusedRows: 1,
      leftOutUnknownPool: 1,
      dateOrder: { kind: "iso" },
    });
    expect(summary.refusedSample).toEqual([
      { row: 7, column: "pH", value: "15", reason: "pH 15 is above the accepted maximum of 14" },
    ]);
    expect(summary.unknownPools).toMatchObject([{ key: "code:LF-999", address: "21 Reedbank Close", rows: 1, firstRow: 8, create: false }]);
    expect(await companyTestCount()).toBe(before);
  });

  it("offers the refused rows as CSV", async () => {
    const outcome = await callRoute(refusedApi.loader, requestAs(analyst, `/api/imports/${uploadId}/refused.csv`), { uploadId });
    expect(outcome.status).toBe(200);
    expect(outcome.body).toBe("row,column,value,reason\r\n7,pH,15,pH 15 is above the accepted maximum of 14\r\n");
  });

  it("imports every accepted row in one batch, in canonical units and the company's time zone", async () => {
    const outcome = await postCheckForm(analyst, uploadId, "commit");
    expect(outcome.status).toBe(302);
    batchId = Number(new URL(outcome.location!, "http://x").searchParams.get("imported"));
    const tests = await testsOf(batchId);
    expect(tests).toHaveLength(4);
    const [first, byAddress] = [tests[0]!, tests.find((t) => t.poolId === poolIds["LF-003"])!];
    // 2024-05-03 09:15 in New York (EDT, UTC-4) = 13:15 UTC
    expect(first.sampledAt.toISOString()).toBe("2024-05-03T13:15:00.000Z");
    expect(first.poolId).toBe(poolIds["LF-001"]);
    // 82 degF: (82 - 32) x 5/9 = 27.78 -> 27.8 degC; 120 ug/L / 1000 = 0.12 mg/L; "<0.1" iron kept as a detection limit
    expect(first).toMatchObject({ ph: 7.4, freeChlorine: 3, temperatureC: 27.8, copper: 0.12, copperBelowDetection: false, iron: 0.1, ironBelowDetection: true, manganese: null, note: "Pad tinted, replaced" });
    expect(byAddress).toMatchObject({ copper: 0.04, iron: 0.05, note: "matched by address" });
    const second = tests.find((t) => t.sampledAt.toISOString() === "2024-05-10T13:20:00.000Z")!;
    expect(second.note).toBe("Water clear\r\nretest next week");
    expect(second.iron).toBeNull();
    const lf2 = tests.find((t) => t.poolId === poolIds["LF-002"])!;
    // "<50" ug/L = "<0.05" mg/L
    expect(lf2).toMatchObject({ copper: 0.05, copperBelowDetection: true, iron: 0.35 });

    const stored = await db().select().from(treatments).where(eq(treatments.importBatchId, batchId));
    expect(stored).toHaveLength(1);
    expect(stored[0]).toMatchObject({ amount: 16, unit: "fl oz", poolId: poolIds["LF-001"], waterTestId: first.id });
    const [batch] = await db().select().from(importBatches).where(eq(importBatches.id, batchId));
    expect(batch).toMatchObject({ status: "committed", testsAdded: 4, treatmentsAdded: 1, rowsDuplicate: 0, rowsRefused: 1, userId: analyst.userId });
    const progress = await callRoute(progressApi.loader, requestAs(analyst, `/api/imports/${uploadId}`), { uploadId });
    expect(progress.body).toMatchObject({ phase: "committed", importBatchId: batchId, rowsDone: 5 });
  });

  it("importing the same file again adds nothing, and is refused with the reason rather than stored as an empty batch", async () => {
    const before = await companyTestCount();
    const again = await uploadFixture(owner, "route-sheet-bom-crlf.csv");
    await postCheckForm(owner, again, "check");
    // the 4 stored rows are duplicates (row 2's treatment too); the refused and unknown rows stay as they were
    expect(summaryOf(await checkPageData(owner, again))).toMatchObject({ testsToAdd: 0, treatmentsToAdd: 0, duplicates: 4, refusedRows: 1 });
    const outcome = await postCheckForm(owner, again, "commit");
    expect(outcome.status).toBe(422);
    expect(outcome.body).toMatchObject({ ok: false, message: expect.stringMatching(/^Nothing to import: .* Of its rows: 4 already stored, 1 refused, 1 for pools Patina does not know\./) });
    expect(await companyTestCount()).toBe(before);
    const [treatmentCount] = await db().select({ n: count() }).from(treatments).where(eq(treatments.companyId, companyId));
    expect(treatmentCount!.n).toBe(1);
  });

  it("lists every batch in the history, and undo removes exactly its rows", async () => {
    const history = await callRoute(historyPage.loader, requestAs(analyst, "/imports"));
    const batches = (history.body as { batches: Array<{ id: number; fileName: string; userName: string | null; testsAdded: number }> }).batches;
    expect(batches.map((b) => b.testsAdded)).toEqual([4]);
    expect(batches[0]).toMatchObject({ id: batchId, fileName: "route-sheet-bom-crlf.csv", userName: "Test analyst" });

    const beforeOther = await testsOf(null);
    const form = new FormData();
    form.set("intent", "undo");
    form.set("batchId", String(batchId));
    const outcome = await callRoute(historyPage.action, requestAs(analyst, "/imports", { method: "POST", body: form }));
    expect(outcome.body).toMatchObject({ ok: true, message: `Import ${batchId} undone: 4 water tests and 1 treatments removed.` });
    expect(await testsOf(batchId)).toHaveLength(0);
    expect(await testsOf(null)).toEqual(beforeOther);
    expect(beforeOther).toHaveLength(1);
    const [batch] = await db().select().from(importBatches).where(eq(importBatches.id, batchId));
    expect(batch!.status).toBe("undone");
    const twice = await callRoute(historyPage.action, requestAs(analyst, "/imports", { method: "POST", body: form }));
    expect(twice.status).toBe(409);
  });
});

describe("quirky files", () => {
  it("semicolons with decimal commas and day-first dates", async () => {
    const id = await uploadFixture(analyst, "semicolon-decimal-comma.csv");
    const page = await checkPageData(analyst, id);
    expect(page.body.upload.delimiter).toBe("semicolon");
    await postCheckForm(analyst, id, "check");
    const summary = summaryOf(await checkPageData(analyst, id));
    expect(summary.dateOrder).toMatchObject({ kind: "known", order: "dmy" });
    // LF-003's 48 degC is above 45 degC
    expect(summary.refusedSample).toEqual([
      { row: 4, column: "Temp °C", value: "48", reason: "Temperature 48 degC is above the accepted maximum of 45 degC" },
    ]);
    const outcome = await postCheckForm(analyst, id, "commit");
    const batchId = Number(new URL(outcome.location!, "http://x").searchParams.get("imported"));
    const tests = await testsOf(batchId);
    expect(tests.map((t) => [t.poolId, t.sampledAt.toISOString(), t.ph, t.freeChlorine, t.copper, t.copperBelowDetection, t.temperatureC])).toEqual([
      // 15 June 08:30 EDT = 12:30 UTC; 7,4 -> 7.4; 0,32 -> 0.32
      [poolIds["LF-001"], "2024-06-15T12:30:00.000Z", 7.4, 2.5, 0.32, false, 26.5],
      // 3 July (day first), no time: midnight EDT = 04:00 UTC; "<0,1" -> below 0.1
      [poolIds["LF-002"], "2024-07-03T04:00:00.000Z", 7.2, 1, 0.1, true, 27],
    ]);
  });

  it("tabs with month-first dates and a separate time column", async () => {
    const id = await uploadFixture(analyst, "tabs-month-first.tsv");
    expect((await checkPageData(analyst, id)).body.upload.delimiter).toBe("tab");
    const outcome = await postCheckForm(analyst, id, "commit");
    const batchId = Number(new URL(outcome.location!, "http://x").searchParams.get("imported"));
    const tests = await testsOf(batchId);
    // 25 June 2:15 PM EDT = 18:15 UTC; 2 July 9:00 AM EDT = 13:00 UTC
    expect(tests.map((t) => [t.sampledAt.toISOString(), t.salt, t.copper])).toEqual([
      ["2024-06-25T18:15:00.000Z", 3200, 0.4],
      ["2024-07-02T13:00:00.000Z", 3150, 0.25],
    ]);
  });

  it("Windows-1252 names, said so, and unknown pools created from the file's columns", async () => {
    const id = await uploadFixture(analyst, "windows-1252-names.csv");
    const page = await checkPageData(analyst, id);
    expect(page.body.sample.encodingNote).toContain("Windows-1252");
    expect(page.body.sample.rows[0]!.cells[0]).toBe("São Bento");
    await postCheckForm(analyst, id, "check");
    const summary = summaryOf(await checkPageData(analyst, id));
    expect(summary.unknownPools.map((p) => [p.key, p.customerName, p.rows])).toEqual([
      ["code:LF-101", "São Bento", 1],
      ["code:LF-102", "Müller", 2],
    ]);
    expect(summary.testsToAdd).toBe(0);
    const outcome = await postCheckForm(analyst, id, "commit", (form) => {
      form.append("createPool", "code:LF-101");
      form.append("createPool", "code:LF-102");
    });
    expect(outcome.status).toBe(302);
    const created = await db().select().from(pools).where(and(eq(pools.companyId, companyId), eq(pools.customerName, "Müller")));
    expect(created).toMatchObject([{ accountCode: "LF-102", street: "3 Tanner Row" }]);
    const [n] = await db().select({ n: count() }).from(waterTests).where(eq(waterTests.poolId, created[0]!.id));
    expect(n!.n).toBe(2);
  });

  it("ambiguous dates are never guessed: the import waits for a choice", async () => {
    const id = await uploadFixture(analyst, "ambiguous-dates.csv");
    await postCheckForm(analyst, id, "check");
    const summary = summaryOf(await checkPageData(analyst, id));
    expect(summary.dateOrder.kind).toBe("ambiguous");
    expect(summary.testsToAdd).toBe(0);
    expect(summary.refusedRows).toBe(2);
    const refused = await postCheckForm(analyst, id, "commit");
    expect(refused.status).toBe(422);
    expect(await db().select().from(importBatches).where(eq(importBatches.fileName, "ambiguous-dates.csv"))).toEqual([]);
    const chosen = await postCheckForm(analyst, id, "commit", (form) => form.set("dateOrder", "dmy"));
    const batchId = Number(new URL(chosen.location!, "http://x").searchParams.get("imported"));
    // day first: 03/04/2024 = 3 April (midnight EDT = 04:00 UTC)
    expect((await testsOf(batchId)).map((t) => t.sampledAt.toISOString())).toEqual(["2024-04-03T04:00:00.000Z", "2024-06-05T04:00:00.000Z"]);
  });
});

describe("saved mappings", () => {
  it("a saved mapping is proposed again for a file with the same columns", async () => {
    const first = await uploadFixture(analyst, "browser-upload.csv");
    // "Metal A" means nothing to Patina until someone says it is copper in µg/L.
    expect((await checkPageData(analyst, first)).body.options?.columns[3]).toEqual({ field: "ignore" });
    const saved = await postCheckForm(analyst, first, "save-mapping", (form) => {
      form.set("column-3", "copper");
      form.set("unit-3", "ugL");
      form.set("mappingName", "Old route sheets");
    });
    expect(saved.body).toMatchObject({ ok: true });
    const second = await uploadFixture(owner, "browser-upload.csv");
    expect((await checkPageData(owner, second)).body.options?.columns[3]).toEqual({ field: "copper", unit: "ugL" });
    expect((await checkPageData(owner, second)).body.savedMappingNames).toEqual(["Old route sheets"]);
    // Another company does not get it.
    const elsewhere = await uploadFixture(outsider, "browser-upload.csv");
    expect((await checkPageData(outsider, elsewhere)).body.options?.columns[3]).toEqual({ field: "ignore" });
  });

  it("a form reading two columns as the same field is refused, naming the field", async () => {
    const id = await uploadFixture(analyst, "browser-upload.csv");
    const outcome = await postCheckForm(analyst, id, "check", (form) => form.set("column-3", "ph"));
    expect(outcome).toMatchObject({ status: 400, body: { ok: false, field: "columns", message: 'Two columns are read as "ph"; choose one and leave the other out.' } });
  });
});

describe("refusals", () => {
  it("a file over the size cap gets 413 with a clear message, and nothing of it is kept", async () => {
    process.env.PATINA_UPLOAD_MAX_MB = "0.001";
    const filesBefore = await storedFiles();
    const uploadsBefore = await db().select({ n: count() }).from(importUploads);
    try {
      // 5,000 bytes against a cap of 0.001 MB = 1,048.576 bytes (rounded to 1,049); no size is declared,
      // so the parser stops on the actual bytes
      const outcome = await upload(analyst, "big.csv", new Uint8Array(5000).fill(65));
      expect(outcome.status).toBe(413);
      expect(outcome.body).toMatchObject({ error: { code: "payload_too_large", field: "file" } });
      expect((outcome.body as { error: { message: string } }).error.message).toContain("larger than");
      expect(await storedFiles()).toEqual(filesBefore);
      expect(await db().select({ n: count() }).from(importUploads)).toEqual(uploadsBefore);
    } finally {
      delete process.env.PATINA_UPLOAD_MAX_MB;
    }
  });

  it("a request declaring more than the cap is refused before its body is read", async () => {
    const { action } = await import("~/routes/api.imports.uploads");
    // 60 MB declared against the default 50 MB cap
    const request = requestAs(analyst, "/api/imports/uploads", {
      method: "POST",
      headers: { "Content-Length": String(60 * 1024 * 1024), "Content-Type": "multipart/form-data; boundary=x" },
      body: "--x--",
    });
    const outcome = await callRoute(action, request);
    expect(outcome.status).toBe(413);
    expect((outcome.body as { error: { message: string } }).error.message).toMatch(/^The file is larger than the 50 MB Patina accepts/);
  });

  it("roles without imports get 403; signed-out gets 401", async () => {
    for (const member of [manager, technician]) {
      const outcome = await upload(member, "x.csv", fixtureBytes("ambiguous-dates.csv"));
      expect(outcome.status).toBe(403);
    }
    expect((await upload(null, "x.csv", fixtureBytes("ambiguous-dates.csv"))).status).toBe(401);
  });

  it("another company's upload id is not found, for pages, JSON and commit", async () => {
    const id = await uploadFixture(analyst, "ambiguous-dates.csv");
    expect((await callRoute(progressApi.loader, requestAs(outsider, `/api/imports/${id}`), { uploadId: id })).status).toBe(404);
    expect((await checkPageData(outsider, id)).status).toBe(404);
    expect((await callRoute(refusedApi.loader, requestAs(outsider, `/api/imports/${id}/refused.csv`), { uploadId: id })).status).toBe(404);
    const form = new FormData();
    form.set("intent", "commit");
    const { action } = await import("~/routes/imports.$uploadId");
    const outcome = await callRoute(action, requestAs(outsider, `/imports/${id}`, { method: "POST", body: form }), { uploadId: id });
    expect(outcome.status).toBe(404);
    const undo = new FormData();
    undo.set("intent", "undo");
    const [anyBatch] = await db().select({ id: importBatches.id }).from(importBatches).where(eq(importBatches.companyId, companyId));
    undo.set("batchId", String(anyBatch!.id));
    expect((await callRoute(historyPage.action, requestAs(outsider, "/imports", { method: "POST", body: undo }))).status).toBe(404);
  });
});
