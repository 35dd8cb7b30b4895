import {
  bigint,
  boolean,
  char,
  double,
  index,
  int,
  json,
  longtext,
  mysqlEnum,
  mysqlTable,
  primaryKey,
  smallint,
  tinyint,
  unique,
  varchar,
} from "drizzle-orm/mysql-core";
import type { MetalThresholds } from "../../../../analysis/metals/reading";
import type { ProductCategory } from "../../../../analysis/outcomes/treatments";
import { decimalNumber, flag, instant, instantNow } from "./columns";
import { owningCompany } from "./company";
import { owningPool } from "./routebook";

// Kept analytics: what the route-book answers are built from, kept up to date by
// every write that changes a pool's tests, so a request reads a few thousand
// rows instead of every reading of the company. Each row belongs to one version
// of the company's levels; a change of levels builds a new version beside the
// one in use and switches over when it is complete.

/**
 * The company a kept row belongs to, without a key of its own: the row goes
 * with its version, and the version with its company. A key and index here
 * would cost every kept row of an import a lookup and an index entry.
 */
const keptCompany = () => int("company_id").notNull();

const KEPT_VERSION_STATES = ["building", "ready", "retired"] as const;

/**
 * How the tests were read when a row was worked out: "all" with every metal
 * (a pool's tests are those with any metal measured), or one metal alone (its
 * tests are those where that metal was measured). Episode lengths and test
 * counts differ between the two, and requests ask for both.
 */
const KEPT_READINGS = ["all", "copper", "iron", "manganese"] as const;

export const keptVersions = mysqlTable(
  "kept_versions",
  {
    id: int("id").autoincrement().primaryKey(),
    companyId: owningCompany(),
    /** The metal levels every row of this version was worked out with. */
    levels: json("levels").$type<MetalThresholds>().notNull(),
    /** The company's time zone when the version was built: months are its local months. */
    timeZone: varchar("time_zone", { length: 64 }).notNull().default("UTC"),
    state: mysqlEnum("state", KEPT_VERSION_STATES).notNull().default("building"),
    /** The instance building it, and until when that claim holds without a heartbeat. */
    claimedBy: varchar("claimed_by", { length: 80 }),
    claimExpiresAt: instant("claim_expires_at"),
    /** Pools done so far by the build, in pool id order (a taken-over build resumes after it). */
    builtThroughPoolId: int("built_through_pool_id").notNull().default(0),
    startedAt: instantNow("started_at"),
    readyAt: instant("ready_at"),
    /** 1 while building, else null: a unique key lets one build per company start, whichever instance asks first. */
    buildingSlot: tinyint("building_slot"),
  },
  (t) => [index("kept_versions_company_idx").on(t.companyId, t.state), unique("kept_versions_one_build").on(t.companyId, t.buildingSlot)],
);

/**
 * Each pool's metal episodes, read one way (see KEPT_READINGS), in the order
 * the analysis found them. The primary key is the only index: a write reads
 * and replaces its pools' rows through it (version and pool known), and an
 * import keeps a hundred thousand rows, each of which would pay for another.
 * The pool has no foreign key for the same reason; a pool's rows go with its
 * version, or with its company.
 */
export const keptEpisodes = mysqlTable(
  "kept_episodes",
  {
    versionId: int("version_id")
      .notNull()
      .references(() => keptVersions.id, { onDelete: "cascade" }),
    readAs: mysqlEnum("read_as", KEPT_READINGS).notNull(),
    poolId: int("pool_id").notNull(),
    seq: smallint("seq", { unsigned: true }).notNull(),
    companyId: keptCompany(),
    metal: mysqlEnum("metal", ["copper", "iron", "manganese"]).notNull(),
    openedAt: instant("opened_at").notNull(),
    openedByTestId: bigint("opened_by_test_id", { mode: "number", unsigned: true }).notNull(),
    closedAt: instant("closed_at"),
    closedByTestId: bigint("closed_by_test_id", { mode: "number", unsigned: true }),
    endAt: instant("end_at").notNull(),
    peak: double("peak").notNull(),
    testCount: int("test_count").notNull(),
    chronic: flag("chronic", false),
    recurrence: flag("recurrence", false),
    /** On an "all" row: also the episode of its metal read alone, which then keeps no rows of its own for the pool. */
    alone: flag("alone", false),
  },
  (t) => [primaryKey({ name: "kept_episodes_pk", columns: [t.versionId, t.readAs, t.poolId, t.seq] })],
);

