import { hostname } from "node:os";
import { sql } from "drizzle-orm";
import { drizzle } from "drizzle-orm/mysql2";
import type { PoolConnection } from "mysql2/promise";
import { METALS, type MetalThresholds } from "@analysis/metals/reading";
import { isDuplicateKey } from "../../command-result";
import { db, pool, type Database } from "../../db/client";
import { retryTransaction } from "../../db/retry";
import * as schema from "../../db/schema";
import { companySettings } from "../../settings/queries/company-settings";
import { lockPoolsForKeeping, poolTests, replaceKeptRows, type LiveVersion } from "./keep-pools";

/** Pools worked out per transaction by a build: short enough not to hold up the writes to them. */
const BUILD_CHUNK = 250;
/** A build's claim lapses when it has not moved for this long; another instance then takes it over. */
const CLAIM_MS = 60_000;

const instanceName = `${hostname()}:${process.pid}:${Math.random().toString(36).slice(2, 8)}`;

export function sameLevels(a: MetalThresholds, b: MetalThresholds): boolean {
  return METALS.every((m) => a[m].elevated === b[m].elevated && a[m].clear === b[m].clear);
}

/** What a version's rows are worked out with: the levels, and the time zone whose months the monthly rows use. */
type Basis = { levels: MetalThresholds; timeZone: string };

const sameBasis = (a: Basis, b: Basis) => sameLevels(a.levels, b.levels) && a.timeZone === b.timeZone;

type VersionRow = { id: number; levels: MetalThresholds; timeZone: string; state: "building" | "ready" | "retired"; claimExpiresAt: Date | null };

async function versionsOf(database: Pick<Database, "select">, companyId: number): Promise<VersionRow[]> {
  return database
    .select({
      id: schema.keptVersions.id,
      levels: schema.keptVersions.levels,
      timeZone: schema.keptVersions.timeZone,
      state: schema.keptVersions.state,
      claimExpiresAt: schema.keptVersions.claimExpiresAt,
    })
    .from(schema.keptVersions)
    .where(sql`${schema.keptVersions.companyId} = ${companyId} AND ${schema.keptVersions.state} <> 'retired'`);
}

/**
 * The version kept answers come from for these levels, or null: then the
 * answer is worked out from the tests, and a build is started (or taken over
 * from an instance that stopped) so the next answers can be kept ones.
 */
export async function readyVersionFor(companyId: number, levels: MetalThresholds): Promise<number | null> {
  const versions = await versionsOf(db(), companyId);
  const ready = versions.find((v) => v.state === "ready" && sameLevels(v.levels, levels));
  if (ready) return ready.id;
  const building = versions.find((v) => v.state === "building" && sameLevels(v.levels, levels));
  const stalled = building && (building.claimExpiresAt === null || building.claimExpiresAt.getTime() < Date.now());
  const companyLevels = (await companySettings(companyId))?.thresholds;
  // Only the company's own levels are kept; a request's own levels are answered from the tests.
  if ((!building || stalled) && companyLevels && sameLevels(companyLevels, levels)) {
    void keepCompanyCurrent(companyId).catch((error: unknown) => console.error(`[kept] build for company ${companyId} failed`, error));
  }
  return null;
}

/**
 * Makes sure a version for the company's current levels exists and is built:
 * starts one (retiring a build for levels no longer set), or resumes a build
 * whose instance went quiet. Returns the version id once it is ready, or null
 * when another instance is building it.
 */
export async function keepCompanyCurrent(
  companyId: number,
  options: { rebuild?: boolean; onProgress?: (poolsDone: number) => void } = {},
): Promise<number | null> {
  const settings = await companySettings(companyId);
  if (!settings) return null;
  const basis = { levels: settings.thresholds, timeZone: settings.timeZone };
  const claimed = await claimBuild(companyId, basis, options.rebuild === true);
  if (!claimed) return null;
  if (!claimed.build) return claimed.id;
  return (await buildVersion(companyId, { id: claimed.id, ...basis }, options.onProgress)) ? claimed.id : null;
}

/**
 * Decides, without holding any lock for long, who builds: a ready version
 * for these levels needs no build; a stalled build for them is taken over;
 * otherwise a new build starts, and the unique building slot lets only one
 * instance start it. Returns null when another instance is building.
 */
