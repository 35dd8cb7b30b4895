// Calendar arithmetic on plain "YYYY-MM-DD" days, and local visit times turned
// into UTC instants for the company's time zone.
import { TZDate } from "@date-fns/tz";

const DAY_MS = 86_400_000;

/** Days since 1970-01-01 for a "YYYY-MM-DD" string. */
export function dayNumber(isoDay: string): number {
  const [year, month, day] = isoDay.split("-").map(Number);
  if (!year || !month || !day) throw new Error(`not a calendar day: ${isoDay}`);
  return Math.round(Date.UTC(year, month - 1, day) / DAY_MS);
}

export function isoDay(dayNum: number): string {
  return new Date(dayNum * DAY_MS).toISOString().slice(0, 10);
}

/** ISO weekday, 1 = Monday ... 7 = Sunday. */
export function isoWeekday(dayNum: number): number {
  // 1970-01-01 was a Thursday (ISO 4).
  return ((((dayNum + 3) % 7) + 7) % 7) + 1;
}

export function dayOfYear(dayNum: number): number {
  const date = new Date(dayNum * DAY_MS);
  return Math.floor((date.getTime() - Date.UTC(date.getUTCFullYear(), 0, 1)) / DAY_MS) + 1;
}

export function monthOf(dayNum: number): number {
  return new Date(dayNum * DAY_MS).getUTCMonth() + 1;
}

/** The same calendar day `years` earlier (29 February falls back to the 28th). */
export function yearsBefore(isoDayText: string, years: number): string {
  const [year, month, day] = isoDayText.split("-").map(Number) as [number, number, number];
  const target = new Date(Date.UTC(year - years, month - 1, day));
  if (target.getUTCDate() !== day) target.setUTCDate(0);
  return target.toISOString().slice(0, 10);
}

export function yearsBetween(fromDay: number, toDay: number): number {
  return (toDay - fromDay) / 365.25;
}

/** Converts local wall-clock time in a time zone to a UTC instant; offsets cached per day. */
export class LocalClock {
  private readonly offsets = new Map<number, number>();

  constructor(readonly timeZone: string) {}

  toUtc(dayNum: number, secondsOfDay: number, milliseconds = 0): Date {
    let offsetMinutes = this.offsets.get(dayNum);
    if (offsetMinutes === undefined) {
      const noon = new Date(dayNum * DAY_MS + 12 * 3_600_000);
      const local = new TZDate(noon.getUTCFullYear(), noon.getUTCMonth(), noon.getUTCDate(), 12, 0, 0, this.timeZone);
      offsetMinutes = local.getTimezoneOffset();
      this.offsets.set(dayNum, offsetMinutes);
    }
    return new Date(dayNum * DAY_MS + secondsOfDay * 1000 + milliseconds + offsetMinutes * 60_000);
  }
}
