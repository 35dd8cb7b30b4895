import { createHash, randomUUID } from "node:crypto";
import { and, desc, eq, notInArray } from "drizzle-orm";
import { type ColumnMapping, unitsFor } from "~/lib/imports/fields";
import type { ImportOptions } from "~/lib/imports/options";
import { proposeMapping, type SavedMapping, savedMappingFits } from "~/lib/imports/propose-mapping";
import { db } from "../db/client";
import { companies, importMappings, importUploads } from "../db/schema";
import type { Scope } from "../scope";
import { deleteObject, putObject, readObject } from "../storage/object-store";
import { releaseDeadClaims } from "./claims";
import { importConfig, MAX_COLUMNS, MAX_HEADER_LENGTH } from "./config";
import {
  type ByteSource,
  type Delimiter,
  detectDelimiter,
  type Encoding,
  ENCODING_NOTES,
  parseStoredFile,
  parseTable,
  readFileText,
  Utf8Check,
} from "./read-file";

export type UploadRow = typeof importUploads.$inferSelect;

export class UploadTooLarge extends Error {}

/** A file refused at upload for its shape; the message says what to change. */
export class UploadRefused extends Error {}

/** Bytes of the file's start that must hold its whole header row: 200 headers of 200 characters fit well within. */
const HEADER_WINDOW_BYTES = 256 * 1024;

/**
 * Refuses a header row wider or longer than a log can be, from the file's
 * start only, before anything reads the whole file.
 */
function checkHeaderRow(start: string, delimiter: Delimiter, byteSize: number) {
  const { headers, rows } = parseTable(start, delimiter, 2);
  const cut = byteSize > HEADER_WINDOW_BYTES && rows.length === 0;
  if (headers.length > MAX_COLUMNS) {
    throw new UploadRefused(
      `The header row has ${cut ? "more than " : ""}${headers.length.toLocaleString("en")} columns (column ${MAX_COLUMNS + 1} is "${shortHeader(headers[MAX_COLUMNS]!)}"); a log may have at most ${MAX_COLUMNS}. Remove the columns you do not need and upload it again.`,
    );
  }
  const long = headers.findIndex((h) => h.length > MAX_HEADER_LENGTH);
  if (long >= 0) {
    throw new UploadRefused(
      `The header of column ${long + 1} in the header row is ${headers[long]!.length.toLocaleString("en")} characters long ("${shortHeader(headers[long]!)}"); headers may be at most ${MAX_HEADER_LENGTH}. Is the first row really a header?`,
    );
  }
  if (cut) {
    throw new UploadRefused(
      `The header row does not end within the first ${HEADER_WINDOW_BYTES / 1024} KB of the file (column ${headers.length} is still going), so it is not a log's header. Check that the file is a CSV with one header row.`,
    );
  }
}

function shortHeader(header: string): string {
  return header.length > 40 ? `${header.slice(0, 40)}…` : header;
}

/** A file put in the object store, with what was learnt while it streamed in. */
export type StoredFile = { id: string; storedAs: string; byteSize: number; sha256: string; encoding: Encoding };

/** Where a company's uploads are kept in the bucket. */
export function uploadKeyPrefix(companyId: number): string {
  return `imports/${companyId}/`;
}

/** The stored file's bytes as they download; `limitBytes` reads only its start. */
export function uploadBytes(file: Pick<UploadRow, "storedAs" | "byteSize">, limitBytes?: number): ByteSource {
  // A file within the limit is read whole: no range asked, which some stores refuse on an empty object.
  return readObject(file.storedAs, limitBytes !== undefined && limitBytes < file.byteSize ? limitBytes : undefined);
}

/**
 * Streams a file into the object store as its bytes arrive, hashing, counting
 * and checking for UTF-8 on the way; nothing is held beyond the part in hand.
 * Past the size cap it stops, the partial upload is dropped and it throws UploadTooLarge.
 */
