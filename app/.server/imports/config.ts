import { resolve } from "node:path";

/** Columns a log may have; wider files are refused at upload. */
export const MAX_COLUMNS = 200;
/** Characters a column header may have. */
export const MAX_HEADER_LENGTH = 200;

function positive(text: string | undefined, fallback: number): number {
  const value = Number(text ?? fallback);
  return Number.isFinite(value) && value > 0 ? value : fallback;
}

/**
 * Where uploaded files are kept, how large one may be, and how long a commit
 * may go without a heartbeat before it counts as stopped. All can be set in
 * the environment.
 */
export function importConfig() {
  const claimStaleSeconds = positive(process.env.PATINA_IMPORT_CLAIM_STALE_SECONDS, 30);
  return {
    uploadDir: resolve(process.env.PATINA_UPLOAD_DIR ?? ".data/uploads"),
    maxBytes: Math.round(positive(process.env.PATINA_UPLOAD_MAX_MB, 50) * 1024 * 1024),
    claimStaleSeconds,
    /** Three heartbeats fit in the stale time, so one slow write does not lose the claim. */
    heartbeatMs: Math.max(200, Math.floor((claimStaleSeconds * 1000) / 3)),
  };
}
