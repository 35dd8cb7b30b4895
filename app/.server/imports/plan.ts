import { and, eq, gte, inArray, lte, type SQL } from "drizzle-orm";
import type { AnyMySqlColumn } from "drizzle-orm/mysql-core";
import { DateOrderEvidence, type DateOrderFinding } from "~/lib/imports/dates";
import type { ImportOptions } from "~/lib/imports/options";
import { accountKey, addressKey, productKey, unknownPoolKey } from "~/lib/imports/match-keys";
import { type Refusal, type RowContext, validateRow } from "~/lib/imports/validate-row";
import { db } from "../db/client";
import { pools, products, treatments, waterTests } from "../db/schema";
import { type Scope, poolsInScope } from "../scope";
import { PlannedRows } from "./planned-rows";
import { type Delimiter, ENCODING_NOTES, parseStoredFile } from "./read-file";
import { reportProgress, uploadBytes, uploadEncoding, type UploadRow } from "./uploads";

export type UnknownPool = {
  key: string;
  accountCode: string | null;
  address: string | null;
  customerName: string | null;
  rows: number;
  firstRow: number;
  create: boolean;
};

export type UnknownProduct = { key: string; name: string; rows: number; create: boolean };

export type ImportPlan = {
  dateOrder: DateOrderFinding;
  rowsRead: number;
  planned: PlannedRows;
  testsToAdd: number;
  treatmentsToAdd: number;
  duplicates: number;
  refused: Refusal[];
  refusedRows: number;
  leftOutUnknownPool: number;
  unknownPools: UnknownPool[];
  unknownProducts: UnknownProduct[];
  pHWarnings: number;
};

/** What the check page shows; stored with the upload. */
export type PlanSummary = Omit<ImportPlan, "planned" | "refused"> & {
  refusedSample: Refusal[];
  encodingNote: string;
  delimiter: Delimiter;
  checkedAt: string;
};

const PROGRESS_EVERY = 5000;

function instantKey(poolId: number | string, at: number) {
  return `${poolId}|${at}`;
}

/**
 * Reads the file with the chosen mapping and works out what a commit would
 * store: nothing is written except progress. The file is read as it streams,
 * twice when a date column is mapped (its order must be known before any
 * date is read); each accepted row is kept only in compact typed columns.
 */
