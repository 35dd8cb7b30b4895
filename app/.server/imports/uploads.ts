import { createHash, randomUUID } from "node:crypto";
import { mkdir, readFile, writeFile } from "node:fs/promises";
import { dirname, join } from "node:path";
import { and, desc, eq, notInArray } from "drizzle-orm";
import { type ColumnMapping, unitsFor } from "~/lib/imports/fields";
import type { ImportOptions } from "~/lib/imports/options";
import { proposeMapping, type SavedMapping, savedMappingFits } from "~/lib/imports/propose-mapping";
import { db } from "../db/client";
import { companies, importMappings, importUploads } from "../db/schema";
import type { Scope } from "../guard";
import { importConfig } from "./config";
import { decodeBytes, type Delimiter, detectDelimiter, parseTable } from "./read-file";

export type UploadRow = typeof importUploads.$inferSelect;

export class UploadTooLarge extends Error {}

/** Keeps the file on disk, reads its shape, proposes a mapping, and records the upload. */
export async function storeUpload(scope: Scope, fileName: string, bytes: Uint8Array): Promise<string> {
  const { uploadDir, maxBytes } = importConfig();
  if (bytes.byteLength > maxBytes) throw new UploadTooLarge();
  const id = randomUUID();
  const storedAs = join(String(scope.companyId), `${id}.csv`);
  const path = join(uploadDir, storedAs);
  await mkdir(dirname(path), { recursive: true });
  await writeFile(path, bytes);

  const decoded = decodeBytes(bytes);
  const delimiter = detectDelimiter(decoded.text);
  const table = parseTable(decoded.text, delimiter);
  const columns = await proposeForCompany(scope, table.headers);
  const options: ImportOptions = { columns, dateOrder: null, createPools: [], createProducts: [] };

  await db()
    .insert(importUploads)
    .values({
      id,
      companyId: scope.companyId,
      userId: scope.userId,
      fileName: fileName.slice(0, 255) || "upload.csv",
      byteSize: bytes.byteLength,
      fileSha256: createHash("sha256").update(bytes).digest("hex"),
      storedAs,
      encoding: decoded.encoding,
      delimiter,
      rowsTotal: table.rows.length,
      options,
    });
  return id;
}

/** A saved mapping that names every header wins; otherwise the headers are read one by one. */
async function proposeForCompany(scope: Scope, headers: string[]): Promise<ColumnMapping[]> {
  const [company] = await db()
    .select({ unitSystem: companies.unitSystem })
    .from(companies)
    .where(eq(companies.id, scope.companyId));
  const saved = await db()
    .select({ mapping: importMappings.mapping })
    .from(importMappings)
    .where(eq(importMappings.companyId, scope.companyId))
    .orderBy(desc(importMappings.createdAt));
  const fitting = saved.map((s) => s.mapping as SavedMapping).find((m) => savedMappingFits(headers, m));
  return proposeMapping(headers, fitting).map((column) => {
    if (column.unit || unitsFor(column.field).length === 0) return column;
    // No unit in the header: metals are read as mg/L, temperature in the company's own unit.
    if (column.field === "temperatureC") return { ...column, unit: company?.unitSystem === "metric" ? "degC" : "degF" };
    return { ...column, unit: "mgL" };
  });
}

export async function findUpload(scope: Scope, uploadId: string): Promise<UploadRow | null> {
  const [row] = await db()
    .select()
    .from(importUploads)
    .where(and(eq(importUploads.id, uploadId), eq(importUploads.companyId, scope.companyId)));
  return row ?? null;
}

export async function readUploadText(upload: UploadRow) {
  const bytes = await readFile(join(importConfig().uploadDir, upload.storedAs));
  return decodeBytes(bytes);
}

/** Headers and the first rows, for the mapping editor. */
export async function uploadSample(upload: UploadRow, rows = 5) {
  const decoded = await readUploadText(upload);
  const table = parseTable(decoded.text, (upload.delimiter ?? ",") as Delimiter, rows + 50);
  return { headers: table.headers, rows: table.rows.slice(0, rows), encodingNote: decoded.note };
}

export async function uploadsInProgress(scope: Scope) {
  return db()
    .select({
      id: importUploads.id,
      fileName: importUploads.fileName,
      phase: importUploads.phase,
      rowsTotal: importUploads.rowsTotal,
      rowsDone: importUploads.rowsDone,
      createdAt: importUploads.createdAt,
    })
    .from(importUploads)
    .where(and(eq(importUploads.companyId, scope.companyId), notInArray(importUploads.phase, ["committed", "discarded"])))
    .orderBy(desc(importUploads.createdAt))
    .limit(50);
}

export async function setUploadOptions(scope: Scope, uploadId: string, options: ImportOptions) {
  await db()
    .update(importUploads)
    .set({ options, summary: null, phase: "uploaded", updatedAt: new Date() })
    .where(and(eq(importUploads.id, uploadId), eq(importUploads.companyId, scope.companyId)));
}

export async function discardUpload(scope: Scope, uploadId: string) {
  await db()
    .update(importUploads)
    .set({ phase: "discarded", updatedAt: new Date() })
    .where(and(eq(importUploads.id, uploadId), eq(importUploads.companyId, scope.companyId)));
}

export async function reportProgress(uploadId: string, values: Partial<Pick<UploadRow, "phase" | "rowsDone" | "rowsTotal" | "error">>) {
  await db()
    .update(importUploads)
    .set({ ...values, updatedAt: new Date() })
    .where(eq(importUploads.id, uploadId));
}
