import { data, type MiddlewareFunction } from "react-router";
import { isDatabaseUnavailable, isStatementTimeout } from "./db/faults";
import { serverEnv } from "./env";
import { apiError } from "./guard";
import { requestContext, runWithRequestContext, type RequestContext } from "./request-context";

/** The three ways Patina is briefly unable to answer; each is a 503 with Retry-After. */
export type Unavailability = "database" | "busy" | "timeout";

const MESSAGES: Record<Unavailability, string> = {
  database: "Patina cannot reach its database just now. Nothing was changed; try again in a few seconds.",
  busy: "Patina is busy with other analyses just now; try again in a few seconds.",
  timeout: "This analysis took longer than the time it is allowed and was stopped; try again in a little while.",
};

const CODES = { database: "unavailable", busy: "busy", timeout: "timeout" } as const;

function retryAfter(): string {
  return String(serverEnv().PATINA_RETRY_AFTER_SECONDS);
}

export function isApiRequest(request: Request): boolean {
  return new URL(request.url).pathname.startsWith("/api/");
}

/** The API's 503: `{ error: { code, message } }` with Retry-After. */
export function unavailableApiResponse(kind: Unavailability): Response {
  const response = apiError(503, CODES[kind], MESSAGES[kind]);
  response.headers.set("Retry-After", retryAfter());
  return response;
}

/** For pages: thrown, it is shown by the error panel as "Error 503" with the message. */
export function unavailablePageError(kind: Unavailability) {
  return data(MESSAGES[kind], { status: 503, headers: { "Retry-After": retryAfter() } });
}

/** Thrown from a loader or action: the answer that fits the request (JSON or page). */
export function unavailable(request: Request, kind: Unavailability) {
  return isApiRequest(request) ? unavailableApiResponse(kind) : unavailablePageError(kind);
}

/** What the request met, from its context (the database client notes failures there). */
export function unavailabilityOf(context: RequestContext | undefined, error?: unknown): Unavailability | null {
  if (context?.databaseFailure || (error !== undefined && isDatabaseUnavailable(error))) return "database";
  if (context?.statementTimeout || (error !== undefined && isStatementTimeout(error))) return "timeout";
  return null;
}

/** Called by the server entry's handleError: remember what broke this request. */
export function noteRequestError(error: unknown) {
  const context = requestContext();
  if (!context) return;
  if (isDatabaseUnavailable(error)) context.databaseFailure ??= error;
  else if (isStatementTimeout(error)) context.statementTimeout ??= error;
}

/**
 * The outermost middleware: gives the request its context (abort signal,
 * analytics slot, faults met), releases the request's analytics slot however
 * it ended, and puts Retry-After on a 503 page (a page rendered from a thrown
 * `data()` keeps its status but not its headers).
 */
const withRequestContext: MiddlewareFunction<Response> = ({ request }, next) =>
  runWithRequestContext(request.signal, async () => {
    const context = requestContext()!;
    try {
      const response = await next();
      if (response.status !== 503 || response.headers.has("Retry-After")) return response;
      const headers = new Headers(response.headers);
      headers.set("Retry-After", retryAfter());
      return new Response(response.body, { status: response.status, statusText: response.statusText, headers });
    } finally {
      for (const finish of context.finishers.splice(0)) finish();
    }
  });

/**
 * Turns a 500 caused by a missing database or a stopped statement into a 503:
 * the API's JSON error shape for /api/, the error panel for pages.
 */
const faultsAsUnavailable: MiddlewareFunction<Response> = async ({ request }, next) => {
  const context = requestContext();
  let response: Response;
  try {
    response = await next();
  } catch (error) {
    const kind = error instanceof Response ? null : unavailabilityOf(context, error);
    if (!kind) throw error;
    if (isApiRequest(request)) return unavailableApiResponse(kind);
    throw unavailablePageError(kind);
  }
  if (response.status !== 500) return response;
  const kind = unavailabilityOf(context);
  if (!kind) return response;
  if (isApiRequest(request)) return unavailableApiResponse(kind);
  throw unavailablePageError(kind);
};

/** For the root route, in this order. */
export const faultMiddleware = [withRequestContext, faultsAsUnavailable];
