import { serverEnv } from "../env";
import { readContext, socketAddressContext } from "./request-context";

/**
 * The address a request came from. The socket's, unless PATINA_TRUSTED_PROXIES
 * says how many proxies in front of Patina append to X-Forwarded-For; then the
 * entry the outermost trusted proxy appended. Entries further left were
 * written by the client and are never read.
 */
export function clientAddress(
  request: Request,
  context: unknown,
  trustedProxies = serverEnv().PATINA_TRUSTED_PROXIES,
): string {
  const socket = readContext(context, socketAddressContext) ?? null;
  if (trustedProxies > 0) {
    const forwarded = (request.headers.get("X-Forwarded-For") ?? "")
      .split(",")
      .map((entry) => entry.trim())
      .filter(Boolean);
    if (forwarded.length >= trustedProxies)
      return forwarded[forwarded.length - trustedProxies]!;
  }
  return socket ?? "unknown";
}
