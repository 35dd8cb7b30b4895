import { TZDate } from "@date-fns/tz";
import { format } from "date-fns";

export function formatDate(value: Date | string | null | undefined, timeZone: string): string {
  if (!value) return "—";
  return format(new TZDate(new Date(value).getTime(), timeZone), "d MMM yyyy");
}

export function formatDateTime(value: Date | string | null | undefined, timeZone: string): string {
  if (!value) return "—";
  return format(new TZDate(new Date(value).getTime(), timeZone), "d MMM yyyy, HH:mm");
}

/** ISO weekday (1 = Monday ... 7 = Sunday) of an instant in a time zone. */
export function isoWeekdayIn(instant: Date, timeZone: string): number {
  const day = new TZDate(instant.getTime(), timeZone).getDay();
  return day === 0 ? 7 : day;
}

export const WEEKDAY_NAMES = ["Monday", "Tuesday", "Wednesday", "Thursday", "Friday", "Saturday", "Sunday"] as const;

export function weekdayName(isoWeekday: number): string {
  return WEEKDAY_NAMES[isoWeekday - 1] ?? "—";
}

/** The currency a company without its own choice is shown in. */
export const DEFAULT_CURRENCY = "USD";

/** An amount of money in the company's currency (ISO 4217 code), e.g. "$648.26" or "€648.26". */
export function formatMoney(amount: number, currency: string): string {
  return new Intl.NumberFormat("en", { style: "currency", currency }).format(amount);
}

export function formatCount(n: number): string {
  return new Intl.NumberFormat("en").format(n);
}

export function formatMgL(value: number | null | undefined, belowDetection = false): string {
  if (value === null || value === undefined || Number.isNaN(value)) return "—";
  return `${belowDetection ? "<" : ""}${value.toFixed(2)} mg/L`;
}
