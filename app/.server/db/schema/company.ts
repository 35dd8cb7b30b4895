import { sql } from "drizzle-orm";
import {
  boolean,
  datetime,
  index,
  int,
  json,
  mysqlEnum,
  mysqlTable,
  primaryKey,
  unique,
  varchar,
} from "drizzle-orm/mysql-core";
import { ROLE_NAMES } from "../../../lib/roles";
import { UNIT_SYSTEMS, type UnitSystem } from "../../../lib/stored-values";
import { user } from "./auth";

export const ROLES = ROLE_NAMES;
export type Role = (typeof ROLES)[number];

export { UNIT_SYSTEMS, type UnitSystem };

/** Per-company overrides of the analysis defaults; absent keys use the defaults. */
export type CompanySettings = {
  metalThresholds?: Partial<Record<"copper" | "iron" | "manganese", { elevated: number; clear: number }>>;
  balanceBand?: { low: number; high: number };
  alertOwners?: boolean;
  /** ISO 4217 code every cost is shown in; absent: US dollars. */
  currency?: string;
};

export const companies = mysqlTable("companies", {
  id: int("id").autoincrement().primaryKey(),
  name: varchar("name", { length: 200 }).notNull(),
  town: varchar("town", { length: 120 }),
  timeZone: varchar("time_zone", { length: 64 }).notNull().default("UTC"),
  unitSystem: mysqlEnum("unit_system", UNIT_SYSTEMS).notNull().default("us"),
  settings: json("settings").$type<CompanySettings>().notNull().default({}),
  createdAt: datetime("created_at", { fsp: 3 }).notNull().default(sql`CURRENT_TIMESTAMP(3)`),
});

export const memberships = mysqlTable(
  "memberships",
  {
    id: int("id").autoincrement().primaryKey(),
    companyId: int("company_id")
      .notNull()
      .references(() => companies.id, { onDelete: "cascade" }),
    userId: varchar("user_id", { length: 36 })
      .notNull()
      .references(() => user.id, { onDelete: "cascade" }),
    role: mysqlEnum("role", ROLES).notNull(),
    createdAt: datetime("created_at", { fsp: 3 }).notNull().default(sql`CURRENT_TIMESTAMP(3)`),
  },
  (t) => [unique("memberships_company_user").on(t.companyId, t.userId), index("memberships_user_idx").on(t.userId)],
);

export const routes = mysqlTable(
  "routes",
  {
    id: int("id").autoincrement().primaryKey(),
    companyId: int("company_id")
      .notNull()
      .references(() => companies.id, { onDelete: "cascade" }),
    name: varchar("name", { length: 120 }).notNull(),
    /** ISO weekdays served, 1 = Monday ... 7 = Sunday, comma separated ("1,4"). */
    serviceWeekdays: varchar("service_weekdays", { length: 20 }).notNull().default(""),
    /** Archived routes keep their history but leave the day's lists and forms. */
    active: boolean("active").notNull().default(true),
    createdAt: datetime("created_at", { fsp: 3 }).notNull().default(sql`CURRENT_TIMESTAMP(3)`),
  },
  (t) => [unique("routes_company_name").on(t.companyId, t.name)],
);

export const routeTechnicians = mysqlTable(
  "route_technicians",
  {
    routeId: int("route_id")
      .notNull()
      .references(() => routes.id, { onDelete: "cascade" }),
    userId: varchar("user_id", { length: 36 })
      .notNull()
      .references(() => user.id, { onDelete: "cascade" }),
  },
  (t) => [primaryKey({ columns: [t.routeId, t.userId] }), index("route_technicians_user_idx").on(t.userId)],
);