export async function writeUploadFile(scope: Scope, source: AsyncIterable<Uint8Array> | Iterable<Uint8Array>): Promise<StoredFile> {
  const { maxBytes } = importConfig();
  const id = randomUUID();
  const storedAs = `${uploadKeyPrefix(scope.companyId)}${id}.csv`;
  const hash = createHash("sha256");
  const utf8 = new Utf8Check();
  let byteSize = 0;
  async function* measured() {
    for await (const piece of source) {
      byteSize += piece.byteLength;
      if (byteSize > maxBytes) throw new UploadTooLarge();
      hash.update(piece);
      utf8.push(piece);
      yield piece;
    }
  }
  await putObject(storedAs, measured(), "text/csv");
  return { id, storedAs, byteSize, sha256: hash.digest("hex"), encoding: utf8.end() ? "utf-8" : "windows-1252" };
}

export async function removeStoredFile(file: Pick<StoredFile, "storedAs">) {
  await deleteObject(file.storedAs);
}

async function textStart(file: Pick<UploadRow, "storedAs" | "byteSize">, encoding: Encoding, bytes: number): Promise<string> {
  let text = "";
  for await (const piece of readFileText(uploadBytes(file, bytes), encoding, { partial: true })) text += piece;
  return text;
}

/** Reads the stored file's shape as it streams, proposes a mapping, and records the upload. */
export async function registerUpload(scope: Scope, fileName: string, file: StoredFile): Promise<string> {
  try {
    const start = await textStart(file, file.encoding, HEADER_WINDOW_BYTES);
    const delimiter = detectDelimiter(start.slice(0, 64 * 1024));
    checkHeaderRow(start, delimiter, file.byteSize);
    let rowsTotal = 0;
    const { headers } = await parseStoredFile(uploadBytes(file), file.encoding, delimiter, () => {
      rowsTotal++;
    });
    const columns = await proposeForCompany(scope, headers);
    const options: ImportOptions = { columns, dateOrder: null, createPools: [], createProducts: [] };
    await db()
      .insert(importUploads)
      .values({
        id: file.id,
        companyId: scope.companyId,
        userId: scope.userId,
        fileName: fileName.slice(0, 255) || "upload.csv",
        byteSize: file.byteSize,
        fileSha256: file.sha256,
        storedAs: file.storedAs,
        encoding: file.encoding,
        delimiter,
        rowsTotal,
        options,
      });
    return file.id;
  } catch (error) {
    await removeStoredFile(file);
    throw error;
  }
}

/** Keeps a file already in memory (scripts and tests): the same path as an upload. */
export async function storeUpload(scope: Scope, fileName: string, bytes: Uint8Array): Promise<string> {
  return registerUpload(scope, fileName, await writeUploadFile(scope, [bytes]));
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

/** The upload, with a dead commit claim already released (so it reads "stopped, nothing stored"). */
export async function findUpload(scope: Scope, uploadId: string): Promise<UploadRow | null> {
  const read = async () => {
    const [row] = await db()
      .select()
      .from(importUploads)
      .where(and(eq(importUploads.id, uploadId), eq(importUploads.companyId, scope.companyId)));
    return row ?? null;
  };
  const row = await read();
  if (row?.phase !== "committing") return row;
  return (await releaseDeadClaims({ companyId: scope.companyId, uploadId })) > 0 ? read() : row;
}

export function uploadEncoding(upload: UploadRow): Encoding {
  return upload.encoding === "windows-1252" ? "windows-1252" : "utf-8";
}

/** Headers and the first rows, for the mapping editor: only the start of the file is read. */
export async function uploadSample(upload: UploadRow, rows = 5) {
  const encoding = uploadEncoding(upload);
  const readBytes = 1024 * 1024;
  const text = await textStart(upload, encoding, readBytes);
  const table = parseTable(text, (upload.delimiter ?? ",") as Delimiter, rows + 50);
  // A start cut short may end inside a record: that record is not shown.
  const whole = upload.byteSize <= readBytes;
  const complete = whole ? table.rows : table.rows.slice(0, -1);
  return { headers: table.headers, rows: complete.slice(0, rows), encodingNote: ENCODING_NOTES[encoding] };
}

export async function uploadsInProgress(scope: Scope) {
  await releaseDeadClaims({ companyId: scope.companyId });
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
