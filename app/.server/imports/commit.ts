import type { PoolConnection, ResultSetHeader, RowDataPacket } from "mysql2/promise";
import { and, eq } from "drizzle-orm";
import { ANALYTES, type AnalyteField, METAL_FIELDS } from "~/lib/imports/fields";
import { readImportOptions } from "~/lib/imports/options";
import { accountKey } from "~/lib/imports/match-keys";
import { drizzle } from "drizzle-orm/mysql2";
import { analyzeTables, db, pool as connectionPool } from "../db/client";
import { retryTransaction } from "../db/retry";
import * as schema from "../db/schema";
import { importBatches, importUploads, waterTests, treatments } from "../db/schema";
import { keepPoolsInStep, lockPoolsForKeeping } from "../analytics/kept/keep-pools";
import type { Scope } from "../scope";
import { type ImportPlan, planImport, type PlanSummary } from "./plan";
import { PlannedRows } from "./planned-rows";
import { type Claim, claimForCommit, endClaim, finishClaimSql } from "./claims";
import { findUpload, reportProgress } from "./uploads";
import { afterWaterTestsSaved } from "../mail/alerts";
import { hasNothingToStore, nothingToStoreMessage } from "~/lib/imports/nothing-to-store";

/** After an import this large, table statistics are refreshed (ANALYZE TABLE) so query plans fit the new sizes. */
const LARGE_IMPORT_ROWS = 10_000;

/** Rows per multi-row INSERT: large enough to be quick, small enough for one packet. */
export const INSERT_CHUNK = 1000;

export type CommitHooks = {
  /** Called after each stored chunk, inside the open transaction (tests use it to break the commit). */
  afterChunk?: (info: { table: "water_tests" | "treatments"; stored: number; connectionId: number }) => Promise<void>;
};

export type CommitResult =
  | { ok: true; batchId: number; testsAdded: number; treatmentsAdded: number; summary: PlanSummary }
  | { ok: false; status: 404 | 409 | 422; message: string };

/** Column names of water_tests for each analyte, in ANALYTES order. */
const ANALYTE_COLUMNS: Record<AnalyteField, string> = {
  freeChlorine: "free_chlorine",
  combinedChlorine: "combined_chlorine",
  ph: "ph",
  totalAlkalinity: "total_alkalinity",
  calciumHardness: "calcium_hardness",
  cyanuricAcid: "cyanuric_acid",
  salt: "salt",
  tds: "tds",
  temperatureC: "temperature_c",
  copper: "copper",
  iron: "iron",
  manganese: "manganese",
};

const TEST_COLUMNS = [
  "company_id",
  "pool_id",
  "sampled_at",
  ...ANALYTES.map((field) => ANALYTE_COLUMNS[field]),
  ...METAL_FIELDS.map((metal) => `${ANALYTE_COLUMNS[metal]}_below_detection`),
  "note",
  "import_batch_id",
];

function testValues(rows: PlannedRows, i: number, companyId: number, poolId: number, batchId: number) {
  return [
    companyId,
    poolId,
    new Date(rows.sampledAt[i]!),
    ...rows.readingsOf(i),
    ...METAL_FIELDS.map((metal) => rows.has(i, PlannedRows.BELOW_DETECTION[metal])),
    rows.notes[i] ?? null,
    batchId,
  ];
}

/** Indexes of the rows that carry a flag, in file order. */
function rowsWith(rows: PlannedRows, flag: number): Uint32Array {
  let count = 0;
  for (let i = 0; i < rows.length; i++) if (rows.has(i, flag)) count++;
  const out = new Uint32Array(count);
  for (let i = 0, k = 0; i < rows.length; i++) if (rows.has(i, flag)) out[k++] = i;
  return out;
}

/** The pools already in the route book that the upload adds tests or treatments to: their kept results change. */
function existingPoolsOf(rows: PlannedRows): number[] {
  const pools = new Set<number>();
  for (let i = 0; i < rows.length; i++) {
    const pool = rows.pool[i]!;
    // A row adding only a treatment (to a test already stored) changes its pool's courses too.
    if (pool > 0 && (rows.has(i, PlannedRows.TEST_IS_NEW) || rows.has(i, PlannedRows.ADDS_TREATMENT))) pools.add(pool);
  }
  return [...pools];
}

