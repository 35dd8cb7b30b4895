import { index, int, json, mysqlEnum, mysqlTable, text, varchar } from "drizzle-orm/mysql-core";
import { bigSerialId, createdAt, instant } from "./columns";
import { companies } from "./company";

export const JOB_STATUSES = ["pending", "done", "failed"] as const;

/**
 * Background work that several server instances could each start (the weekly
 * digest, the alert check after saved tests): one row per job, claimed by one
 * instance at a time for a lease it renews while it works. A claim whose
 * lease ran out (its instance died) is taken over by the next instance that looks.
 */
export const backgroundJobs = mysqlTable(
  "background_jobs",
  {
    id: bigSerialId(),
    /** The job and its period, e.g. "digest:12:2026-W26": a second instance asking for the same job finds this row. */
    jobKey: varchar("job_key", { length: 191 }).notNull().unique(),
    kind: varchar("kind", { length: 40 }).notNull(),
    companyId: int("company_id").references(() => companies.id, { onDelete: "cascade" }),
    /** What a taking-over instance needs to do the same work (pools, the moment it was asked for). */
    payload: json("payload").$type<Record<string, unknown>>().notNull().default({}),
    status: mysqlEnum("status", JOB_STATUSES).notNull().default("pending"),
    attempts: int("attempts").notNull().default(0),
    /** The current claim: a token per attempt, the instance holding it, and when its lease ends (database time). */
    claimToken: varchar("claim_token", { length: 36 }),
    claimedBy: varchar("claimed_by", { length: 255 }),
    claimExpiresAt: instant("claim_expires_at"),
    lastError: text("last_error"),
    createdAt: createdAt(),
    finishedAt: instant("finished_at"),
  },
  (t) => [index("background_jobs_due_idx").on(t.status, t.claimExpiresAt), index("background_jobs_finished_idx").on(t.finishedAt)],
);