async function claimBuild(companyId: number, basis: Basis, rebuild: boolean): Promise<{ id: number; build: boolean } | null> {
  const versions = await versionsOf(db(), companyId);
  const ready = versions.find((v) => v.state === "ready" && sameBasis(v, basis));
  if (ready && !rebuild) return { id: ready.id, build: false };
  const resumable = (v: VersionRow) => v.state === "building" && sameBasis(v, basis) && !rebuild;
  const building = versions.find(resumable);
  if (building) {
    const [result] = (await db().execute(
      sql`UPDATE kept_versions SET claimed_by = ${instanceName}, claim_expires_at = NOW(3) + INTERVAL ${CLAIM_MS / 1000} SECOND
        WHERE id = ${building.id} AND state = 'building' AND (claim_expires_at IS NULL OR claim_expires_at < NOW(3) OR claimed_by = ${instanceName})`,
    )) as unknown as [{ affectedRows: number }];
    return result.affectedRows === 1 ? { id: building.id, build: true } : null;
  }
  // A build for levels no longer set (or one being replaced by hand) stops: its next chunk finds its row gone.
  for (const v of versions) if (v.state === "building") await db().execute(sql`DELETE FROM kept_versions WHERE id = ${v.id} AND state = 'building'`);
  try {
    const [inserted] = (await db().execute(
      sql`INSERT INTO kept_versions (company_id, levels, time_zone, state, claimed_by, claim_expires_at, building_slot)
        VALUES (${companyId}, ${JSON.stringify(basis.levels)}, ${basis.timeZone}, 'building', ${instanceName}, NOW(3) + INTERVAL ${CLAIM_MS / 1000} SECOND, 1)`,
    )) as unknown as [{ insertId: number }];
    return { id: inserted.insertId, build: true };
  } catch (error) {
    if (isDuplicateKey(error)) return null;
    throw error;
  }
}

class ClaimLost extends Error {}

function hasCode(error: unknown, code: string): boolean {
  for (let e: unknown = error; e; e = (e as { cause?: unknown }).cause) {
    if ((e as { code?: string }).code === code) return true;
  }
  return false;
}

/**
 * Works out every pool of the company under a version's levels, a chunk of
 * pools per transaction (each chunk's pools locked, as a write locks them),
 * resuming after the last chunk done; then makes it the version answers come
 * from and drops the one it replaces. Writes made meanwhile keep the building
 * version in step themselves (see keepPoolsInStep).
 */
async function buildVersion(companyId: number, version: LiveVersion, onProgress?: (poolsDone: number) => void): Promise<boolean> {
  let done = 0;
  try {
    for (;;) {
      // A chunk that lost a deadlock to a write, or its connection to a failover, is simply done again.
      const built = await retryTransaction({ unit: "kept analytics build" }, () => buildChunk(companyId, version));
      if (built === "finished") return true;
      done += built;
      onProgress?.(done);
    }
  } catch (error) {
    // Replaced while it ran: its row went, and with it any row a chunk could still add.
    if (error instanceof ClaimLost || hasCode(error, "ER_NO_REFERENCED_ROW_2")) return false;
    throw error;
  }
}

/** One transaction of a build: the next pools after the last chunk done, or the switch-over once none are left. */
async function buildChunk(companyId: number, version: LiveVersion): Promise<number | "finished"> {
  const connection = await pool().getConnection();
  const writer = drizzle(connection as PoolConnection, { schema, mode: "default" });
  let broken = false;
  try {
    await connection.beginTransaction();
    // The version's row is written last in each chunk: a write locks its pools and then reads the
    // versions, so holding the row while waiting for pools could close a circle with it.
    const [[state]] = (await connection.query("SELECT built_through_pool_id AS through FROM kept_versions WHERE id = ?", [
      version.id,
    ])) as unknown as [[{ through: number } | undefined]];
    if (!state) throw new ClaimLost();
    const [chunk] = (await connection.query("SELECT id FROM pools WHERE company_id = ? AND id > ? ORDER BY id LIMIT ?", [
      companyId,
      state.through,
      BUILD_CHUNK,
    ])) as unknown as [Array<{ id: number }>];
    if (chunk.length === 0) {
      const [claim] = (await connection.query(
        "UPDATE kept_versions SET state = 'ready', ready_at = NOW(3), claimed_by = NULL, claim_expires_at = NULL, building_slot = NULL WHERE id = ? AND claimed_by = ?",
        [version.id, instanceName],
      )) as unknown as [{ affectedRows: number }];
      if (claim.affectedRows !== 1) throw new ClaimLost();
      await connection.query("UPDATE kept_versions SET state = 'retired' WHERE company_id = ? AND state = 'ready' AND id <> ?", [
        companyId,
        version.id,
      ]);
      await connection.commit();
      // The rows of replaced versions go with them (the foreign keys cascade).
      await connection.query("DELETE FROM kept_versions WHERE company_id = ? AND state = 'retired'", [companyId]);
      return "finished";
    }
    const ids = chunk.map((p) => p.id);
    await lockPoolsForKeeping(writer, ids);
    const tests = await poolTests(connection, companyId, ids);
    await replaceKeptRows(writer, companyId, version, ids, tests);
    const [claim] = (await connection.query(
      `UPDATE kept_versions SET built_through_pool_id = ?, claim_expires_at = NOW(3) + INTERVAL ${CLAIM_MS / 1000} SECOND WHERE id = ? AND claimed_by = ?`,
      [ids[ids.length - 1], version.id, instanceName],
    )) as unknown as [{ affectedRows: number }];
    if (claim.affectedRows !== 1) throw new ClaimLost();
    await connection.commit();
    return ids.length;
  } catch (error) {
    broken = true;
    await connection.rollback().catch(() => undefined);
    throw error;
  } finally {
    // A connection that failed half-way may be dead or mid-transaction: never hand it back.
    if (broken) connection.destroy();
    else connection.release();
  }
}
