import { and, eq, gte, inArray, lte } from "drizzle-orm";
import { type DateOrderFinding, findDateOrder } from "~/lib/imports/dates";
import type { ImportOptions } from "~/lib/imports/options";
import { accountKey, addressKey, productKey, unknownPoolKey } from "~/lib/imports/match-keys";
import { type ImportRecord, type Refusal, validateRow } from "~/lib/imports/validate-row";
import { db } from "../db/client";
import { pools, products, treatments, waterTests } from "../db/schema";
import type { Scope } from "../guard";
import { poolsInScope } from "../queries/scope";
import { type Delimiter, parseTable } from "./read-file";
import { readUploadText, reportProgress, type UploadRow } from "./uploads";

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

/** A pool is an existing id, or one of the unknown pools the person chose to create. */
export type PoolRef = { id: number } | { newKey: string };

export type PlannedRow = { record: ImportRecord; pool: PoolRef; product: { id: number } | { newKey: string } | null; testIsNew: boolean };

export type ImportPlan = {
  dateOrder: DateOrderFinding;
  rowsRead: number;
  planned: PlannedRow[];
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

function instantKey(poolId: number | string, at: Date) {
  return `${poolId}|${at.getTime()}`;
}

/**
 * Reads the whole file with the chosen mapping and works out what a commit
 * would store: nothing is written except progress.
 */
export async function planImport(
  scope: Scope,
  upload: UploadRow,
  options: ImportOptions,
  /** The phase to report progress under; null reads quietly (e.g. for the refused-rows download). */
  phase: "checking" | "committing" | null = "checking",
): Promise<{ plan: ImportPlan; summary: PlanSummary }> {
  const report = async (values: Parameters<typeof reportProgress>[1]) => {
    if (phase) await reportProgress(upload.id, values);
  };
  const delimiter = (upload.delimiter ?? ",") as Delimiter;
  // Only the parsed rows are kept, not the text, and they are let go once read.
  const { table, encodingNote } = await readUploadText(upload).then((decoded) => ({
    table: parseTable(decoded.text, delimiter),
    encodingNote: decoded.note,
  }));
  const rowsRead = table.rows.length;
  if (phase) await report({ phase, rowsDone: 0, rowsTotal: rowsRead, error: null });

  const dateColumn = options.columns.findIndex((c) => c.field === "sampledAt");
  const dateOrder = dateColumn < 0 ? ({ kind: "none" } as const) : findDateOrder(table.rows.map((r) => r.cells[dateColumn] ?? ""));
  const chosenOrder = options.dateOrder ?? (dateOrder.kind === "known" ? dateOrder.order : null);

  const poolRows = await db()
    .select({ id: pools.id, accountCode: pools.accountCode, street: pools.street })
    .from(pools)
    .where(poolsInScope(scope));
  const byCode = new Map(poolRows.map((p) => [accountKey(p.accountCode), p.id]));
  const byAddress = new Map<string, number>();
  for (const p of poolRows) if (!byAddress.has(addressKey(p.street))) byAddress.set(addressKey(p.street), p.id);
  const productRows = await db()
    .select({ id: products.id, name: products.name })
    .from(products)
    .where(eq(products.companyId, scope.companyId));
  const productByKey = new Map(productRows.map((p) => [productKey(p.name), p.id]));

  const context = {
    headers: table.headers,
    columns: options.columns,
    dateOrder: chosenOrder,
    timeZone: scope.timeZone,
    style: { decimalComma: delimiter !== "," },
  };
  const createPools = new Set(options.createPools);
  const createProducts = new Set(options.createProducts);
  const unknownPools = new Map<string, UnknownPool>();
  const unknownProducts = new Map<string, UnknownProduct>();
  const refused: Refusal[] = [];
  let refusedRows = 0;
  let leftOutUnknownPool = 0;
  let pHWarnings = 0;
  const accepted: Array<{ record: ImportRecord; pool: PoolRef; product: PlannedRow["product"] }> = [];

  for (let i = 0; i < rowsRead; i++) {
    if (i > 0 && i % PROGRESS_EVERY === 0) await report({ rowsDone: i });
    const { row, cells } = table.rows[i]!;
    table.rows[i] = undefined as never;
    const result = validateRow(cells, row, context);
    if (!result.ok) {
      refused.push(...result.refusals);
      refusedRows++;
      continue;
    }
    const record = result.record;
    if (record.test?.ph !== undefined && (record.test.ph < 6 || record.test.ph > 9)) pHWarnings++;
    const poolId =
      (record.accountCode ? byCode.get(accountKey(record.accountCode)) : undefined) ??
      (record.address ? byAddress.get(addressKey(record.address)) : undefined);
    let pool: PoolRef;
    if (poolId !== undefined) {
      pool = { id: poolId };
    } else {
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
        continue;
      }
      pool = { newKey: key };
    }
    let product: PlannedRow["product"] = null;
    if (record.treatment) {
      const key = productKey(record.treatment.product);
      const id = productByKey.get(key);
      if (id !== undefined) product = { id };
      else {
        const listed = unknownProducts.get(key) ?? { key, name: record.treatment.product, rows: 0, create: createProducts.has(key) };
        listed.rows++;
        unknownProducts.set(key, listed);
        product = listed.create ? { newKey: key } : null;
      }
    }
    accepted.push({ record, pool, product });
  }

  const existing = await existingTests(scope, accepted);
  const existingTreatments = await existingTreatmentKeys(scope, accepted);
  const planned: PlannedRow[] = [];
  const seen = new Set<string>();
  let duplicates = 0;
  let testsToAdd = 0;
  let treatmentsToAdd = 0;
  for (const entry of accepted) {
    const poolKey = "id" in entry.pool ? entry.pool.id : `new:${entry.pool.newKey}`;
    const key = instantKey(poolKey, entry.record.sampledAt);
    const testIsNew = entry.record.test !== null && !existing.has(key) && !seen.has(key);
    if (entry.record.test) seen.add(key);
    let product = entry.product;
    if (product && entry.record.treatment) {
      const productRef = "id" in product ? product.id : `new:${product.newKey}`;
      const treatmentKey = `${key}|${productRef}|${entry.record.treatment.amount}`;
      if (existingTreatments.has(treatmentKey) || seen.has(treatmentKey)) product = null;
      seen.add(treatmentKey);
    }
    const addsTreatment = product !== null && entry.record.treatment !== null;
    if (!testIsNew && !addsTreatment) {
      duplicates++;
      continue;
    }
    if (testIsNew) testsToAdd++;
    if (addsTreatment) treatmentsToAdd++;
    planned.push({ record: entry.record, pool: entry.pool, product: addsTreatment ? product : null, testIsNew });
  }
  table.rows.length = 0;
  await report({ rowsDone: rowsRead });

  const plan: ImportPlan = {
    dateOrder,
    rowsRead,
    planned,
    testsToAdd,
    treatmentsToAdd,
    duplicates,
    refused,
    refusedRows,
    leftOutUnknownPool,
    unknownPools: [...unknownPools.values()],
    unknownProducts: [...unknownProducts.values()],
    pHWarnings,
  };
  const { planned: _planned, refused: _refused, ...counts } = plan;
  return {
    plan,
    summary: {
      ...counts,
      unknownPools: counts.unknownPools.slice(0, 500),
      refusedSample: refused.slice(0, 100),
      encodingNote,
      delimiter,
      checkedAt: new Date().toISOString(),
    },
  };
}

