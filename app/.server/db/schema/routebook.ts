import { sql } from "drizzle-orm";
import {
  boolean,
  date,
  datetime,
  decimal,
  index,
  int,
  mysqlEnum,
  mysqlTable,
  text,
  unique,
  varchar,
} from "drizzle-orm/mysql-core";
import { companies, routes } from "./company";

import { EQUIPMENT_KINDS, EXCHANGER_METALS, SANITISERS, SOURCE_KINDS, SURFACES } from "../../../lib/stored-values";

export { EQUIPMENT_KINDS, EXCHANGER_METALS, SANITISERS, SOURCE_KINDS, SURFACES };

const metal = (name: string) => decimal(name, { precision: 6, scale: 3, mode: "number" });
const createdAt = () => datetime("created_at", { fsp: 3 }).notNull().default(sql`CURRENT_TIMESTAMP(3)`);

export const fillSources = mysqlTable(
  "fill_sources",
  {
    id: int("id").autoincrement().primaryKey(),
    companyId: int("company_id")
      .notNull()
      .references(() => companies.id, { onDelete: "cascade" }),
    name: varchar("name", { length: 160 }).notNull(),
    kind: mysqlEnum("kind", SOURCE_KINDS).notNull(),
    notes: text("notes"),
    active: boolean("active").notNull().default(true),
    createdAt: createdAt(),
  },
  (t) => [unique("fill_sources_company_name").on(t.companyId, t.name)],
);

/** A lab or field test of the fill water itself (metals in mg/L). */
export const sourceTests = mysqlTable(
  "source_tests",
  {
    id: int("id").autoincrement().primaryKey(),
    companyId: int("company_id")
      .notNull()
      .references(() => companies.id, { onDelete: "cascade" }),
    fillSourceId: int("fill_source_id")
      .notNull()
      .references(() => fillSources.id, { onDelete: "cascade" }),
    sampledOn: date("sampled_on", { mode: "string" }).notNull(),
    copper: metal("copper"),
    copperBelowDetection: boolean("copper_below_detection").notNull().default(false),
    iron: metal("iron"),
    ironBelowDetection: boolean("iron_below_detection").notNull().default(false),
    manganese: metal("manganese"),
    manganeseBelowDetection: boolean("manganese_below_detection").notNull().default(false),
    note: text("note"),
    createdAt: createdAt(),
  },
  (t) => [index("source_tests_source_idx").on(t.fillSourceId, t.sampledOn)],
);

export const pools = mysqlTable(
  "pools",
  {
    id: int("id").autoincrement().primaryKey(),
    companyId: int("company_id")
      .notNull()
      .references(() => companies.id, { onDelete: "cascade" }),
    routeId: int("route_id").references(() => routes.id, { onDelete: "set null" }),
    fillSourceId: int("fill_source_id").references(() => fillSources.id, { onDelete: "set null" }),
    /** The company's own account code, used to match imported rows. */
    accountCode: varchar("account_code", { length: 40 }).notNull(),
    customerName: varchar("customer_name", { length: 200 }).notNull(),
    customerPhone: varchar("customer_phone", { length: 40 }),
    customerEmail: varchar("customer_email", { length: 255 }),
    street: varchar("street", { length: 255 }).notNull(),
    neighbourhood: varchar("neighbourhood", { length: 120 }),
    postalCode: varchar("postal_code", { length: 20 }),
    /** Canonical volume in litres; shown in the company's units. */
    volumeLitres: int("volume_litres"),
    surface: mysqlEnum("surface", SURFACES),
    sanitiser: mysqlEnum("sanitiser", SANITISERS),
    active: boolean("active").notNull().default(true),
    createdAt: createdAt(),
  },
  (t) => [
    unique("pools_company_account").on(t.companyId, t.accountCode),
    index("pools_company_route_idx").on(t.companyId, t.routeId),
    index("pools_company_source_idx").on(t.companyId, t.fillSourceId),
  ],
);

export const equipment = mysqlTable(
  "equipment",
  {
    id: int("id").autoincrement().primaryKey(),
    companyId: int("company_id")
      .notNull()
      .references(() => companies.id, { onDelete: "cascade" }),
    poolId: int("pool_id")
      .notNull()
      .references(() => pools.id, { onDelete: "cascade" }),
    kind: mysqlEnum("kind", EQUIPMENT_KINDS).notNull(),
    exchangerMetal: mysqlEnum("exchanger_metal", EXCHANGER_METALS),
    description: varchar("description", { length: 200 }),
    installedOn: date("installed_on", { mode: "string" }),
    removedOn: date("removed_on", { mode: "string" }),
    createdAt: createdAt(),
  },
  (t) => [index("equipment_pool_idx").on(t.poolId)],
);
