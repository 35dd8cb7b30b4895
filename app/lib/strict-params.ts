import { z } from "zod";

/** Digits only, no sign, no leading zero, at most 15 digits (a safe integer). */
const PLAIN_ID = /^[1-9][0-9]{0,14}$/;

/** "12" → 12; "1e2", "0x10", "1.0", " 12", "012", "-3" → null. Ids are never written any other way. */
export function plainPositiveInt(value: unknown): number | null {
  if (typeof value === "number")
    return Number.isSafeInteger(value) && value > 0 ? value : null;
  return typeof value === "string" && PLAIN_ID.test(value)
    ? Number(value)
    : null;
}

/** A zod schema for an id written as plain digits; the message names the field. */
export function plainId(name: string) {
  return z.unknown().transform((value, ctx): number => {
    const id = plainPositiveInt(value);
    if (id === null) {
      ctx.addIssue({
        code: "custom",
        message: `${name} must be a positive whole number written in digits (like 12)`,
      });
      return z.NEVER;
    }
    return id;
  });
}

const ISO_DAY = /^(\d{4})-(\d{2})-(\d{2})$/;

/** True only for a day that exists: "2024-02-29" yes, "2023-02-29" and "2024-02-30" no. */
export function isCalendarDay(text: string): boolean {
  const match = ISO_DAY.exec(text);
  if (!match) return false;
  const [year, month, day] = [
    Number(match[1]),
    Number(match[2]),
    Number(match[3]),
  ];
  const date = new Date(Date.UTC(year, month - 1, day));
  return (
    date.getUTCFullYear() === year &&
    date.getUTCMonth() === month - 1 &&
    date.getUTCDate() === day
  );
}
