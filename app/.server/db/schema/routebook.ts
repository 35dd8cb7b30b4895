import { date, index, int, mysqlEnum, mysqlTable, text, unique, varchar } from "drizzle-orm/mysql-core";
import { active, belongsTo, createdAt, metalReadingColumns } from "./columns";
import { companyRow, routes } from "./company";

import { EQUIPMENT_KINDS, EXCHANGER_METALS, SANITISERS, SOURCE_KINDS, SURFACES } from "../../../lib/stored-values";

export { EQUIPMENT_KINDS, EXCHANGER_METALS, SANITISERS, SOURCE_KINDS, SURFACES };

const day = (name: string) => date(name, { mode: "string" });

export const fillSources = mysqlTable(
  "fill_sources",
  {
    ...companyRow(),
    name: varchar("name", { length: 160 }).notNull(),
    kind: mysqlEnum("kind", SOURCE_KINDS).notNull(),
    notes: text("notes"),
    active: active(),
    createdAt: createdAt(),
  },
  (t) => [unique("fill_sources_company_name").on(t.companyId, t.name)],
);

/** A lab or field test of the fill water itself (metals in mg/L). */
export const sourceTests = mysqlTable(
  "source_tests",
  {
    ...companyRow(),
    fillSourceId: belongsTo("fill_source_id", () => fillSources.id),
    sampledOn: day("sampled_on").notNull(),
    ...metalReadingColumns(),
    note: text("note"),
    createdAt: createdAt(),
  },
  (t) => [index("source_tests_source_idx").on(t.fillSourceId, t.sampledOn)],
);

export const pools = mysqlTable(
  "pools",
  {
    ...companyRow(),
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
    active: active(),
    createdAt: createdAt(),
  },
  (t) => [
    unique("pools_company_account").on(t.companyId, t.accountCode),
    index("pools_company_route_idx").on(t.companyId, t.routeId),
    index("pools_company_source_idx").on(t.companyId, t.fillSourceId),
  ],
);

/** The pool a row belongs to; the row is deleted with its pool. */
export const owningPool = () => belongsTo("pool_id", () => pools.id);

export const equipment = mysqlTable(
  "equipment",
  {
    ...companyRow(),
    poolId: owningPool(),
    kind: mysqlEnum("kind", EQUIPMENT_KINDS).notNull(),
    exchangerMetal: mysqlEnum("exchanger_metal", EXCHANGER_METALS),
    description: varchar("description", { length: 200 }),
    installedOn: day("installed_on"),
    removedOn: day("removed_on"),
    createdAt: createdAt(),
  },
  (t) => [index("equipment_pool_idx").on(t.poolId)],
);