/**
 * Each pool's observed time, read one way: first and last test and how many.
 * "any" counts every test (any analyte); the others as in KEPT_READINGS.
 */
const KEPT_SPANS = ["any", ...KEPT_READINGS] as const;

export const keptPoolSpans = mysqlTable(
  "kept_pool_spans",
  {
    versionId: int("version_id")
      .notNull()
      .references(() => keptVersions.id, { onDelete: "cascade" }),
    poolId: owningPool(),
    readAs: mysqlEnum("read_as", KEPT_SPANS).notNull(),
    companyId: keptCompany(),
    firstAt: instant("first_at").notNull(),
    lastAt: instant("last_at").notNull(),
    tests: int("tests").notNull(),
    /** "any" only: the latest test carrying the four inputs the saturation index needs (the last entered of any at one instant). */
    latestBalanceAt: instant("latest_balance_at"),
    /** "any" only: that test's balance inputs, as stored on the test, so an answer need not look the test up. */
    balancePh: decimalNumber("balance_ph", 4, 2),
    balanceTemperatureC: decimalNumber("balance_temperature_c", 4, 1),
    balanceCalciumHardness: decimalNumber("balance_calcium_hardness", 6, 1),
    balanceTotalAlkalinity: decimalNumber("balance_total_alkalinity", 5, 1),
    balanceCyanuricAcid: decimalNumber("balance_cyanuric_acid", 5, 1),
    balanceSalt: decimalNumber("balance_salt", 7, 1),
    balanceTds: decimalNumber("balance_tds", 7, 1),
  },
  (t) => [primaryKey({ columns: [t.versionId, t.readAs, t.poolId] }), index("kept_pool_spans_pool_idx").on(t.poolId, t.versionId)],
);

const METAL_NAMES = ["copper", "iron", "manganese"] as const;

/**
 * Each pool's local month (of the version's time zone) with a metal reading:
 * days with one, and per metal the readings, those at or above the elevated
 * level, and the readings as counts of each value, so a write can take a
 * pool's old readings out of the company's month histogram without reading
 * its tests twice. One row holds all three metals: an import keeps a month
 * for every pool it touches. Only the primary key and the small index of
 * elevated months: the pool has no key of its own (see kept_episodes).
 */
export const keptPoolMonths = mysqlTable(
  "kept_pool_months",
  {
    versionId: int("version_id")
      .notNull()
      .references(() => keptVersions.id, { onDelete: "cascade" }),
    poolId: int("pool_id").notNull(),
    month: char("month", { length: 7 }).notNull(),
    companyId: keptCompany(),
    days: smallint("days", { unsigned: true }).notNull(),
    copperReadings: int("copper_readings").notNull(),
    copperElevated: int("copper_elevated").notNull(),
    ironReadings: int("iron_readings").notNull(),
    ironElevated: int("iron_elevated").notNull(),
    manganeseReadings: int("manganese_readings").notNull(),
    manganeseElevated: int("manganese_elevated").notNull(),
    /** The metals with a reading at or above the elevated level, one bit each in METALS order (copper 1, iron 2, manganese 4). */
    elevatedMetals: tinyint("elevated_metals", { unsigned: true }).notNull(),
    /** JSON as text (see kept-month-rows.ts): written and read only by Patina, so MariaDB is not asked to check each row's JSON. */
    readingCounts: longtext("reading_counts").notNull(),
  },
  (t) => [
    primaryKey({ name: "kept_pool_months_pk", columns: [t.versionId, t.poolId, t.month] }),
    // Pools above the level in a month are few: the monthly count of them reads only this index.
    index("kept_pool_months_elevated_idx").on(t.versionId, t.elevatedMetals, t.month),
  ],
);

