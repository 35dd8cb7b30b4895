import { z } from "zod";
import { localDatabaseUrl } from "./db/local-url";

const envSchema = z.object({
  DATABASE_URL: z.string().url().default(localDatabaseUrl("patina")),
  PATINA_URL: z.string().url().default("http://localhost:3000"),
  // Local development only; production sets its own secret.
  BETTER_AUTH_SECRET: z.string().min(32).default("patina-local-development-secret-change-me-0001"),
  NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
  // Outgoing mail: one SMTP URL (smtp:// or smtps://, credentials in the URL). Locally the sink on 2525.
  PATINA_SMTP_URL: z.string().url().default("smtp://127.0.0.1:2525"),
  // How many reverse proxies in front of Patina append to X-Forwarded-For. 0: the header is ignored
  // and the client address is the socket's (a client can write any X-Forwarded-For it likes).
  PATINA_TRUSTED_PROXIES: z.coerce.number().int().min(0).max(10).default(0),
  PATINA_MAIL_FROM: z.string().min(3).default("Patina <mail@patina.example>"),
  // Overload limits (README, "Operations"): each analytics statement's time limit, heavy analytics
  // requests run at once per instance, how many may wait, how long one may wait, and the Retry-After of a 503.
  PATINA_ANALYTICS_STATEMENT_MS: z.coerce.number().int().min(100).max(600_000).default(20_000),
  PATINA_ANALYTICS_CONCURRENCY: z.coerce.number().int().min(1).max(64).default(4),
  PATINA_ANALYTICS_QUEUE: z.coerce.number().int().min(0).max(1_000).default(48),
  PATINA_ANALYTICS_QUEUE_WAIT_MS: z.coerce.number().int().min(0).max(600_000).default(30_000),
  // "off" answers every analytics request from the tests (the kept results are still kept); for comparison and emergencies.
  PATINA_KEPT_ANALYTICS: z.enum(["on", "off"]).default("on"),
  PATINA_RETRY_AFTER_SECONDS: z.coerce.number().int().min(1).max(3_600).default(5),
  // Uploaded files live in an S3-compatible bucket (README, "Operations"), so every instance reads every
  // upload. Locally the fake object store (`.dev/object-store.sh`) on PATINA_S3_PORT (9000) with its own keys.
  PATINA_S3_URL: z
    .string()
    .url()
    .default(`http://127.0.0.1:${process.env.PATINA_S3_PORT ?? "9000"}`),
  PATINA_S3_BUCKET: z
    .string()
    .regex(/^[a-z0-9][a-z0-9.-]{1,61}[a-z0-9]$/, "a bucket name: 3 to 63 lower-case letters, digits, dots and hyphens")
    .default("patina-uploads"),
  PATINA_S3_REGION: z.string().min(1).default("us-east-1"),
  PATINA_S3_ACCESS_KEY_ID: z.string().min(1).default("S3RVER"),
  PATINA_S3_SECRET_ACCESS_KEY: z.string().min(1).default("S3RVER"),
  // Background jobs (digest, alert checks): how long an instance's claim on one lasts without renewal;
  // when the instance dies, another takes the job over after this.
  PATINA_JOB_LEASE_SECONDS: z.coerce.number().int().min(1).max(3_600).default(120),
  // Path-style addresses (http://host/bucket/key) suit local and self-hosted stores; "false" for virtual-hosted.
  PATINA_S3_FORCE_PATH_STYLE: z
    .enum(["true", "false"])
    .default("true")
    .transform((value) => value === "true"),
});

export type ServerEnv = z.infer<typeof envSchema>;

let cached: ServerEnv | undefined;

export function serverEnv(): ServerEnv {
  if (!cached) {
    const parsed = envSchema.safeParse(process.env);
    if (!parsed.success) {
      const problems = parsed.error.issues.map((i) => `${i.path.join(".")}: ${i.message}`).join("; ");
      throw new Error(`Patina's environment is not valid: ${problems}`);
    }
    cached = parsed.data;
  }
  return cached;
}
