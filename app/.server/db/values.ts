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

/** A stored calendar date ("YYYY-MM-DD") as the epoch milliseconds of its UTC midnight. */
export function dayToMs(day: string | null): number | null {
  return day ? Date.parse(`${day}T00:00:00Z`) : null;
}
