import { normaliseHeader } from "./propose-mapping";

const STREET_WORDS: Record<string, string> = {
  street: "st",
  road: "rd",
  avenue: "ave",
  av: "ave",
  drive: "dr",
  lane: "ln",
  court: "ct",
  place: "pl",
  terrace: "ter",
  boulevard: "blvd",
  close: "cl",
  crescent: "cres",
  way: "wy",
  north: "n",
  south: "s",
  east: "e",
  west: "w",
};

/** An address as a comparison key: case, punctuation and common street words do not matter. */
export function addressKey(address: string): string {
  return normaliseHeader(address)
    .split(" ")
    .map((word) => STREET_WORDS[word] ?? word)
    .join(" ");
}

/** Characters the database's collation skips or folds away, and spaces (never part of a code). */
const INVISIBLE = /[\p{Cc}\p{Cf}\p{M}\s]/gu;
/** What a key may hold once normalised: printable ASCII, where the collation is exact up to case. */
const KEY_CHARACTERS = /^[\x21-\x7e]+$/;

export type AccountKeyReading = { ok: true; key: string } | { ok: false; reason: string };

function codePoint(character: string): string {
  return `U+${character.codePointAt(0)!.toString(16).toUpperCase().padStart(4, "0")}`;
}

/**
 * An account code as the database compares it (utf8mb4_unicode_ci):
 * compatibility forms folded (NFKD, fullwidth digits, ligatures), control and
 * format characters (NUL, zero-width, soft hyphen) and accents removed, case
 * ignored, spaces removed. The fold is never finer than the collation; a code
 * that still holds a character outside printable ASCII is refused, because the
 * collation may or may not equate it with another.
 */
export function readAccountKey(code: string): AccountKeyReading {
  const key = code.normalize("NFKD").replace(INVISIBLE, "").toUpperCase().normalize("NFKD").replace(INVISIBLE, "");
  if (key === "") return { ok: false, reason: "Account code has no letters or digits once invisible characters are removed" };
  if (!KEY_CHARACTERS.test(key)) {
    const odd = [...key].find((c) => !KEY_CHARACTERS.test(c))!;
    return {
      ok: false,
      reason: `Account code holds "${odd}" (${codePoint(odd)}), which cannot be matched reliably; use letters A-Z, digits and ASCII punctuation`,
    };
  }
  if (key.length > 40) return { ok: false, reason: `Account code is ${key.length} characters long; at most 40 are stored` };
  return { ok: true, key };
}

/** The key of a code, or null when it cannot be normalised (such a pool is never matched by code). */
export function accountKey(code: string): string | null {
  const reading = readAccountKey(code);
  return reading.ok ? reading.key : null;
}

export function productKey(name: string): string {
  return normaliseHeader(name);
}

/** The key an unknown pool is listed under: its account code when the file has one, else its address. */
export function unknownPoolKey(accountCode: string | null, address: string | null): string {
  return accountCode ? `code:${accountKey(accountCode) ?? accountCode}` : `address:${addressKey(address ?? "")}`;
}
