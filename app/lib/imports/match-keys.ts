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

export function accountKey(code: string): string {
  return code.trim().toUpperCase().replace(/\s+/g, "");
}

export function productKey(name: string): string {
  return normaliseHeader(name);
}

/** The key an unknown pool is listed under: its account code when the file has one, else its address. */
export function unknownPoolKey(accountCode: string | null, address: string | null): string {
  return accountCode ? `code:${accountKey(accountCode)}` : `address:${addressKey(address ?? "")}`;
}
