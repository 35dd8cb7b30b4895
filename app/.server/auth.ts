import { betterAuth } from "better-auth";
import { drizzleAdapter } from "better-auth/adapters/drizzle";
import { db } from "./db/client";
import { account, session, user, verification } from "./db/schema";
import { serverEnv } from "./env";
import { enqueuePasswordResetMail, RESET_LINK_MINUTES } from "./mail/password-reset";
import { processSingleton } from "./process-singleton";
import { firstPartyOrigins } from "./security/origins";


function createAuth() {
  const env = serverEnv();
  return betterAuth({
    appName: "Patina",
    baseURL: env.PATINA_URL,
    secret: env.BETTER_AUTH_SECRET,
    trustedOrigins: firstPartyOrigins(env.PATINA_URL),
    database: drizzleAdapter(db(), {
      provider: "mysql",
      schema: { user, session, account, verification },
    }),
    emailAndPassword: {
      enabled: true,
      minPasswordLength: 12,
      // Accounts are created by the company (seed, invitations), never by open sign-up.
      disableSignUp: true,
      resetPasswordTokenExpiresIn: RESET_LINK_MINUTES * 60,
      revokeSessionsOnPasswordReset: true,
      sendResetPassword: ({ user, token }) => enqueuePasswordResetMail(user, token),
    },
    session: {
      expiresIn: 60 * 60 * 24 * 14,
      updateAge: 60 * 60 * 24,
    },
    // Sign-in and reset requests are throttled by Patina itself (app/.server/security/throttle.ts),
    // per account and per socket address, in the database; the library's limiter keys on a
    // client-written header and is off. Its password endpoints are not exposed (routes/api/auth.ts).
    rateLimit: { enabled: false },
    advanced: { useSecureCookies: new URL(env.PATINA_URL).protocol === "https:" },
    telemetry: { enabled: false },
  });
}

export type Auth = ReturnType<typeof createAuth>;

export function auth(): Auth {
  return processSingleton("auth", createAuth);
}