function timeRange(entries: Array<{ record: ImportRecord }>) {
  let min = Infinity;
  let max = -Infinity;
  for (const { record } of entries) {
    const t = record.sampledAt.getTime();
    if (t < min) min = t;
    if (t > max) max = t;
  }
  return { from: new Date(min), to: new Date(max) };
}

function knownPoolIds(entries: Array<{ pool: PoolRef }>): number[] {
  const ids = new Set<number>();
  for (const { pool } of entries) if ("id" in pool) ids.add(pool.id);
  return [...ids];
}

/** Tests already stored for the file's pools within the file's time span, as pool|instant keys. */
async function existingTests(scope: Scope, entries: Array<{ record: ImportRecord; pool: PoolRef }>) {
  const ids = knownPoolIds(entries);
  const keys = new Set<string>();
  if (ids.length === 0) return keys;
  const { from, to } = timeRange(entries);
  for (let i = 0; i < ids.length; i += 1000) {
    const rows = await db()
      .select({ poolId: waterTests.poolId, sampledAt: waterTests.sampledAt })
      .from(waterTests)
      .where(
        and(
          eq(waterTests.companyId, scope.companyId),
          inArray(waterTests.poolId, ids.slice(i, i + 1000)),
          gte(waterTests.sampledAt, from),
          lte(waterTests.sampledAt, to),
        ),
      );
    for (const row of rows) keys.add(instantKey(row.poolId, row.sampledAt));
  }
  return keys;
}

/** Treatments already stored: the same pool, time, product and amount count as the same treatment. */
async function existingTreatmentKeys(scope: Scope, entries: Array<{ record: ImportRecord; pool: PoolRef }>) {
  const withTreatment = entries.filter((e) => e.record.treatment);
  const ids = knownPoolIds(withTreatment);
  const keys = new Set<string>();
  if (ids.length === 0) return keys;
  const { from, to } = timeRange(withTreatment);
  for (let i = 0; i < ids.length; i += 1000) {
    const rows = await db()
      .select({ poolId: treatments.poolId, appliedAt: treatments.appliedAt, productId: treatments.productId, amount: treatments.amount })
      .from(treatments)
      .where(
        and(
          eq(treatments.companyId, scope.companyId),
          inArray(treatments.poolId, ids.slice(i, i + 1000)),
          gte(treatments.appliedAt, from),
          lte(treatments.appliedAt, to),
        ),
      );
    for (const row of rows) keys.add(`${instantKey(row.poolId, row.appliedAt)}|${row.productId}|${row.amount}`);
  }
  return keys;
}
