import { and, desc, eq } from "drizzle-orm";
import type { ImportOptions } from "~/lib/imports/options";
import { toSavedMapping } from "~/lib/imports/propose-mapping";
import { db } from "../db/client";
import { importBatches, importMappings, importUploads, user } from "../db/schema";
import type { Scope } from "../scope";
import { planImport, type PlanSummary } from "./plan";
import { findUpload, reportProgress, uploadSample } from "./uploads";
import { toCsv } from "~/lib/csv";

export type CheckResult = { ok: true; summary: PlanSummary } | { ok: false; status: 404 | 409; message: string };

/** Saves the person's choices and works out what a commit would store. */
export async function checkUpload(scope: Scope, uploadId: string, options: ImportOptions): Promise<CheckResult> {
  const upload = await findUpload(scope, uploadId);
  if (!upload) return { ok: false, status: 404, message: "No upload with that id in your company." };
  if (upload.phase === "committed" || upload.phase === "committing" || upload.phase === "discarded") {
    return { ok: false, status: 409, message: `This file cannot be checked again: it is ${upload.phase}.` };
  }
  await db()
    .update(importUploads)
    .set({ options, updatedAt: new Date() })
    .where(and(eq(importUploads.id, uploadId), eq(importUploads.companyId, scope.companyId)));
  try {
    const { summary } = await planImport(scope, { ...upload, options }, options);
    await db()
      .update(importUploads)
      .set({ summary, phase: "checked", updatedAt: new Date() })
      .where(eq(importUploads.id, uploadId));
    return { ok: true, summary };
  } catch (error) {
    await reportProgress(uploadId, { phase: "failed", error: `The check stopped: ${error instanceof Error ? error.message : String(error)}` });
    throw error;
  }
}

/** Every refused row of the last choices, as CSV text (row, column, value, reason). */
export async function refusedRowsCsv(scope: Scope, uploadId: string, options: ImportOptions): Promise<string | null> {
  const upload = await findUpload(scope, uploadId);
  if (!upload) return null;
  const { plan } = await planImport(scope, upload, options, null);
  return toCsv(
    ["row", "column", "value", "reason"],
    plan.refused.map((r) => [r.row, r.column, r.value, r.reason]),
  );
}

export async function saveMapping(scope: Scope, uploadId: string, name: string, options: ImportOptions) {
  const upload = await findUpload(scope, uploadId);
  if (!upload) return { ok: false as const, status: 404 as const, message: "No upload with that id in your company." };
  const { headers } = await uploadSample(upload, 0);
  const mapping = toSavedMapping(headers, options.columns);
  await db()
    .insert(importMappings)
    .values({ companyId: scope.companyId, name, mapping, createdBy: scope.userId })
    .onDuplicateKeyUpdate({ set: { mapping, createdBy: scope.userId } });
  return { ok: true as const };
}

export async function savedMappings(scope: Scope) {
  return db()
    .select({ id: importMappings.id, name: importMappings.name, mapping: importMappings.mapping })
    .from(importMappings)
    .where(eq(importMappings.companyId, scope.companyId))
    .orderBy(importMappings.name);
}

export async function importHistory(scope: Scope) {
  return db()
    .select({
      id: importBatches.id,
      fileName: importBatches.fileName,
      status: importBatches.status,
      testsAdded: importBatches.testsAdded,
      treatmentsAdded: importBatches.treatmentsAdded,
      rowsDuplicate: importBatches.rowsDuplicate,
      rowsRefused: importBatches.rowsRefused,
      createdAt: importBatches.createdAt,
      undoneAt: importBatches.undoneAt,
      userName: user.name,
    })
    .from(importBatches)
    .leftJoin(user, eq(user.id, importBatches.userId))
    .where(eq(importBatches.companyId, scope.companyId))
    .orderBy(desc(importBatches.createdAt), desc(importBatches.id))
    .limit(200);
}