export async function planImport(
  scope: Scope,
  upload: UploadRow,
  options: ImportOptions,
  /** The phase to report progress under; null reads quietly (e.g. for the refused-rows download). */
  phase: "checking" | "committing" | null = "checking",
): Promise<{ plan: ImportPlan; summary: PlanSummary }> {
  let reporting: Promise<void> = Promise.resolve();
  /** Progress is written in order, without holding up the reading. */
  const report = (values: Parameters<typeof reportProgress>[1]) => {
    if (!phase) return;
    reporting = reporting.then(() => reportProgress(upload.id, values));
    // Observed at once: when the plan stops before awaiting it (the database went away), an
    // unobserved failed write would be an unhandled rejection, which ends the server process.
    reporting.catch(() => undefined);
  };
  const delimiter = (upload.delimiter ?? ",") as Delimiter;
  const encoding = uploadEncoding(upload);
  if (phase) report({ phase, rowsDone: 0, rowsTotal: upload.rowsTotal, error: null });

  const dateColumn = options.columns.findIndex((c) => c.field === "sampledAt");
  let dateOrder: DateOrderFinding = { kind: "none" };
  if (dateColumn >= 0) {
    const evidence = new DateOrderEvidence();
    await parseStoredFile(uploadBytes(upload), encoding, delimiter, (_row, cells) => evidence.add(cells[dateColumn] ?? ""));
    dateOrder = evidence.finding();
  }
  const chosenOrder = options.dateOrder ?? (dateOrder.kind === "known" ? dateOrder.order : null);

  const poolRows = await db()
    .select({ id: pools.id, accountCode: pools.accountCode, street: pools.street })
    .from(pools)
    .where(poolsInScope(scope));
  const byCode = new Map<string, number>();
  for (const p of poolRows) {
    const key = accountKey(p.accountCode);
    if (key !== null && !byCode.has(key)) byCode.set(key, p.id);
  }
  const byAddress = new Map<string, number>();
  for (const p of poolRows) if (!byAddress.has(addressKey(p.street))) byAddress.set(addressKey(p.street), p.id);
  const productRows = await db()
    .select({ id: products.id, name: products.name })
    .from(products)
    .where(eq(products.companyId, scope.companyId));
  const productByKey = new Map(productRows.map((p) => [productKey(p.name), p.id]));

  const createPools = new Set(options.createPools);
  const createProducts = new Set(options.createProducts);
  const unknownPools = new Map<string, UnknownPool>();
  const unknownProducts = new Map<string, UnknownProduct>();
  const refused: Refusal[] = [];
  let rowsRead = 0;
  let refusedRows = 0;
  let leftOutUnknownPool = 0;
  let pHWarnings = 0;
  const accepted = new PlannedRows();
  let context: RowContext | null = null;

  const readRow = (row: number, cells: string[]) => {
    const result = validateRow(cells, row, context!);
    if (!result.ok) {
      for (const refusal of result.refusals) refused.push(refusal);
      refusedRows++;
      return;
    }
    const record = result.record;
    if (record.test?.ph !== undefined && (record.test.ph < 6 || record.test.ph > 9)) pHWarnings++;
    let pool =
      (record.accountCode ? byCode.get(record.accountCode) : undefined) ??
      (record.address ? byAddress.get(addressKey(record.address)) : undefined);
    if (pool === undefined) {
      const key = unknownPoolKey(record.accountCode, record.address);
      const listed = unknownPools.get(key) ?? {
        key,
        accountCode: record.accountCode,
        address: record.address,
        customerName: record.customerName,
        rows: 0,
        firstRow: row,
        create: createPools.has(key),
      };
      listed.rows++;
      listed.address ??= record.address;
      listed.customerName ??= record.customerName;
      unknownPools.set(key, listed);
      if (!listed.create) {
        leftOutUnknownPool++;
        return;
      }
      pool = accepted.newPool(key);
    }
    let product = 0;
    if (record.treatment) {
      const key = productKey(record.treatment.product);
      const id = productByKey.get(key);
      if (id !== undefined) product = id;
      else {
        const listed = unknownProducts.get(key) ?? { key, name: record.treatment.product, rows: 0, create: createProducts.has(key) };
        listed.rows++;
        unknownProducts.set(key, listed);
        if (listed.create) product = accepted.newProduct(key);
      }
    }
    accepted.add(record, pool, product);
  };

  await parseStoredFile(
    uploadBytes(upload),
    encoding,
    delimiter,
    (row, cells) => {
      rowsRead++;
      if (rowsRead % PROGRESS_EVERY === 0) report({ rowsDone: rowsRead });
      readRow(row, cells);
    },
    (headers) => {
      context = { headers, columns: options.columns, dateOrder: chosenOrder, timeZone: scope.timeZone, style: { decimalComma: delimiter !== "," } };
    },
  );
  await reporting;

  const counts = await markNewRows(scope, accepted);
  report({ rowsDone: rowsRead, rowsTotal: rowsRead });
  await reporting;

  const plan: ImportPlan = {
    dateOrder,
    rowsRead,
    planned: accepted,
    ...counts,
    refused,
    refusedRows,
    leftOutUnknownPool,
    unknownPools: [...unknownPools.values()],
    unknownProducts: [...unknownProducts.values()],
    pHWarnings,
  };
  const { planned: _planned, refused: _refused, ...figures } = plan;
  return {
    plan,
    summary: {
      ...figures,
      unknownPools: figures.unknownPools.slice(0, 500),
      refusedSample: refused.slice(0, 100),
      encodingNote: ENCODING_NOTES[encoding],
      delimiter,
      checkedAt: new Date().toISOString(),
    },
  };
}

/**
 * Marks which accepted rows add a test and which add a treatment: a test is
 * new unless the same pool has one at the same instant (stored, or earlier in
 * the file); a treatment is new unless the same pool, instant, product and
 * amount are already there. A row adding neither is a duplicate.
 */
