import { sql } from "drizzle-orm";
import { bigint, boolean, datetime, decimal, int, type MySqlColumn } from "drizzle-orm/mysql-core";

// Column builders shared by the schema's tables. Each call makes a new column,
// so one builder can serve many tables.

/** The auto-numbered key of most tables. */
export const serialId = () => int("id").autoincrement().primaryKey();

/** The auto-numbered key of the tables that grow without bound (tests, treatments, events, mail). */
export const bigSerialId = () => bigint("id", { mode: "number", unsigned: true }).autoincrement().primaryKey();

/** A required reference to the row this one belongs to: deleting that row deletes this one. */
export const belongsTo = (name: string, parent: () => MySqlColumn) =>
  int(name).notNull().references(parent, { onDelete: "cascade" });

/** A millisecond instant; datetime(3) instead of timestamp keeps it valid past 2038. */
export const instant = (name: string) => datetime(name, { fsp: 3 });

/** An instant that defaults to the database's current time when the row is inserted. */
export const instantNow = (name: string) => instant(name).notNull().default(sql`CURRENT_TIMESTAMP(3)`);

export const createdAt = () => instantNow("created_at");
export const updatedAt = () => instantNow("updated_at");

/** A decimal read and written as a JavaScript number. */
export const decimalNumber = (name: string, precision: number, scale: number) =>
  decimal(name, { precision, scale, mode: "number" });

/** A required yes/no column with its default. */
export const flag = (name: string, initially: boolean) => boolean(name).notNull().default(initially);

/** In use; archived rows (false) keep their history but leave the day's lists and forms. */
export const active = () => flag("active", true);

/** The three metals in mg/L, each with its "below detection" mark (a "<x" reading stores x). */
export const metalReadingColumns = () => ({
  copper: decimalNumber("copper", 6, 3),
  copperBelowDetection: flag("copper_below_detection", false),
  iron: decimalNumber("iron", 6, 3),
  ironBelowDetection: flag("iron_below_detection", false),
  manganese: decimalNumber("manganese", 6, 3),
  manganeseBelowDetection: flag("manganese_below_detection", false),
});