/**
 * The company's readings of each metal per local month as counts of each
 * value: the monthly percentiles are exact from a few thousand rows. Writes
 * add and take away counts (a count may fall to 0; reads skip those).
 */
export const keptMonthValues = mysqlTable(
  "kept_month_values",
  {
    versionId: int("version_id")
      .notNull()
      .references(() => keptVersions.id, { onDelete: "cascade" }),
    metal: mysqlEnum("metal", METAL_NAMES).notNull(),
    month: char("month", { length: 7 }).notNull(),
    value: decimalNumber("value", 6, 3).notNull(),
    belowDetection: flag("below_detection", false),
    companyId: keptCompany(),
    n: int("n").notNull(),
  },
  (t) => [primaryKey({ name: "kept_month_values_pk", columns: [t.versionId, t.metal, t.month, t.value, t.belowDetection] })],
);

const METAL_STATUSES = ["elevated", "watch", "clear", "unknown"] as const;
const INELIGIBLE = ["no-baseline", "baseline-clear", "baseline-below-detection"] as const;
const CENSORING = ["follow-up-window", "end-of-data", "different-treatment"] as const;
const RECURRENCE = ["recurred", "stayed-clear", "not-followed-long-enough"] as const;

/** A course's treatment as kept: its product and category when kept, and the cost recorded with it. */
export type KeptCourseTreatment = { id: string; productId: string; category: ProductCategory; appliedAt: number; cost: number | null };

/**
 * Each pool's metal treatment courses followed on each metal (see
 * analysis/outcomes/kept-courses.ts): what the outcome answer sums. Levels
 * decide the baseline and clearing, so rows belong to a version too.
 */
export const keptTreatmentCourses = mysqlTable(
  "kept_treatment_courses",
  {
    versionId: int("version_id")
      .notNull()
      .references(() => keptVersions.id, { onDelete: "cascade" }),
    metal: mysqlEnum("metal", ["copper", "iron", "manganese"]).notNull(),
    poolId: owningPool(),
    /** The course's place among the pool's courses, by start. */
    seq: smallint("seq", { unsigned: true }).notNull(),
    companyId: keptCompany(),
    startedAt: instant("started_at").notNull(),
    treatments: json("treatments").$type<KeptCourseTreatment[]>().notNull(),
    /** The arm keys: product ids, and categories, sorted and joined with " + ". */
    combination: varchar("combination", { length: 1000 }).notNull(),
    categoryCombination: varchar("category_combination", { length: 255 }).notNull(),
    cost: double("cost").notNull(),
    costComplete: flag("cost_complete", true),
    baselineTestId: bigint("baseline_test_id", { mode: "number", unsigned: true }),
    baselineAt: instant("baseline_at"),
    baselineValue: double("baseline_value"),
    baselineStatus: mysqlEnum("baseline_status", METAL_STATUSES),
    ineligible: mysqlEnum("ineligible", INELIGIBLE),
    phAtTreatment: double("ph_at_treatment"),
    phStratum: mysqlEnum("ph_stratum", ["inside", "outside", "unknown"]).notNull(),
    followUpTestId: bigint("follow_up_test_id", { mode: "number", unsigned: true }),
    followUpAt: instant("follow_up_at"),
    followUpValue: double("follow_up_value"),
    followUpBelowDetection: boolean("follow_up_below_detection"),
    /** When the clock to clearing stopped: the clearing test, else the last follow-up reading, else the start. */
    clockStoppedAt: instant("clock_stopped_at").notNull(),
    cleared: flag("cleared", false),
    censoredBy: mysqlEnum("censored_by", CENSORING),
    clearedAt: instant("cleared_at"),
    recurrence: mysqlEnum("recurrence", RECURRENCE),
  },
  (t) => [primaryKey({ columns: [t.versionId, t.metal, t.poolId, t.seq] }), index("kept_treatment_courses_pool_idx").on(t.poolId, t.versionId)],
);
