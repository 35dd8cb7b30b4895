import { randomBytes } from "node:crypto";
import type { MiddlewareFunction } from "react-router";
import { serverEnv } from "../env";
import { cspNonceContext } from "./request-context";

export function newNonce(): string {
  return randomBytes(18).toString("base64");
}

/**
 * The policy every response carries. Scripts come from Patina itself, plus the
 * framework's inline hydration scripts, which carry this response's nonce.
 * Styles allow inline because React style attributes and the charts' SVG
 * style elements are inline; no script can come in that way.
 */
export function contentSecurityPolicy(nonce: string): string {
  return [
    "default-src 'self'",
    `script-src 'self' 'nonce-${nonce}'`,
    "style-src 'self' 'unsafe-inline'",
    "img-src 'self' data: blob:",
    "font-src 'self' data:",
    "connect-src 'self'",
    "object-src 'none'",
    "base-uri 'self'",
    "form-action 'self'",
    "frame-ancestors 'none'",
  ].join("; ");
}

export function securityHeaders(options: {
  nonce: string;
  https: boolean;
  development: boolean;
}): Record<string, string> {
  const headers: Record<string, string> = {
    "X-Content-Type-Options": "nosniff",
    "X-Frame-Options": "DENY",
    "Referrer-Policy": "strict-origin-when-cross-origin",
    "Cross-Origin-Opener-Policy": "same-origin",
    "Permissions-Policy":
      "camera=(), microphone=(), geolocation=(), payment=()",
  };
  // Vite's dev server injects inline scripts without a nonce; the built server always has the policy.
  if (!options.development)
    headers["Content-Security-Policy"] = contentSecurityPolicy(options.nonce);
  if (options.https)
    headers["Strict-Transport-Security"] =
      "max-age=31536000; includeSubDomains";
  return headers;
}

/** Headers for this response, given its nonce, from the server's settings. */
export function headersFor(nonce: string): Record<string, string> {
  return securityHeaders({
    nonce,
    https: servesHttps(),
    development: serverEnv().NODE_ENV === "development",
  });
}

export function servesHttps(): boolean {
  return new URL(serverEnv().PATINA_URL).protocol === "https:";
}

function withHeaders(
  response: Response,
  headers: Record<string, string>,
): Response {
  try {
    for (const [name, value] of Object.entries(headers))
      response.headers.set(name, value);
    return response;
  } catch {
    // A response with immutable headers (one passed through from fetch) is copied.
    const copy = new Response(response.body, response);
    for (const [name, value] of Object.entries(headers))
      copy.headers.set(name, value);
    return copy;
  }
}

/** Sets the nonce for the server entry and the headers on every response, pages, data and API. */
export const securityHeadersMiddleware: MiddlewareFunction<Response> = async (
  { context },
  next,
) => {
  const nonce = newNonce();
  context.set(cspNonceContext, nonce);
  const headers = headersFor(nonce);
  let response: Response;
  try {
    response = await next();
  } catch (thrown) {
    if (thrown instanceof Response) throw withHeaders(thrown, headers);
    throw thrown;
  }
  return withHeaders(response, headers);
};
