import { auth } from "../auth";
import { clientAddress } from "../security/client-address";
import { checkThrottle, recordAttempt } from "../security/throttle";

export type ResetRequestOutcome = { status: "accepted" } | { status: "rate_limited"; retryAfterSeconds: number };

/**
 * Asks better-auth for a reset link, within Patina's own limits per account
 * and per client address (every request counts: each may send a mail). The
 * answer never says whether the address has an account.
 */
export async function requestPasswordReset(request: Request, context: unknown, email: string): Promise<ResetRequestOutcome> {
  const subjects = { account: email, address: clientAddress(request, context) };
  const verdict = await checkThrottle("reset", subjects);
  if (!verdict.allowed) return { status: "rate_limited", retryAfterSeconds: verdict.retryAfterSeconds };
  await recordAttempt("reset", subjects);
  await auth().api.requestPasswordReset({ body: { email } });
  return { status: "accepted" };
}
