import { sql } from "drizzle-orm";
import {
  bigint,
  boolean,
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
import { user } from "./auth";
import { companies } from "./company";
import { pools } from "./routebook";

import {
  DOSE_BASES,
  HARDNESS_ENDPOINTS,
  PAD_TINTS,
  PRODUCT_CATEGORIES,
  STAIN_COLOURS,
  STAIN_STATES,
} from "../../../lib/stored-values";

export { DOSE_BASES, HARDNESS_ENDPOINTS, PAD_TINTS, PRODUCT_CATEGORIES, STAIN_COLOURS, STAIN_STATES };
export const IMPORT_STATUSES = ["committed", "undone"] as const;

const createdAt = () => datetime("created_at", { fsp: 3 }).notNull().default(sql`CURRENT_TIMESTAMP(3)`);
const reading = (name: string, precision: number, scale: number) =>
  decimal(name, { precision, scale, mode: "number" });

export const importBatches = mysqlTable(
  "import_batches",
  {
    id: int("id").autoincrement().primaryKey(),
    companyId: int("company_id")
      .notNull()
      .references(() => companies.id, { onDelete: "cascade" }),
    userId: varchar("user_id", { length: 36 }).references(() => user.id, { onDelete: "set null" }),
    fileName: varchar("file_name", { length: 255 }).notNull(),
    fileSha256: varchar("file_sha256", { length: 64 }),
    status: mysqlEnum("status", IMPORT_STATUSES).notNull().default("committed"),
    testsAdded: int("tests_added").notNull().default(0),
    treatmentsAdded: int("treatments_added").notNull().default(0),
    rowsDuplicate: int("rows_duplicate").notNull().default(0),
    rowsRefused: int("rows_refused").notNull().default(0),
    createdAt: createdAt(),
    undoneAt: datetime("undone_at", { fsp: 3 }),
  },
  (t) => [index("import_batches_company_idx").on(t.companyId, t.createdAt)],
);

export const products = mysqlTable(
  "products",
  {
    id: int("id").autoincrement().primaryKey(),
    companyId: int("company_id")
      .notNull()
      .references(() => companies.id, { onDelete: "cascade" }),
    name: varchar("name", { length: 160 }).notNull(),
    category: mysqlEnum("category", PRODUCT_CATEGORIES).notNull(),
    /** Label dose amount per dose basis, in doseUnit (e.g. 16 fl oz per 10,000 gal). */
    labelDose: decimal("label_dose", { precision: 10, scale: 3, mode: "number" }),
    /** The label's maintenance dose, on the same unit and basis as labelDose (the starting dose). */
    maintenanceDose: decimal("maintenance_dose", { precision: 10, scale: 3, mode: "number" }),
    doseUnit: varchar("dose_unit", { length: 16 }),
    doseBasis: mysqlEnum("dose_basis", DOSE_BASES).notNull().default("per_10k_gal"),
    /** Cost of one doseUnit, in the company's currency. */
    unitCost: decimal("unit_cost", { precision: 10, scale: 4, mode: "number" }),
    active: boolean("active").notNull().default(true),
    createdAt: createdAt(),
  },
  (t) => [unique("products_company_name").on(t.companyId, t.name)],
);

/** One water sample at a visit. Analytes are nullable: technicians test a subset. */
export const waterTests = mysqlTable(
  "water_tests",
  {
    id: bigint("id", { mode: "number", unsigned: true }).autoincrement().primaryKey(),
    companyId: int("company_id")
      .notNull()
      .references(() => companies.id, { onDelete: "cascade" }),
    poolId: int("pool_id")
      .notNull()
      .references(() => pools.id, { onDelete: "cascade" }),
    sampledAt: datetime("sampled_at", { fsp: 3 }).notNull(),
    technicianId: varchar("technician_id", { length: 36 }).references(() => user.id, { onDelete: "set null" }),
    freeChlorine: reading("free_chlorine", 5, 2),
    combinedChlorine: reading("combined_chlorine", 5, 2),
    ph: reading("ph", 4, 2),
    totalAlkalinity: reading("total_alkalinity", 5, 1),
    calciumHardness: reading("calcium_hardness", 6, 1),
    cyanuricAcid: reading("cyanuric_acid", 5, 1),
    salt: reading("salt", 7, 1),
    tds: reading("tds", 7, 1),
    temperatureC: reading("temperature_c", 4, 1),
    copper: reading("copper", 6, 3),
    copperBelowDetection: boolean("copper_below_detection").notNull().default(false),
    iron: reading("iron", 6, 3),
    ironBelowDetection: boolean("iron_below_detection").notNull().default(false),
    manganese: reading("manganese", 6, 3),
    manganeseBelowDetection: boolean("manganese_below_detection").notNull().default(false),
    hardnessEndpoint: mysqlEnum("hardness_endpoint", HARDNESS_ENDPOINTS),
    stain: mysqlEnum("stain", STAIN_STATES),
    stainColour: mysqlEnum("stain_colour", STAIN_COLOURS),
    padTint: mysqlEnum("pad_tint", PAD_TINTS),
    note: text("note"),
    importBatchId: int("import_batch_id").references(() => importBatches.id, { onDelete: "cascade" }),
    /** Set by the visit form so a repeated submit stores nothing twice. */
    submissionKey: varchar("submission_key", { length: 64 }),
    /**
     * The submission key, or "" for rows without one (imports): with the pool
     * and time it is the unique entry, so visits are told apart by their key
     * and never by the clock, while imports stay one test per pool and time.
     */
    submissionScope: varchar("submission_scope", { length: 64 }).generatedAlwaysAs(sql`coalesce(\`submission_key\`, '')`, { mode: "stored" }),
    createdAt: createdAt(),
  },
  (t) => [
    unique("water_tests_pool_time_entry").on(t.poolId, t.sampledAt, t.submissionScope),
    unique("water_tests_submission").on(t.companyId, t.submissionKey),
    index("water_tests_company_time_idx").on(t.companyId, t.sampledAt),
    // Analytics read a company's readings in pool-and-time order without a sort.
    index("water_tests_company_pool_time_idx").on(t.companyId, t.poolId, t.sampledAt),
    index("water_tests_batch_idx").on(t.importBatchId),
  ],
);

export const treatments = mysqlTable(
  "treatments",
  {
    id: bigint("id", { mode: "number", unsigned: true }).autoincrement().primaryKey(),
    companyId: int("company_id")
      .notNull()
      .references(() => companies.id, { onDelete: "cascade" }),
    poolId: int("pool_id")
      .notNull()
      .references(() => pools.id, { onDelete: "cascade" }),
    productId: int("product_id")
      .notNull()
      .references(() => products.id, { onDelete: "restrict" }),
    appliedAt: datetime("applied_at", { fsp: 3 }).notNull(),
    amount: decimal("amount", { precision: 10, scale: 3, mode: "number" }).notNull(),
    unit: varchar("unit", { length: 16 }).notNull(),
    appliedBy: varchar("applied_by", { length: 36 }).references(() => user.id, { onDelete: "set null" }),
    cost: decimal("cost", { precision: 10, scale: 2, mode: "number" }),
    waterTestId: bigint("water_test_id", { mode: "number", unsigned: true }).references(() => waterTests.id, {
      onDelete: "set null",
    }),
    importBatchId: int("import_batch_id").references(() => importBatches.id, { onDelete: "cascade" }),
    createdAt: createdAt(),
  },
  (t) => [
    index("treatments_pool_time_idx").on(t.poolId, t.appliedAt),
    index("treatments_company_time_idx").on(t.companyId, t.appliedAt),
    index("treatments_batch_idx").on(t.importBatchId),
  ],
);
