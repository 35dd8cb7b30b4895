import { index, json, mysqlEnum, mysqlTable, primaryKey, unique, varchar } from "drizzle-orm/mysql-core";
import { ROLE_NAMES } from "../../../lib/roles";
import { UNIT_SYSTEMS, type UnitSystem } from "../../../lib/stored-values";
import { requiredUser } from "./auth";
import { active, belongsTo, createdAt, serialId } from "./columns";

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
  id: serialId(),
  name: varchar("name", { length: 200 }).notNull(),
  town: varchar("town", { length: 120 }),
  timeZone: varchar("time_zone", { length: 64 }).notNull().default("UTC"),
  unitSystem: mysqlEnum("unit_system", UNIT_SYSTEMS).notNull().default("us"),
  settings: json("settings").$type<CompanySettings>().notNull().default({}),
  createdAt: createdAt(),
});

/** The company a row belongs to; the row is deleted with its company. */
export const owningCompany = () => belongsTo("company_id", () => companies.id);

/** The key and the owning company a company-scoped table starts with. */
export const companyRow = () => ({ id: serialId(), companyId: owningCompany() });

export const memberships = mysqlTable(
  "memberships",
  {
    ...companyRow(),
    userId: requiredUser("user_id"),
    role: mysqlEnum("role", ROLES).notNull(),
    createdAt: createdAt(),
  },
  (t) => [unique("memberships_company_user").on(t.companyId, t.userId), index("memberships_user_idx").on(t.userId)],
);

export const routes = mysqlTable(
  "routes",
  {
    ...companyRow(),
    name: varchar("name", { length: 120 }).notNull(),
    /** ISO weekdays served, 1 = Monday ... 7 = Sunday, comma separated ("1,4"). */
    serviceWeekdays: varchar("service_weekdays", { length: 20 }).notNull().default(""),
    active: active(),
    createdAt: createdAt(),
  },
  (t) => [unique("routes_company_name").on(t.companyId, t.name)],
);

export const routeTechnicians = mysqlTable(
  "route_technicians",
  {
    routeId: belongsTo("route_id", () => routes.id),
    userId: requiredUser("user_id"),
  },
  (t) => [primaryKey({ columns: [t.routeId, t.userId] }), index("route_technicians_user_idx").on(t.userId)],
);
