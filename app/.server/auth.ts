import { betterAuth } from "better-auth";
import { drizzleAdapter } from "better-auth/adapters/drizzle";
import { db } from "./db/client";
import { account, session, user, verification } from "./db/schema";
import { serverEnv } from "./env";
import { enqueuePasswordResetMail, RESET_LINK_MINUTES } from "./mail/password-reset";
import { processSingleton } from "./process-singleton";

function trustedOrigins(baseUrl: string): string[] {
  const url = new URL(baseUrl);
  // The same server answers on localhost and 127.0.0.1; both are first-party.
  const port = url.port ? `:${url.port}` : "";
  return [...new Set([url.origin, `${url.protocol}//localhost${port}`, `${url.protocol}//127.0.0.1${port}`])];
}

function createAuth() {
  const env = serverEnv();
  return betterAuth({
    appName: "Patina",
    baseURL: env.PATINA_URL,
    secret: env.BETTER_AUTH_SECRET,
    trustedOrigins: trustedOrigins(env.PATINA_URL),
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
    rateLimit: {
      enabled: true,
      window: 60,
      max: 120,
      customRules: {
        "/sign-in/email": { window: 60, max: 30 },
        "/request-password-reset": { window: 15 * 60, max: 5 },
      },
    },
    telemetry: { enabled: false },
  });
}

export type Auth = ReturnType<typeof createAuth>;

export function auth(): Auth {
  return processSingleton("auth", createAuth);
}
