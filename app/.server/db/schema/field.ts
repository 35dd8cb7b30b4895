import { sql } from "drizzle-orm";
import { bigint, index, int, mysqlEnum, mysqlTable, text, unique, varchar } from "drizzle-orm/mysql-core";
import { optionalUser } from "./auth";
import { active, bigSerialId, createdAt, decimalNumber, instant, metalReadingColumns } from "./columns";
import { companyRow, owningCompany } from "./company";
import { owningPool } from "./routebook";

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

const tally = (name: string) => int(name).notNull().default(0);

export const importBatches = mysqlTable(
  "import_batches",
  {
    ...companyRow(),
    userId: optionalUser("user_id"),
    fileName: varchar("file_name", { length: 255 }).notNull(),
    fileSha256: varchar("file_sha256", { length: 64 }),
    status: mysqlEnum("status", IMPORT_STATUSES).notNull().default("committed"),
    testsAdded: tally("tests_added"),
    treatmentsAdded: tally("treatments_added"),
    rowsDuplicate: tally("rows_duplicate"),
    rowsRefused: tally("rows_refused"),
    createdAt: createdAt(),
    undoneAt: instant("undone_at"),
  },
  (t) => [index("import_batches_company_idx").on(t.companyId, t.createdAt)],
);

export const products = mysqlTable(
  "products",
  {
    ...companyRow(),
    name: varchar("name", { length: 160 }).notNull(),
    category: mysqlEnum("category", PRODUCT_CATEGORIES).notNull(),
    /** Label dose amount per dose basis, in doseUnit (e.g. 16 fl oz per 10,000 gal). */
    labelDose: decimalNumber("label_dose", 10, 3),
    /** The label's maintenance dose, on the same unit and basis as labelDose (the starting dose). */
    maintenanceDose: decimalNumber("maintenance_dose", 10, 3),
    doseUnit: varchar("dose_unit", { length: 16 }),
    doseBasis: mysqlEnum("dose_basis", DOSE_BASES).notNull().default("per_10k_gal"),
    /** Cost of one doseUnit, in the company's currency. */
    unitCost: decimalNumber("unit_cost", 10, 4),
    active: active(),
    createdAt: createdAt(),
  },
  (t) => [unique("products_company_name").on(t.companyId, t.name)],
);

/** The import a row came in with; undoing the import deletes it. */
const fromImport = () => int("import_batch_id").references(() => importBatches.id, { onDelete: "cascade" });

/** One water sample at a visit. Analytes are nullable: technicians test a subset. */
export const waterTests = mysqlTable(
  "water_tests",
  {
    id: bigSerialId(),
    companyId: owningCompany(),
    poolId: owningPool(),
    sampledAt: instant("sampled_at").notNull(),
    technicianId: optionalUser("technician_id"),
    freeChlorine: decimalNumber("free_chlorine", 5, 2),
    combinedChlorine: decimalNumber("combined_chlorine", 5, 2),
    ph: decimalNumber("ph", 4, 2),
    totalAlkalinity: decimalNumber("total_alkalinity", 5, 1),
    calciumHardness: decimalNumber("calcium_hardness", 6, 1),
    cyanuricAcid: decimalNumber("cyanuric_acid", 5, 1),
    salt: decimalNumber("salt", 7, 1),
    tds: decimalNumber("tds", 7, 1),
    temperatureC: decimalNumber("temperature_c", 4, 1),
    ...metalReadingColumns(),
    hardnessEndpoint: mysqlEnum("hardness_endpoint", HARDNESS_ENDPOINTS),
    stain: mysqlEnum("stain", STAIN_STATES),
    stainColour: mysqlEnum("stain_colour", STAIN_COLOURS),
    padTint: mysqlEnum("pad_tint", PAD_TINTS),
    note: text("note"),
    importBatchId: fromImport(),
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
    id: bigSerialId(),
    companyId: owningCompany(),
    poolId: owningPool(),
    productId: int("product_id")
      .notNull()
      .references(() => products.id, { onDelete: "restrict" }),
    appliedAt: instant("applied_at").notNull(),
    amount: decimalNumber("amount", 10, 3).notNull(),
    unit: varchar("unit", { length: 16 }).notNull(),
    appliedBy: optionalUser("applied_by"),
    cost: decimalNumber("cost", 10, 2),
    waterTestId: bigint("water_test_id", { mode: "number", unsigned: true }).references(() => waterTests.id, {
      onDelete: "set null",
    }),
    importBatchId: fromImport(),
    createdAt: createdAt(),
  },
  (t) => [
    index("treatments_pool_time_idx").on(t.poolId, t.appliedAt),
    index("treatments_company_time_idx").on(t.companyId, t.appliedAt),
    index("treatments_batch_idx").on(t.importBatchId),
  ],
);
