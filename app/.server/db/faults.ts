/**
 * Which database errors mean "the database is not there" (stopped, restarting,
 * unreachable, too many connections) rather than a fault of this request.
 */
const UNAVAILABLE_CODES = new Set([
  "ECONNREFUSED",
  "ECONNRESET",
  "ETIMEDOUT",
  "EPIPE",
  "EHOSTUNREACH",
  "ENETUNREACH",
  "ENOTFOUND",
  "EAI_AGAIN",
  "PROTOCOL_CONNECTION_LOST",
  "PROTOCOL_SEQUENCE_TIMEOUT",
  "ER_SERVER_SHUTDOWN",
  "ER_CON_COUNT_ERROR",
  "ER_CONNECTION_KILLED",
  "CR_CONN_HOST_ERROR",
  "CR_SERVER_GONE_ERROR",
  "CR_SERVER_LOST",
]);
// 1040 too many connections, 1053 shutdown in progress, 1927 connection killed,
// 2002/2003 cannot connect, 2006 gone away, 2013 lost during query.
const UNAVAILABLE_ERRNOS = new Set([1040, 1053, 1927, 2002, 2003, 2006, 2013]);
const UNAVAILABLE_MESSAGES = /Pool is closed|Connection lost|connection is in closed state|connect ECONNREFUSED|Too many connections/i;

/** MariaDB's "max_statement_time exceeded" (ER_STATEMENT_TIMEOUT). */
const STATEMENT_TIMEOUT_ERRNO = 1969;

type ErrorLike = { code?: unknown; errno?: unknown; message?: unknown; cause?: unknown; errors?: unknown };

/** The error and what it wraps (drizzle and better-auth wrap the driver's error as `cause`). */
function* chain(error: unknown): Generator<ErrorLike> {
  let current: unknown = error;
  for (let depth = 0; depth < 6 && current && typeof current === "object"; depth++) {
    const e = current as ErrorLike;
    yield e;
    if (Array.isArray(e.errors)) for (const inner of e.errors) if (inner && typeof inner === "object") yield inner as ErrorLike;
    current = e.cause;
  }
}

export function isDatabaseUnavailable(error: unknown): boolean {
  for (const e of chain(error)) {
    if (typeof e.code === "string" && UNAVAILABLE_CODES.has(e.code)) return true;
    if (typeof e.errno === "number" && UNAVAILABLE_ERRNOS.has(e.errno)) return true;
    if (typeof e.message === "string" && UNAVAILABLE_MESSAGES.test(e.message)) return true;
  }
  return false;
}

export function isStatementTimeout(error: unknown): boolean {
  for (const e of chain(error)) {
    if (e.errno === STATEMENT_TIMEOUT_ERRNO || e.code === "ER_STATEMENT_TIMEOUT") return true;
  }
  return false;
}
