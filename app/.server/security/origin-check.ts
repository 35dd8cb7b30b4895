import type { MiddlewareFunction } from "react-router";
import { serverEnv } from "../env";
import { firstPartyOrigins } from "./origins";
import { refuse } from "./refusal";

const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

export type OriginVerdict =
  { allowed: true } | { allowed: false; reason: string };

/**
 * Whether a state-changing request comes from Patina's own pages. Browsers send
 * `Origin` on every POST (and `Sec-Fetch-Site` on every request); a request
 * with neither comes from a non-browser client, which carries no victim's
 * cookie by accident, so it passes.
 */
export function judgeOrigin(
  request: Request,
  allowedOrigins: readonly string[],
): OriginVerdict {
  if (SAFE_METHODS.has(request.method.toUpperCase())) return { allowed: true };
  const origin = request.headers.get("Origin");
  if (origin !== null) {
    return allowedOrigins.includes(origin)
      ? { allowed: true }
      : {
          allowed: false,
          reason: `Requests from ${origin === "null" ? "an opaque origin" : origin} are not accepted.`,
        };
  }
  const fetchSite = request.headers.get("Sec-Fetch-Site");
  if (fetchSite !== null && fetchSite !== "same-origin") {
    return {
      allowed: false,
      reason: `A ${fetchSite} request is not accepted.`,
    };
  }
  return { allowed: true };
}

/** Every non-GET request passes here, page actions, resource routes and the JSON API alike. */
export const originCheck: MiddlewareFunction<Response> = async (
  { request },
  next,
) => {
  const env = serverEnv();
  const allowed = firstPartyOrigins(env.PATINA_URL);
  // The dev server answers on its own port, whatever PATINA_URL says.
  if (env.NODE_ENV === "development") allowed.push(new URL(request.url).origin);
  const verdict = judgeOrigin(request, allowed);
  if (!verdict.allowed) {
    return refuse(
      request,
      403,
      "cross_site_request",
      `${verdict.reason} Patina accepts changes only from its own pages.`,
    );
  }
  return next();
};