/**
 * Stores every accepted row of the upload as one import batch, in one
 * transaction: a failure anywhere (a refused insert, a lost connection, a
 * stopped server) leaves nothing behind. Rows already stored are skipped.
 */
export async function commitUpload(scope: Scope, uploadId: string, hooks: CommitHooks = {}): Promise<CommitResult> {
  const upload = await findUpload(scope, uploadId);
  if (!upload) return { ok: false, status: 404, message: "No upload with that id in your company." };
  if (upload.phase === "committed") return { ok: false, status: 409, message: "This file has already been imported." };
  if (upload.phase === "discarded") return { ok: false, status: 409, message: "This upload was set aside; upload the file again." };
  const options = readImportOptions(upload.options);
  if (!options) return { ok: false, status: 422, message: "The column choices for this file are not valid; choose them again." };
  const claim = await claimForCommit(upload.id);
  if (!claim) return { ok: false, status: 409, message: "This file is being imported right now." };
  try {
    return await commitClaimed(scope, upload, options, claim, hooks);
  } finally {
    claim.stop();
  }
}

class ClaimLost extends Error {
  constructor() {
    super("another commit took this upload over after this one went quiet");
  }
}

async function commitClaimed(
  scope: Scope,
  upload: NonNullable<Awaited<ReturnType<typeof findUpload>>>,
  options: NonNullable<ReturnType<typeof readImportOptions>>,
  claim: Claim,
  hooks: CommitHooks,
): Promise<CommitResult> {
  let planned: Awaited<ReturnType<typeof planImport>>;
  try {
    planned = await planImport(scope, upload, options, "committing");
  } catch (error) {
    await endClaim(claim, { phase: "failed", error: `Nothing was stored: ${String(error)}` }).catch(() => undefined);
    throw error;
  }
  const { plan, summary } = planned;
  if ((plan.dateOrder.kind === "ambiguous" || plan.dateOrder.kind === "conflicting") && !options.dateOrder) {
    await endClaim(claim, { phase: "checked", error: null });
    return { ok: false, status: 422, message: `Choose the date order first: ${plan.dateOrder.reason}.` };
  }
  if (hasNothingToStore(plan)) {
    await endClaim(claim, { phase: "checked", error: null });
    return { ok: false, status: 422, message: nothingToStoreMessage(summary) };
  }
  const total = plan.testsToAdd + plan.treatmentsToAdd;
  await reportProgress(upload.id, { phase: "committing", rowsDone: 0, rowsTotal: total });

  // A lost writer, a deadlock or a certification conflict runs the whole transaction again;
  // the claim token makes that safe (an attempt whose commit did land is recognised first).
  try {
    return await retryTransaction({ unit: "import commit" }, async (attempt) => {
      if (attempt > 1) {
        const stored = await committedBatchOf(upload.id);
        if (stored !== null) return { ok: true, batchId: stored, testsAdded: plan.testsToAdd, treatmentsAdded: plan.treatmentsToAdd, summary };
      }
      const connection = await connectionPool().getConnection();
      let broken = false;
      try {
        const [[{ connectionId }]] = (await connection.query("SELECT CONNECTION_ID() AS connectionId")) as unknown as [[{ connectionId: number }]];
        await connection.beginTransaction();
        const keeper = drizzle(connection, { schema, mode: "default" });
        const rows = plan.planned;
        const touchedPools = existingPoolsOf(rows);
        await lockPoolsForKeeping(keeper, touchedPools);
        const batchId = await insertBatch(connection, scope, upload.fileName, upload.fileSha256, plan);
        const newPools = await createPools(connection, scope, plan);
        const newProducts = await createProducts(connection, scope, plan);
        const poolIdOf = (i: number) => {
          const pool = rows.pool[i]!;
          return pool > 0 ? pool : newPools.get(rows.newPoolKeys[-pool - 1]!)!;
        };
        const productIdOf = (i: number) => {
          const product = rows.product[i]!;
          return product > 0 ? product : newProducts.get(rows.newProductKeys[-product - 1]!)!;
        };

        let stored = 0;
        const tests = rowsWith(rows, PlannedRows.TEST_IS_NEW);
        for (let from = 0; from < tests.length; from += INSERT_CHUNK) {
          const chunk = tests.subarray(from, from + INSERT_CHUNK);
          await connection.query(`INSERT INTO water_tests (${TEST_COLUMNS.join(", ")}) VALUES ?`, [
            Array.from(chunk, (i) => testValues(rows, i, scope.companyId, poolIdOf(i), batchId)),
          ]);
          stored += chunk.length;
          await reportProgress(upload.id, { rowsDone: stored });
          await hooks.afterChunk?.({ table: "water_tests", stored, connectionId });
        }

        const withTreatment = rowsWith(rows, PlannedRows.ADDS_TREATMENT);
        const testIds = withTreatment.some((i) => rows.has(i, PlannedRows.TEST_IS_NEW))
          ? await storedTestIds(connection, batchId)
          : new Map<string, number>();
        for (let from = 0; from < withTreatment.length; from += INSERT_CHUNK) {
          const chunk = withTreatment.subarray(from, from + INSERT_CHUNK);
          await connection.query(
            "INSERT INTO treatments (company_id, pool_id, product_id, applied_at, amount, unit, cost, water_test_id, import_batch_id) VALUES ?",
            [
              Array.from(chunk, (i) => {
                const poolId = poolIdOf(i);
                const cost = rows.cost[i]!;
                return [
                  scope.companyId,
                  poolId,
                  productIdOf(i),
                  new Date(rows.sampledAt[i]!),
                  rows.amount[i]!,
                  rows.units[i]!,
                  Number.isNaN(cost) ? null : cost,
                  testIds.get(`${poolId}|${rows.sampledAt[i]}`) ?? null,
                  batchId,
                ];
              }),
            ],
          );
          stored += chunk.length;
          await reportProgress(upload.id, { rowsDone: stored });
          await hooks.afterChunk?.({ table: "treatments", stored, connectionId });
        }

        // The pools were locked first thing in this transaction, before any consistent read.
        await keepPoolsInStep(keeper, scope.companyId, [...touchedPools, ...newPools.values()], { reader: connection, poolsLockedBeforeFirstRead: true });

        // Fenced by the claim token: a commit taken over after going quiet rolls back here.
        const finish = finishClaimSql(claim);
        const [done] = await connection.query<ResultSetHeader>(
          `UPDATE import_uploads SET phase = 'committed', rows_done = ?, import_batch_id = ?, summary = ?, error = NULL, ${finish.set}, updated_at = CURRENT_TIMESTAMP(3) WHERE ${finish.where}`,
          [stored, batchId, JSON.stringify(summary), ...finish.values],
        );
        if (done.affectedRows !== 1) throw new ClaimLost();
        await connection.commit();
        // Alerts look only at recent events, so years of history mail nobody.
        void afterWaterTestsSaved(scope.companyId, [...new Set(Array.from(tests, poolIdOf))]);
        if (plan.testsToAdd + plan.treatmentsToAdd >= LARGE_IMPORT_ROWS) void analyzeTables().catch((e: unknown) => console.error("[import] ANALYZE TABLE failed", e));
        return { ok: true, batchId, testsAdded: plan.testsToAdd, treatmentsAdded: plan.treatmentsToAdd, summary };
      } catch (error) {
        broken = true;
        await connection.rollback().catch(() => undefined);
        throw error;
      } finally {
        // A connection that failed half-way may be dead or mid-transaction: never hand it back.
        if (broken) connection.destroy();
        else connection.release();
      }
    });
  } catch (error) {
    if (!(error instanceof ClaimLost)) {
      await endClaim(claim, {
        phase: "failed",
        error: `Nothing was stored: ${error instanceof Error ? error.message : String(error)}`,
      }).catch(() => undefined);
    }
    throw error;
  }
}

