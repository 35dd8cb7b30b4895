import { setTimeout as sleep } from "node:timers/promises";
import { keepPoolsInStep, lockPoolsForKeeping } from "../../analytics/kept/keep-pools";
import { and, eq, inArray } from "drizzle-orm";
import type { VisitInput } from "~/lib/forms/visit";
import { db } from "../../db/client";
import { retryTransaction } from "../../db/retry";
import { metalColumnValues } from "../../db/values";
import { pools, products, treatments, waterTests } from "../../db/schema";
import { type Scope, poolsInScope } from "../../scope";
import { invalid, isDuplicateKey, notFound, type ServiceResult } from "../../command-result";
import { afterWaterTestsSaved } from "../../mail/alerts";

export type VisitSaved = { testId: number; poolId: number; repeated: boolean };

async function alreadyStored(scope: Scope, submissionKey: string) {
  const [row] = await db()
    .select({ id: waterTests.id, poolId: waterTests.poolId })
    .from(waterTests)
    .where(and(eq(waterTests.companyId, scope.companyId), eq(waterTests.submissionKey, submissionKey)));
  return row ? { ok: true as const, testId: row.id, poolId: row.poolId, repeated: true } : null;
}

/** Cost of a treatment from the product's unit cost, when given in the product's own unit. */
export function treatmentCost(amount: number, unit: string, product: { unitCost: number | null; doseUnit: string | null }) {
  if (product.unitCost === null || !product.doseUnit) return null;
  if (unit.toLowerCase() !== product.doseUnit.toLowerCase()) return null;
  return Math.round(amount * product.unitCost * 100) / 100;
}

/**
 * Stores one visit (a water test and the treatments given) in one
 * transaction. A submission key seen before returns the visit stored then,
 * so a double tap or a resent form stores nothing twice.
 */
export async function logVisit(scope: Scope, poolId: number, input: VisitInput, now: Date): Promise<ServiceResult<VisitSaved>> {
  const earlier = await alreadyStored(scope, input.submissionKey);
  if (earlier) return earlier;

  const [pool] = await db()
    .select({ id: pools.id })
    .from(pools)
    .where(and(poolsInScope(scope), eq(pools.id, poolId)));
  if (!pool) return notFound("No pool with that number is on your routes.");

  const productIds = [...new Set(input.treatments.map((t) => t.productId))];
  const known =
    productIds.length === 0
      ? []
      : await db()
          .select({ id: products.id, doseUnit: products.doseUnit, unitCost: products.unitCost })
          .from(products)
          .where(and(eq(products.companyId, scope.companyId), inArray(products.id, productIds)));
  const byId = new Map(known.map((p) => [p.id, p]));
  const lines: Array<{ productId: number; amount: number; unit: string; cost: number | null }> = [];
  for (const [i, line] of input.treatments.entries()) {
    const product = byId.get(line.productId);
    if (!product) return invalid({ [`treatments.${i}.product`]: `Treatment ${i + 1} product: ${line.productId} is not one of this company's products.` });
    const unit = line.unit ?? product.doseUnit;
    if (!unit) return invalid({ [`treatments.${i}.unit`]: `Treatment ${i + 1} unit: name the unit of the amount.` });
    lines.push({ productId: line.productId, amount: line.amount, unit, cost: treatmentCost(line.amount, unit, product) });
  }

  for (let attempt = 1; ; attempt++) {
    try {
      const testId = await storeVisit(scope, poolId, input, lines, now);
      // Alerts are worked out after the commit and never hold up or undo the save.
      void afterWaterTestsSaved(scope.companyId, [poolId]);
      return { ok: true, testId, poolId, repeated: false };
    } catch (error) {
      // Twin submits running at the same moment: whichever stored first is the answer.
      if (isDuplicateKey(error) || isLockConflict(error)) {
        const stored = await alreadyStored(scope, input.submissionKey);
        if (stored) return stored;
      }
      if (isLockConflict(error) && attempt < MAX_ATTEMPTS) {
        await sleep(10 * attempt + Math.random() * 20 * attempt);
        continue;
      }
      throw error;
    }
  }
}

const MAX_ATTEMPTS = 5;

/** MariaDB chose this transaction as a deadlock victim, or it waited too long for a lock: safe to run again. */
function isLockConflict(error: unknown): boolean {
  for (let e: unknown = error; e; e = (e as { cause?: unknown }).cause) {
    const code = (e as { code?: string }).code;
    if (code === "ER_LOCK_DEADLOCK" || code === "ER_LOCK_WAIT_TIMEOUT") return true;
  }
  return false;
}

async function storeVisit(
  scope: Scope,
  poolId: number,
  input: VisitInput,
  lines: Array<{ productId: number; amount: number; unit: string; cost: number | null }>,
  now: Date,
): Promise<number> {
  const r = input.readings;
  // The submission key makes a rerun safe: a commit whose answer was lost stops the rerun at the unique key.
  return retryTransaction({ unit: "visit save" }, () => db().transaction(async (tx) => {
    await lockPoolsForKeeping(tx, [poolId]);
    const [test] = await tx
      .insert(waterTests)
      .values({
        companyId: scope.companyId,
        poolId,
        sampledAt: now,
        technicianId: scope.userId,
        freeChlorine: r.freeChlorine ?? null,
        combinedChlorine: r.combinedChlorine ?? null,
        ph: r.ph ?? null,
        totalAlkalinity: r.totalAlkalinity ?? null,
        calciumHardness: r.calciumHardness ?? null,
        cyanuricAcid: r.cyanuricAcid ?? null,
        salt: r.salt ?? null,
        tds: r.tds ?? null,
        temperatureC: r.temperatureC ?? null,
        ...metalColumnValues(r),
        hardnessEndpoint: input.hardnessEndpoint,
        stain: input.stain,
        stainColour: input.stainColour,
        padTint: input.padTint,
        note: input.note,
        submissionKey: input.submissionKey,
      })
      .$returningId();
    const id = test!.id;
    if (lines.length > 0) {
      await tx.insert(treatments).values(
        lines.map((line) => ({
          companyId: scope.companyId,
          poolId,
          appliedAt: now,
          appliedBy: scope.userId,
          waterTestId: id,
          ...line,
        })),
      );
    }
    await keepPoolsInStep(tx, scope.companyId, [poolId]);
    return id;
  }));
}
