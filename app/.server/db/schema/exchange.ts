import { bigint, index, int, json, mysqlEnum, mysqlTable, text, unique, varchar } from "drizzle-orm/mysql-core";
import { optionalUser } from "./auth";
import { bigSerialId, createdAt, flag, instant, instantNow, updatedAt } from "./columns";
import { companies, companyRow, memberships, owningCompany, ROLES } from "./company";
import { fillSources, pools } from "./routebook";

/** A company's saved CSV column mapping, reused for files of the same shape. */
export const importMappings = mysqlTable(
  "import_mappings",
  {
    ...companyRow(),
    name: varchar("name", { length: 120 }).notNull(),
    /** Column header -> Patina field (and unit), as the import pipeline defines it. */
    mapping: json("mapping").$type<Record<string, unknown>>().notNull(),
    createdBy: optionalUser("created_by"),
    createdAt: createdAt(),
  },
  (t) => [unique("import_mappings_company_name").on(t.companyId, t.name)],
);

export const UPLOAD_PHASES = ["uploaded", "checking", "checked", "committing", "committed", "failed", "discarded"] as const;

/** An uploaded file on its way to an import batch: kept until committed or discarded. */
export const importUploads = mysqlTable(
  "import_uploads",
  {
    id: varchar("id", { length: 36 }).primaryKey(),
    companyId: owningCompany(),
    userId: optionalUser("user_id"),
    fileName: varchar("file_name", { length: 255 }).notNull(),
    byteSize: bigint("byte_size", { mode: "number" }).notNull(),
    fileSha256: varchar("file_sha256", { length: 64 }).notNull(),
    /** The key of the file in the object store's bucket (PATINA_S3_BUCKET). */
    storedAs: varchar("stored_as", { length: 255 }).notNull(),
    encoding: varchar("encoding", { length: 20 }),
    delimiter: varchar("delimiter", { length: 4 }),
    phase: mysqlEnum("phase", UPLOAD_PHASES).notNull().default("uploaded"),
    rowsTotal: int("rows_total"),
    rowsDone: int("rows_done").notNull().default(0),
    /** Mapping, date order and choices made on the preview page. */
    options: json("options").$type<Record<string, unknown>>().notNull().default({}),
    /** Counts of the last check (to add, duplicates, refused, unknown pools). */
    summary: json("summary").$type<Record<string, unknown>>(),
    error: text("error"),
    importBatchId: int("import_batch_id"),
    /** The commit in progress: a token per attempt, the process holding it, and its last sign of life. */
    claimId: varchar("claim_id", { length: 36 }),
    claimHost: varchar("claim_host", { length: 255 }),
    claimPid: int("claim_pid"),
    claimHeartbeatAt: instant("claim_heartbeat_at"),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    index("import_uploads_company_idx").on(t.companyId, t.createdAt),
    index("import_uploads_phase_idx").on(t.phase),
  ],
);

export const invitations = mysqlTable(
  "invitations",
  {
    ...companyRow(),
    email: varchar("email", { length: 255 }).notNull(),
    role: mysqlEnum("role", ROLES).notNull(),
    /** SHA-256 of the token in the link; the token itself is never stored. */
    tokenHash: varchar("token_hash", { length: 64 }).notNull().unique(),
    invitedBy: optionalUser("invited_by"),
    expiresAt: instant("expires_at").notNull(),
    acceptedAt: instant("accepted_at"),
    acceptedBy: optionalUser("accepted_by"),
    createdAt: createdAt(),
  },
  (t) => [index("invitations_company_idx").on(t.companyId, t.createdAt)],
);

export const ALERT_KINDS = ["episode_opened", "pool_recurring", "shared_source"] as const;

/** Something worth telling people about, recorded once per event (dedupe key). */
export const alertEvents = mysqlTable(
  "alert_events",
  {
    id: bigSerialId(),
    companyId: owningCompany(),
    kind: mysqlEnum("kind", ALERT_KINDS).notNull(),
    dedupeKey: varchar("dedupe_key", { length: 191 }).notNull(),
    poolId: int("pool_id").references(() => pools.id, { onDelete: "cascade" }),
    fillSourceId: int("fill_source_id").references(() => fillSources.id, { onDelete: "cascade" }),
    metal: mysqlEnum("metal", ["copper", "iron", "manganese"]),
    occurredAt: instant("occurred_at").notNull(),
    details: json("details").$type<Record<string, unknown>>().notNull().default({}),
    createdAt: createdAt(),
  },
  (t) => [
    unique("alert_events_company_key").on(t.companyId, t.dedupeKey),
    index("alert_events_company_time_idx").on(t.companyId, t.occurredAt),
  ],
);

export const OUTBOX_STATUSES = ["pending", "sent", "failed"] as const;

/** Every e-mail goes through here first, so a failed send is retried, never lost. */
export const mailOutbox = mysqlTable(
  "mail_outbox",
  {
    id: bigSerialId(),
    companyId: int("company_id").references(() => companies.id, { onDelete: "cascade" }),
    /** One message per recipient and event. */
    dedupeKey: varchar("dedupe_key", { length: 191 }).notNull().unique(),
    kind: varchar("kind", { length: 40 }).notNull(),
    recipient: varchar("recipient", { length: 255 }).notNull(),
    subject: varchar("subject", { length: 255 }).notNull(),
    html: text("html").notNull(),
    text: text("text").notNull(),
    status: mysqlEnum("status", OUTBOX_STATUSES).notNull().default("pending"),
    attempts: int("attempts").notNull().default(0),
    nextAttemptAt: instantNow("next_attempt_at"),
    lastError: text("last_error"),
    sentAt: instant("sent_at"),
    createdAt: createdAt(),
  },
  (t) => [index("mail_outbox_due_idx").on(t.status, t.nextAttemptAt)],
);

/** Per-member mail preferences; the digest link unsubscribes with the token. */
export const mailPreferences = mysqlTable("mail_preferences", {
  membershipId: int("membership_id")
    .primaryKey()
    .references(() => memberships.id, { onDelete: "cascade" }),
  digest: flag("digest", true),
  alerts: flag("alerts", true),
  unsubscribeToken: varchar("unsubscribe_token", { length: 64 }).notNull().unique(),
  updatedAt: updatedAt(),
});
