import { APIError } from "better-auth/api";
import { auth } from "../auth";
import { clientAddress } from "./client-address";
import {
  checkThrottle,
  clearAccount,
  recordAttempt,
  retryMessage,
} from "./throttle";

export type SignInOutcome =
  | { ok: true; cookies: string[] }
  | { ok: false; status: 401 }
  | { ok: false; status: 429; message: string; retryAfterSeconds: number };

/**
 * The one path that checks a password: refused while the account or the
 * client address is over its limit, a failure counted in both.
 */
export async function signInWithThrottle(
  request: Request,
  context: unknown,
  email: string,
  password: string,
): Promise<SignInOutcome> {
  const subjects = { account: email, address: clientAddress(request, context) };
  const verdict = await checkThrottle("sign-in", subjects);
  if (!verdict.allowed) {
    return {
      ok: false,
      status: 429,
      retryAfterSeconds: verdict.retryAfterSeconds,
      message: `Too many failed sign-ins for this account or from this network. ${retryMessage(verdict)}`,
    };
  }
  let response: Response | null = null;
  try {
    response = await auth().api.signInEmail({
      body: { email, password },
      headers: request.headers,
      asResponse: true,
    });
  } catch (error) {
    if (!(error instanceof APIError) || error.statusCode >= 500) throw error;
  }
  // A failure on our side (the database is gone) is not a wrong password: it becomes a 503 page.
  if (response && response.status >= 500) throw new Error(`sign-in failed on the server (${response.status})`);
  if (!response?.ok) {
    await recordAttempt("sign-in", subjects);
    return { ok: false, status: 401 };
  }
  await clearAccount("sign-in", email);
  return { ok: true, cookies: response.headers.getSetCookie() };
}