async function markNewRows(scope: Scope, rows: PlannedRows) {
  const existing = await existingTests(scope, rows);
  const existingTreatments = await existingTreatmentKeys(scope, rows);
  const seen = new Set<string>();
  let duplicates = 0;
  let testsToAdd = 0;
  let treatmentsToAdd = 0;
  for (let i = 0; i < rows.length; i++) {
    const pool = rows.pool[i]!;
    const key = instantKey(pool > 0 ? pool : `new:${rows.newPoolKeys[-pool - 1]}`, rows.sampledAt[i]!);
    const hasTest = rows.has(i, PlannedRows.HAS_TEST);
    const testIsNew = hasTest && !existing.has(key) && !seen.has(key);
    if (hasTest) seen.add(key);
    let addsTreatment = false;
    const product = rows.product[i]!;
    if (product !== 0) {
      const productRef = product > 0 ? product : `new:${rows.newProductKeys[-product - 1]}`;
      const treatmentKey = `${key}|${productRef}|${rows.amount[i]}`;
      addsTreatment = !existingTreatments.has(treatmentKey) && !seen.has(treatmentKey);
      seen.add(treatmentKey);
    }
    rows.mark(i, PlannedRows.TEST_IS_NEW, testIsNew);
    rows.mark(i, PlannedRows.ADDS_TREATMENT, addsTreatment);
    if (!testIsNew && !addsTreatment) duplicates++;
    if (testIsNew) testsToAdd++;
    if (addsTreatment) treatmentsToAdd++;
  }
  return { testsToAdd, treatmentsToAdd, duplicates };
}

/** Stored pools among the rows (and the time span they cover), optionally only rows with a treatment. */
function knownPoolSpan(rows: PlannedRows, treatmentsOnly: boolean) {
  const ids = new Set<number>();
  let min = Infinity;
  let max = -Infinity;
  for (let i = 0; i < rows.length; i++) {
    if (treatmentsOnly && rows.product[i] === 0) continue;
    const pool = rows.pool[i]!;
    if (pool > 0) ids.add(pool);
    const t = rows.sampledAt[i]!;
    if (t < min) min = t;
    if (t > max) max = t;
  }
  return { ids: [...ids], from: new Date(min), to: new Date(max) };
}

type PoolSpan = ReturnType<typeof knownPoolSpan>;

/** Where a stored table keeps the owning company, the pool and the time of a row. */
type PoolTimeColumns = { companyId: AnyMySqlColumn; poolId: AnyMySqlColumn; at: AnyMySqlColumn };

/**
 * Keys of the rows already stored for the span's pools within its time span,
 * read 1,000 pool ids per statement so the IN list stays short.
 */
async function storedKeys<Row>(
  scope: Scope,
  span: PoolSpan,
  columns: PoolTimeColumns,
  read: (where: SQL | undefined) => Promise<Row[]>,
  keyOf: (row: Row) => string,
) {
  const keys = new Set<string>();
  for (let i = 0; i < span.ids.length; i += 1000) {
    const where = and(
      eq(columns.companyId, scope.companyId),
      inArray(columns.poolId, span.ids.slice(i, i + 1000)),
      gte(columns.at, span.from),
      lte(columns.at, span.to),
    );
    for (const row of await read(where)) keys.add(keyOf(row));
  }
  return keys;
}

/** Tests already stored for the file's pools within the file's time span, as pool|instant keys. */
async function existingTests(scope: Scope, rows: PlannedRows) {
  return storedKeys(
    scope,
    knownPoolSpan(rows, false),
    { companyId: waterTests.companyId, poolId: waterTests.poolId, at: waterTests.sampledAt },
    (where) => db().select({ poolId: waterTests.poolId, sampledAt: waterTests.sampledAt }).from(waterTests).where(where),
    (row) => instantKey(row.poolId, row.sampledAt.getTime()),
  );
}

/** Treatments already stored: the same pool, time, product and amount count as the same treatment. */
async function existingTreatmentKeys(scope: Scope, rows: PlannedRows) {
  return storedKeys(
    scope,
    knownPoolSpan(rows, true),
    { companyId: treatments.companyId, poolId: treatments.poolId, at: treatments.appliedAt },
    (where) =>
      db()
        .select({ poolId: treatments.poolId, appliedAt: treatments.appliedAt, productId: treatments.productId, amount: treatments.amount })
        .from(treatments)
        .where(where),
    (row) => `${instantKey(row.poolId, row.appliedAt.getTime())}|${row.productId}|${row.amount}`,
  );
}
