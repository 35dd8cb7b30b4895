import { index, mysqlTable, text, varchar } from "drizzle-orm/mysql-core";
import { createdAt, flag, instant, updatedAt } from "./columns";

// Tables owned by better-auth. Column names follow its defaults so the drizzle
// adapter maps them without configuration.

/** better-auth's ids: the keys of its own rows, and the user ids other tables keep. */
const authId = (name: string) => varchar(name, { length: 36 });

export const user = mysqlTable("user", {
  id: authId("id").primaryKey(),
  name: varchar("name", { length: 200 }).notNull(),
  email: varchar("email", { length: 255 }).notNull().unique(),
  emailVerified: flag("email_verified", false),
  image: text("image"),
  createdAt: createdAt(),
  updatedAt: updatedAt(),
});

/** A user's id in a row that belongs to the user: required, and deleted with the user. */
export const requiredUser = (name: string) =>
  authId(name)
    .notNull()
    .references(() => user.id, { onDelete: "cascade" });

/** A user's id kept for the record (who made, sent or accepted something): emptied when the user is deleted. */
export const optionalUser = (name: string) => authId(name).references(() => user.id, { onDelete: "set null" });

export const session = mysqlTable(
  "session",
  {
    id: authId("id").primaryKey(),
    expiresAt: instant("expires_at").notNull(),
    token: varchar("token", { length: 255 }).notNull().unique(),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
    ipAddress: varchar("ip_address", { length: 64 }),
    userAgent: text("user_agent"),
    userId: requiredUser("user_id"),
  },
  (t) => [index("session_user_idx").on(t.userId)],
);

export const account = mysqlTable(
  "account",
  {
    id: authId("id").primaryKey(),
    accountId: varchar("account_id", { length: 255 }).notNull(),
    providerId: varchar("provider_id", { length: 64 }).notNull(),
    userId: requiredUser("user_id"),
    accessToken: text("access_token"),
    refreshToken: text("refresh_token"),
    idToken: text("id_token"),
    accessTokenExpiresAt: instant("access_token_expires_at"),
    refreshTokenExpiresAt: instant("refresh_token_expires_at"),
    scope: text("scope"),
    password: text("password"),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [index("account_user_idx").on(t.userId)],
);

export const verification = mysqlTable(
  "verification",
  {
    id: authId("id").primaryKey(),
    identifier: varchar("identifier", { length: 255 }).notNull(),
    value: text("value").notNull(),
    expiresAt: instant("expires_at").notNull(),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [index("verification_identifier_idx").on(t.identifier)],
);
