import { readFileSync } from "node:fs";
import { count, eq } from "drizzle-orm";
import { db } from "~/.server/db/client";
import { importBatches, waterTests } from "~/.server/db/schema";
import type { Scope } from "~/.server/scope";
import { callRoute } from "../fixtures/route-call";
import { createCompany, createMember, createPool, type FixtureMember, requestAs } from "../fixtures/company";
import * as uploadsApi from "~/routes/api.imports.uploads";
import * as checkPage from "~/routes/imports.$uploadId";

/** An analyst, with their scope, in a company of its own whose pools, on no route, are `${prefix}-0` to `${prefix}-${pools - 1}`. */
export async function analystWithPools(prefix: string, pools: number): Promise<{ member: FixtureMember; scope: Scope }> {
  const companyId = await createCompany();
  for (let p = 0; p < pools; p++) await createPool(companyId, { routeId: null, accountCode: `${prefix}-${p}` });
  const member = await createMember(companyId, "analyst");
  const scope: Scope = { userId: member.userId, userName: "Test analyst", email: member.email, companyId, companyName: "", timeZone: "UTC", role: "analyst", routeIds: null };
  return { member, scope };
}

/** A file written for a test: `rows` hourly readings from `start` (ms), pool after pool of `${prefix}-n`, all valid. */
export function hourlyReadingsFile(prefix: string, rows: number, pools: number, start: number): Uint8Array {
  const lines = ["Account,Date,pH,Cu"];
  for (let i = 0; i < rows; i++) {
    const at = new Date(start + i * 3_600_000).toISOString().slice(0, 16).replace("T", " ");
    lines.push(`${prefix}-${i % pools},${at},7.${i % 10},0.${i % 5}`);
  }
  return new TextEncoder().encode(lines.join("\n"));
}

/** How many water tests and import batches the company has stored. */
export async function storedCounts(companyId: number) {
  const [tests] = await db().select({ n: count() }).from(waterTests).where(eq(waterTests.companyId, companyId));
  const [batches] = await db().select({ n: count() }).from(importBatches).where(eq(importBatches.companyId, companyId));
  return { tests: tests!.n, batches: batches!.n };
}

export function fixtureBytes(name: string): Uint8Array<ArrayBuffer> {
  return new Uint8Array(readFileSync(new URL(`../fixtures/imports/${name}`, import.meta.url)));
}

export async function upload(member: FixtureMember | null, fileName: string, bytes: Uint8Array<ArrayBuffer>) {
  const form = new FormData();
  form.append("file", new File([bytes], fileName, { type: "text/csv" }));
  const request = requestAs(member, "/api/imports/uploads", {
    method: "POST",
    body: form,
    headers: { Accept: "application/json" },
  });
  return callRoute(uploadsApi.action, request);
}

export async function uploadFixture(member: FixtureMember, name: string) {
  const outcome = await upload(member, name, fixtureBytes(name));
  if (outcome.status !== 201) throw new Error(`upload of ${name} answered ${outcome.status}: ${JSON.stringify(outcome.body)}`);
  return (outcome.body as { uploadId: string }).uploadId;
}

type CheckData = Awaited<ReturnType<typeof checkPage.loader>>;

export async function checkPageData(member: FixtureMember, uploadId: string) {
  const outcome = await callRoute(checkPage.loader, requestAs(member, `/imports/${uploadId}`), { uploadId });
  return outcome as { status: number; body: CheckData };
}

/** Posts the check page's form with the upload's current choices, changed by `change`. */
export async function postCheckForm(
  member: FixtureMember,
  uploadId: string,
  intent: string,
  change: (form: FormData) => void = () => undefined,
) {
  const page = await checkPageData(member, uploadId);
  const form = new FormData();
  form.set("intent", intent);
  page.body.options?.columns.forEach((column, index) => {
    form.set(`column-${index}`, column.field);
    if (column.unit) form.set(`unit-${index}`, column.unit);
  });
  if (page.body.options?.dateOrder) form.set("dateOrder", page.body.options.dateOrder);
  for (const key of page.body.options?.createPools ?? []) form.append("createPool", key);
  for (const key of page.body.options?.createProducts ?? []) form.append("createProduct", key);
  change(form);
  return callRoute(checkPage.action, requestAs(member, `/imports/${uploadId}`, { method: "POST", body: form }), { uploadId });
}
