import { weekdayName } from "./format";

/** "1,4" -> "Monday, Thursday". */
export function weekdayList(serviceWeekdays: string): string {
  const days = serviceWeekdays.split(",").filter(Boolean).map(Number);
  return days.length === 0 ? "no set day" : days.map((d) => weekdayName(d)).join(", ");
}

export const WEEKDAY_OPTIONS = [1, 2, 3, 4, 5, 6, 7].map((d) => ({ value: String(d), label: weekdayName(d) }));
