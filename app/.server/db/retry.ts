import { setTimeout as sleep } from "node:timers/promises";
import { requestContext } from "../request-context";
import { isDatabaseUnavailable } from "./faults";

/**
 * MariaDB errors after which a transaction may run again from its start:
 * 1213 deadlock (on Galera also a certification conflict with another node's
 * write), 1205 lock wait timeout, 1047 the node is not ready for clients (it
 * left the primary component or is still joining), 1180 commit refused (Galera
 * aborted it while committing).
 */
const RETRYABLE_ERRNOS = new Set([1213, 1205, 1047, 1180]);
const RETRYABLE_CODES = new Set(["ER_LOCK_DEADLOCK", "ER_LOCK_WAIT_TIMEOUT", "ER_UNKNOWN_COM_ERROR", "ER_ERROR_DURING_COMMIT"]);

type ErrorLike = { code?: unknown; errno?: unknown; cause?: unknown };

/** True for a failure that leaves nothing of the transaction behind: a lost writer, a deadlock, a certification conflict. */
export function isRetryableTransactionError(error: unknown): boolean {
  if (isDatabaseUnavailable(error)) return true;
  let current: unknown = error;
  for (let depth = 0; depth < 6 && current && typeof current === "object"; depth++) {
    const e = current as ErrorLike;
    if (typeof e.errno === "number" && RETRYABLE_ERRNOS.has(e.errno)) return true;
    if (typeof e.code === "string" && RETRYABLE_CODES.has(e.code)) return true;
    current = e.cause;
  }
  return false;
}

export type RetryOptions = {
  /** Named in the log line of each retry. */
  unit: string;
  /** Most attempts in all (default 8). */
  attempts?: number;
  /** No new attempt starts after this long since the first (default 20 s: a writer failover takes a few seconds). */
  budgetMs?: number;
  /** First pause (default 50 ms); it doubles each time, up to maxDelayMs (default 2 s), with random jitter. */
  baseDelayMs?: number;
  maxDelayMs?: number;
};

/**
 * Runs one idempotent unit of work (a whole transaction) and, when it fails in
 * a way that left nothing behind, runs it again from the start with growing
 * pauses. Only units that recognise their own earlier success may be passed
 * here (a visit's submission key, an upload's commit claim): a commit whose
 * answer was lost with the connection may still have been stored.
 */
export async function retryTransaction<T>(options: RetryOptions, run: (attempt: number) => Promise<T>): Promise<T> {
  const { unit, attempts = 8, budgetMs = 20_000, baseDelayMs = 50, maxDelayMs = 2_000 } = options;
  const started = Date.now();
  const context = requestContext();
  const failureBefore = context?.databaseFailure;
  for (let attempt = 1; ; attempt++) {
    try {
      const result = await run(attempt);
      // A lost connection noted on an earlier attempt no longer speaks for this request.
      if (attempt > 1 && context) context.databaseFailure = failureBefore;
      return result;
    } catch (error) {
      const delay = Math.min(maxDelayMs, baseDelayMs * 2 ** (attempt - 1)) * (0.5 + Math.random() / 2);
      const outOfTime = Date.now() + delay - started > budgetMs;
      if (!isRetryableTransactionError(error) || attempt >= attempts || outOfTime || context?.signal.aborted) throw error;
      console.warn(`[db] ${unit}: attempt ${attempt} failed (${describe(error)}); running it again in ${Math.round(delay)} ms`);
      await sleep(delay);
    }
  }
}

function describe(error: unknown): string {
  for (let e: unknown = error; e && typeof e === "object"; e = (e as ErrorLike).cause) {
    const { code, errno } = e as ErrorLike;
    if (typeof code === "string") return typeof errno === "number" ? `${code} ${errno}` : code;
  }
  return error instanceof Error ? error.message : String(error);
}
