import { auth } from "../auth";
import { serverEnv } from "../env";

export type ResetRequestOutcome = { status: "accepted" } | { status: "rate_limited"; retryAfterSeconds: number };

/** Headers that say who is asking; the rate limit counts per client address. */
const FORWARDED = ["x-forwarded-for", "x-real-ip", "cf-connecting-ip", "user-agent"];

/**
 * Asks better-auth for a reset link through its HTTP handler rather than its
 * server API, so its rate limit for "/request-password-reset" applies. The
 * answer never says whether the address has an account.
 */
export async function requestPasswordReset(request: Request, email: string): Promise<ResetRequestOutcome> {
  const origin = new URL(serverEnv().PATINA_URL).origin;
  const headers = new Headers({ "Content-Type": "application/json", Origin: origin });
  for (const name of FORWARDED) {
    const value = request.headers.get(name);
    if (value) headers.set(name, value);
  }
  const response = await auth().handler(
    new Request(`${origin}/api/auth/request-password-reset`, { method: "POST", headers, body: JSON.stringify({ email }) }),
  );
  if (response.status === 429) {
    return { status: "rate_limited", retryAfterSeconds: Number(response.headers.get("X-Retry-After") ?? 60) };
  }
  if (!response.ok) throw new Error(`password reset request failed with status ${response.status}: ${await response.text()}`);
  return { status: "accepted" };
}
