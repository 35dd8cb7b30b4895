import { AsyncLocalStorage } from "node:async_hooks";

/**
 * What the server knows about the request being answered, reachable from the
 * database client without threading it through every query: the request's
 * abort signal (the client went away), whether it holds a heavy-analytics
 * slot (its reads get the statement limit), and the database failure it met.
 */
export type RequestContext = {
  signal: AbortSignal;
  /** Set while the request holds a slot of the analytics gate. */
  heavy: boolean;
  /** The first database error of this request that means "the database is not there". */
  databaseFailure?: unknown;
  /** The first statement of this request stopped by the statement limit. */
  statementTimeout?: unknown;
  /** Run when the response has been produced (gate slots). */
  finishers: Array<() => void>;
};

const storage = new AsyncLocalStorage<RequestContext>();

export function runWithRequestContext<T>(signal: AbortSignal, work: () => Promise<T>): Promise<T> {
  return storage.run({ signal, heavy: false, finishers: [] }, work);
}

export function requestContext(): RequestContext | undefined {
  return storage.getStore();
}

/** Thrown when the client of the request has gone away, so the work can stop. */
export class RequestAbandoned extends Error {
  constructor() {
    super("The client closed the request; its work was stopped.");
    this.name = "RequestAbandoned";
  }
}

/** Between queries and analysis steps: stop if nobody waits for the answer any more. */
export function stopIfAbandoned(signal: AbortSignal | undefined = requestContext()?.signal) {
  if (signal?.aborted) throw new RequestAbandoned();
}
