import { int, mysqlTable, varchar } from "drizzle-orm/mysql-core";
import { instant } from "./columns";

/**
 * Sign-in and password-reset attempts, counted per bucket (an account or a
 * client address) in fixed windows. Kept in the database so every app
 * instance sees the same counts.
 */
export const authThrottle = mysqlTable("auth_throttle", {
  /** e.g. "sign-in:account:ana@example.com", "reset:address:203.0.113.9" */
  bucket: varchar("bucket", { length: 320 }).primaryKey(),
  attempts: int("attempts").notNull(),
  windowEndsAt: instant("window_ends_at").notNull(),
});