/** The batch of an upload already committed (by an earlier attempt whose answer was lost), or null. */
async function committedBatchOf(uploadId: string): Promise<number | null> {
  const [rows] = await connectionPool().query<RowDataPacket[]>(
    "SELECT import_batch_id AS batchId FROM import_uploads WHERE id = ? AND phase = 'committed' AND claim_id IS NULL",
    [uploadId],
  );
  const batchId = rows[0]?.batchId as number | null | undefined;
  return batchId ?? null;
}

async function insertBatch(
  connection: PoolConnection,
  scope: Scope,
  fileName: string,
  fileSha256: string,
  plan: ImportPlan,
): Promise<number> {
  const [result] = await connection.query<ResultSetHeader>(
    "INSERT INTO import_batches (company_id, user_id, file_name, file_sha256, status, tests_added, treatments_added, rows_duplicate, rows_refused) VALUES (?, ?, ?, ?, 'committed', ?, ?, ?, ?)",
    [scope.companyId, scope.userId, fileName, fileSha256, plan.testsToAdd, plan.treatmentsToAdd, plan.duplicates, plan.refusedRows],
  );
  return result.insertId;
}

/** Creates the unknown pools the person chose to add, from the file's own columns. */
async function createPools(connection: PoolConnection, scope: Scope, plan: ImportPlan): Promise<Map<string, number>> {
  const ids = new Map<string, number>();
  for (const unknown of plan.unknownPools.filter((p) => p.create)) {
    const code = unknown.accountCode ? (accountKey(unknown.accountCode) ?? unknown.accountCode) : `IMP-${unknown.firstRow}-${Date.now().toString(36)}`.slice(0, 40);
    const [result] = await connection.query<ResultSetHeader>(
      "INSERT INTO pools (company_id, account_code, customer_name, street) VALUES (?, ?, ?, ?)",
      [scope.companyId, code, unknown.customerName ?? "Not given in the imported file", unknown.address ?? "Not given in the imported file"],
    );
    ids.set(unknown.key, result.insertId);
  }
  return ids;
}

