/** Columns a log may have; wider files are refused at upload. */
export const MAX_COLUMNS = 200;
/** Characters a column header may have. */
export const MAX_HEADER_LENGTH = 200;

function positive(text: string | undefined, fallback: number): number {
  const value = Number(text ?? fallback);
  return Number.isFinite(value) && value > 0 ? value : fallback;
}

/**
 * How large an uploaded file may be, and how long a commit may go without a
 * heartbeat before it counts as stopped. Both can be set in the environment;
 * where files are kept is the object store's setting (`PATINA_S3_*`).
 */
export function importConfig() {
  const claimStaleSeconds = positive(process.env.PATINA_IMPORT_CLAIM_STALE_SECONDS, 30);
  return {
    maxBytes: Math.round(positive(process.env.PATINA_UPLOAD_MAX_MB, 50) * 1024 * 1024),
    claimStaleSeconds,
    /** Three heartbeats fit in the stale time, so one slow write does not lose the claim. */
    heartbeatMs: Math.max(200, Math.floor((claimStaleSeconds * 1000) / 3)),
  };
}
