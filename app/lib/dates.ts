import { TZDate } from "@date-fns/tz";
import { differenceInMonths, format } from "date-fns";

/** Today's calendar date (YYYY-MM-DD) in a time zone. */
export function todayIn(timeZone: string, now = new Date()): string {
  return format(new TZDate(now.getTime(), timeZone), "yyyy-MM-dd");
}

/** Whole years and months from one calendar date to another, e.g. "7 y 3 m". */
export function ageBetween(from: string, to: string): string {
  if (to < from) return "—";
  const months = differenceInMonths(new Date(`${to}T00:00:00Z`), new Date(`${from}T00:00:00Z`));
  const years = Math.floor(months / 12);
  return years === 0 ? `${months % 12} m` : `${years} y ${months % 12} m`;
}
