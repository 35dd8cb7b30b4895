import { sql, type AnyColumn, type SQL } from "drizzle-orm";
import type { Metal, MetalReading } from "@analysis/metals/reading";

/**
 * Raw SQL results arrive with DATETIME as "YYYY-MM-DD HH:MM:SS.fff" text (the
 * server runs in UTC); query-builder results arrive as Date. Both become Date.
 */
export function utcDate(value: unknown): Date | null {
  if (value === null || value === undefined) return null;
  if (value instanceof Date) return value;
  const text = String(value);
  return new Date(text.includes("T") ? text : `${text.replace(" ", "T")}Z`);
}

/**
 * A stored instant (DATETIME(3), UTC) read as epoch milliseconds, worked out
 * by the server as a whole number: exact, and no Date made and parsed per row
 * on reads of tens of thousands of rows. NULL stays NULL.
 */
export function epochMs(column: AnyColumn): SQL<number> {
  return sql<number>`(TIMESTAMPDIFF(MICROSECOND, '1970-01-01', ${column}) DIV 1000)`;
}

/** A stored calendar date ("YYYY-MM-DD") as the epoch milliseconds of its UTC midnight. */
export function dayToMs(day: string | null): number | null {
  return day ? Date.parse(`${day}T00:00:00Z`) : null;
}

/** A test's three stored metals from its readings: a metal not read is NULL, and not below detection. */
export function metalColumnValues(readings: Partial<Record<Metal, MetalReading | null>>) {
  return {
    copper: readings.copper?.value ?? null,
    copperBelowDetection: readings.copper?.belowDetection ?? false,
    iron: readings.iron?.value ?? null,
    ironBelowDetection: readings.iron?.belowDetection ?? false,
    manganese: readings.manganese?.value ?? null,
    manganeseBelowDetection: readings.manganese?.belowDetection ?? false,
  };
}
