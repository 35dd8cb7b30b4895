import { TZDate } from "@date-fns/tz";

export type DateOrder = "dmy" | "mdy";

/** What the date column says about its own order. */
export type DateOrderFinding =
  | { kind: "iso" }
  | { kind: "known"; order: DateOrder; reason: string }
  | { kind: "ambiguous"; reason: string }
  | { kind: "conflicting"; reason: string }
  | { kind: "none" };

const ISO = /^(\d{4})[-/](\d{1,2})[-/](\d{1,2})(?:[T\s]+(.+))?$/;
const SLASHED = /^(\d{1,2})[/.-](\d{1,2})[/.-](\d{2,4})(?:[T\s,]+(.+))?$/;
const TIME = /^(\d{1,2})[:.](\d{2})(?::(\d{2})(?:\.\d+)?)?\s*([ap]\.?m\.?)?$/i;

/** Gathers what date cells say about their order, one cell at a time (a file is read as it streams). */
export class DateOrderEvidence {
  #slashed = 0;
  #iso = 0;
  #dayFirstProof: string | null = null;
  #monthFirstProof: string | null = null;

  add(raw: string) {
    const cell = raw.trim();
    if (ISO.test(cell)) {
      this.#iso++;
      return;
    }
    const match = SLASHED.exec(cell);
    if (!match) return;
    this.#slashed++;
    const first = Number(match[1]);
    const second = Number(match[2]);
    if (first > 12 && second <= 12) this.#dayFirstProof ??= cell;
    if (second > 12 && first <= 12) this.#monthFirstProof ??= cell;
  }

  /** A first part above 12 means day first, a second part above 12 month first. */
  finding(): DateOrderFinding {
    const dayFirstProof = this.#dayFirstProof;
    const monthFirstProof = this.#monthFirstProof;
    if (this.#slashed === 0) return this.#iso > 0 ? { kind: "iso" } : { kind: "none" };
    if (dayFirstProof && monthFirstProof) {
      return {
        kind: "conflicting",
        reason: `"${dayFirstProof}" can only be day first and "${monthFirstProof}" only month first`,
      };
    }
    if (dayFirstProof) return { kind: "known", order: "dmy", reason: `"${dayFirstProof}" can only be day first` };
    if (monthFirstProof) return { kind: "known", order: "mdy", reason: `"${monthFirstProof}" can only be month first` };
    return {
      kind: "ambiguous",
      reason: `none of the ${this.#slashed} dates shows a day above 12, so 03/04 could be 3 April or 4 March`,
    };
  }
}

/** Looks at every date cell: a first part above 12 means day first, a second part above 12 month first. */
export function findDateOrder(cells: Iterable<string>): DateOrderFinding {
  const evidence = new DateOrderEvidence();
  for (const cell of cells) evidence.add(cell);
  return evidence.finding();
}

export type ParsedInstant = { ok: true; value: Date; hadTime: boolean } | { ok: false; reason: string };

export type TimeOfDay = { hours: number; minutes: number; seconds: number };

export function readTime(text: string): TimeOfDay | null {
  const match = TIME.exec(text.trim());
  if (!match) return null;
  let hours = Number(match[1]);
  const minutes = Number(match[2]);
  const seconds = Number(match[3] ?? 0);
  const meridiem = match[4]?.toLowerCase().replaceAll(".", "");
  if (meridiem) {
    if (hours < 1 || hours > 12) return null;
    hours = (hours % 12) + (meridiem === "pm" ? 12 : 0);
  }
  if (hours > 23 || minutes > 59 || seconds > 59) return null;
  return { hours, minutes, seconds };
}

/**
 * Reads a date with an optional time (or a time from its own column) as a
 * wall-clock moment in the company's time zone. A date without a time is
 * read as the start of that day.
 */
export function readInstant(
  dateText: string,
  timeText: string | undefined,
  order: DateOrder | null,
  timeZone: string,
): ParsedInstant {
  const cell = dateText.trim();
  let year: number;
  let month: number;
  let day: number;
  let timePart: string | undefined;
  const iso = ISO.exec(cell);
  const slashed = iso ? null : SLASHED.exec(cell);
  if (iso) {
    if (iso[4] && /(Z|[+-]\d{2}:?\d{2})$/.test(iso[4].trim())) {
      // An explicit offset says which instant it is; the company's zone does not apply.
      const explicit = new Date(cell.replace(" ", "T"));
      if (!Number.isNaN(explicit.getTime())) return { ok: true, value: explicit, hadTime: true };
    }
    year = Number(iso[1]);
    month = Number(iso[2]);
    day = Number(iso[3]);
    timePart = iso[4];
  } else if (slashed) {
    if (slashed[3]!.length !== 4) return { ok: false, reason: "gives the year in two digits; write the year in full" };
    if (!order) return { ok: false, reason: "could be day first or month first; choose the date order" };
    const first = Number(slashed[1]);
    const second = Number(slashed[2]);
    [day, month] = order === "dmy" ? [first, second] : [second, first];
    year = Number(slashed[3]);
    timePart = slashed[4];
  } else {
    return { ok: false, reason: "is not a date (expected 2024-05-31, 05/31/2024 or 31/05/2024)" };
  }
  if (month < 1 || month > 12) return { ok: false, reason: `has no month ${month} (${order === "dmy" ? "day first" : order === "mdy" ? "month first" : "year first"})` };
  const daysInMonth = new Date(Date.UTC(year, month, 0)).getUTCDate();
  if (day < 1 || day > daysInMonth) return { ok: false, reason: `has no day ${day} in that month` };
  if (year < 1970 || year > 2100) return { ok: false, reason: `has the year ${year}, outside 1970 to 2100` };

  const separateTime = timeText?.trim();
  const timeSource = timePart?.trim() || separateTime || "";
  let time: TimeOfDay = { hours: 0, minutes: 0, seconds: 0 };
  if (timeSource !== "") {
    const read = readTime(timeSource.replace(/(Z|[+-]\d{2}:?\d{2})$/, ""));
    if (!read) return { ok: false, reason: `gives a time "${timeSource}" that is not a time of day` };
    time = read;
  }
  const wallClock = Date.UTC(year, month - 1, day, time.hours, time.minutes, time.seconds);
  const offset = steadyOffset(year, month, day, timeZone);
  const value =
    offset !== null
      ? wallClock - offset
      : new TZDate(year, month - 1, day, time.hours, time.minutes, time.seconds, timeZone).getTime();
  return { ok: true, value: new Date(value), hadTime: timeSource !== "" };
}

const offsets = new Map<string, number | null>();

/**
 * The zone's offset for a whole day, or null on a day the clocks change (then
 * every time is converted on its own). Working out an offset is slow, and a
 * long file has many rows per day.
 */
function steadyOffset(year: number, month: number, day: number, timeZone: string): number | null {
  const key = `${timeZone}|${year}-${month}-${day}`;
  const known = offsets.get(key);
  if (known !== undefined) return known;
  const at = (h: number, m: number, s: number) =>
    Date.UTC(year, month - 1, day, h, m, s) - new TZDate(year, month - 1, day, h, m, s, timeZone).getTime();
  const start = at(0, 0, 0);
  const offset = start === at(23, 59, 59) ? start : null;
  if (offsets.size > 100_000) offsets.clear();
  offsets.set(key, offset);
  return offset;
}