async function createProducts(connection: PoolConnection, scope: Scope, plan: ImportPlan): Promise<Map<string, number>> {
  const ids = new Map<string, number>();
  for (const unknown of plan.unknownProducts.filter((p) => p.create)) {
    const [result] = await connection.query<ResultSetHeader>(
      "INSERT INTO products (company_id, name, category) VALUES (?, ?, 'other')",
      [scope.companyId, unknown.name],
    );
    ids.set(unknown.key, result.insertId);
  }
  return ids;
}

async function storedTestIds(connection: PoolConnection, batchId: number): Promise<Map<string, number>> {
  const [rows] = await connection.query<RowDataPacket[]>(
    "SELECT id, pool_id AS poolId, sampled_at AS sampledAt FROM water_tests WHERE import_batch_id = ?",
    [batchId],
  );
  return new Map(rows.map((r) => [`${r.poolId}|${new Date(r.sampledAt).getTime()}`, Number(r.id)]));
}

/** Removes exactly the rows of one batch and marks it undone. */
export async function undoBatch(scope: Scope, batchId: number): Promise<{ ok: true; tests: number; treatments: number } | { ok: false; status: 404 | 409; message: string }> {
  return db().transaction(async (tx) => {
    const [batch] = await tx
      .select()
      .from(importBatches)
      .where(and(eq(importBatches.id, batchId), eq(importBatches.companyId, scope.companyId)))
      .for("update");
    if (!batch) return { ok: false as const, status: 404 as const, message: "No import batch with that number in your company." };
    if (batch.status === "undone") return { ok: false as const, status: 409 as const, message: "This import has already been undone." };
    const touched = await tx.selectDistinct({ poolId: waterTests.poolId }).from(waterTests).where(eq(waterTests.importBatchId, batchId));
    const treated = await tx.selectDistinct({ poolId: treatments.poolId }).from(treatments).where(eq(treatments.importBatchId, batchId));
    const touchedPools = [...new Set([...touched, ...treated].map((t) => t.poolId))];
    await lockPoolsForKeeping(tx, touchedPools);
    const [removedTreatments] = await tx
      .delete(treatments)
      .where(and(eq(treatments.importBatchId, batchId), eq(treatments.companyId, scope.companyId)));
    const [removedTests] = await tx
      .delete(waterTests)
      .where(and(eq(waterTests.importBatchId, batchId), eq(waterTests.companyId, scope.companyId)));
    await keepPoolsInStep(tx, scope.companyId, touchedPools);
    await tx.update(importBatches).set({ status: "undone", undoneAt: new Date() }).where(eq(importBatches.id, batchId));
    await tx
      .update(importUploads)
      .set({ phase: "discarded", updatedAt: new Date() })
      .where(and(eq(importUploads.importBatchId, batchId), eq(importUploads.companyId, scope.companyId)));
    return { ok: true as const, tests: removedTests.affectedRows, treatments: removedTreatments.affectedRows };
  });
}
