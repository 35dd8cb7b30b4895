import { randomUUID } from "node:crypto";
import { hostname } from "node:os";
import type { ResultSetHeader, RowDataPacket } from "mysql2/promise";
import { pool as connectionPool } from "../db/client";
import { importConfig } from "./config";

/** What a commit that died shows: its transaction was rolled back with its connection. */
export const STOPPED_MESSAGE =
  "Stopped, nothing stored: the import was interrupted (the server or the database stopped) before it finished. Commit again to import the whole file.";

/** A held commit claim: its token fences the final write, its timer keeps it alive. */
export type Claim = { id: string; uploadId: string; stop: () => void };

const holder = globalThis as typeof globalThis & { __patinaClaims?: Set<string> };
/** Claims taken by this process; any other claim naming this host and pid is from an earlier life. */
const mine = (holder.__patinaClaims ??= new Set<string>());

const CLEARED = "claim_id = NULL, claim_host = NULL, claim_pid = NULL, claim_heartbeat_at = NULL";
const STALE = "COALESCE(claim_heartbeat_at, updated_at) < NOW(3) - INTERVAL ? SECOND";

/**
 * Takes the upload for one commit. Refused while another live commit holds
 * it; a claim without a heartbeat for the configured time may be taken over.
 */
export async function claimForCommit(uploadId: string): Promise<Claim | null> {
  const { claimStaleSeconds, heartbeatMs } = importConfig();
  const id = randomUUID();
  const [result] = await connectionPool().query<ResultSetHeader>(
    `UPDATE import_uploads
        SET phase = 'committing', rows_done = 0, error = NULL, claim_id = ?, claim_host = ?, claim_pid = ?,
            claim_heartbeat_at = NOW(3), updated_at = NOW(3)
      WHERE id = ? AND (phase NOT IN ('committing', 'committed', 'discarded') OR (phase = 'committing' AND ${STALE}))`,
    [id, hostname(), process.pid, uploadId, claimStaleSeconds],
  );
  if (result.affectedRows !== 1) return null;
  mine.add(id);
  const timer = setInterval(() => {
    connectionPool()
      .query("UPDATE import_uploads SET claim_heartbeat_at = NOW(3) WHERE id = ? AND claim_id = ?", [uploadId, id])
      .catch(() => undefined);
  }, heartbeatMs);
  timer.unref();
  return {
    id,
    uploadId,
    stop: () => {
      clearInterval(timer);
      mine.delete(id);
    },
  };
}

/** SQL (and its values) that marks the claim's upload done, only while this claim still holds it. */
export function finishClaimSql(claim: Claim) {
  return { set: CLEARED, where: "id = ? AND claim_id = ?", values: [claim.uploadId, claim.id] };
}

/** Gives the upload back with a phase and message, unless another commit has taken it over since. */
export async function endClaim(
  claim: Claim,
  values: { phase: "checked" | "failed"; error: string | null },
): Promise<void> {
  claim.stop();
  await connectionPool().query(
    `UPDATE import_uploads SET phase = ?, error = ?, rows_done = 0, ${CLEARED}, updated_at = NOW(3) WHERE id = ? AND claim_id = ?`,
    [values.phase, values.error, claim.uploadId, claim.id],
  );
}

function processIsGone(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return false;
  } catch (error) {
    return (error as NodeJS.ErrnoException).code === "ESRCH";
  }
}

/** A claim this process can prove dead without waiting: same host, and its process is gone or was an earlier life of this pid. */
function provablyDead(claim: { id: string | null; host: string | null; pid: number | null }): boolean {
  if (claim.host !== hostname() || claim.pid === null) return false;
  if (claim.pid === process.pid) return !claim.id || !mine.has(claim.id);
  return processIsGone(claim.pid);
}

/**
 * Marks "stopped, nothing stored" every commit claim that is dead: no
 * heartbeat for the configured time, or provably dead on this host. Run at
 * start and whenever an upload in the committing phase is read. Returns how
 * many were released.
 */
export async function releaseDeadClaims(where: { companyId?: number; uploadId?: string } = {}): Promise<number> {
  const { claimStaleSeconds } = importConfig();
  const filters = ["phase = 'committing'"];
  const values: unknown[] = [claimStaleSeconds];
  if (where.companyId !== undefined) {
    filters.push("company_id = ?");
    values.push(where.companyId);
  }
  if (where.uploadId !== undefined) {
    filters.push("id = ?");
    values.push(where.uploadId);
  }
  const [claims] = await connectionPool().query<RowDataPacket[]>(
    `SELECT id AS uploadId, claim_id AS id, claim_host AS host, claim_pid AS pid, ${STALE} AS stale
       FROM import_uploads WHERE ${filters.join(" AND ")}`,
    values,
  );
  let released = 0;
  for (const claim of claims) {
    if (!Number(claim.stale) && !provablyDead(claim as { id: string | null; host: string | null; pid: number | null })) continue;
    // The claim token must still be the one judged dead: a fresh takeover is left alone.
    const [result] = await connectionPool().query<ResultSetHeader>(
      `UPDATE import_uploads SET phase = 'failed', rows_done = 0, error = ?, ${CLEARED}, updated_at = NOW(3)
        WHERE id = ? AND phase = 'committing' AND claim_id <=> ?`,
      [STOPPED_MESSAGE, claim.uploadId, claim.id],
    );
    released += result.affectedRows;
  }
  return released;
}
