/**
 * The longest text each imported field may have: the width of the column it
 * is stored in (characters). A unit test holds these to the schema.
 */
export const TEXT_LIMITS = {
  accountCode: 40,
  address: 255,
  customerName: 200,
  neighbourhood: 120,
  postalCode: 20,
  product: 160,
  amountUnit: 16,
} as const;

/** Characters of a refused value shown back (on the page, in the refused-rows file). */
export const SHOWN_VALUE_LENGTH = 120;

/** A value as a refusal shows it: long ones cut, with their length. */
export function shownValue(value: string): string {
  const characters = [...value];
  if (characters.length <= SHOWN_VALUE_LENGTH) return value;
  return `${characters.slice(0, SHOWN_VALUE_LENGTH).join("")}… (${characters.length.toLocaleString("en")} characters)`;
}

/** Length as the database counts it: characters (code points), not UTF-16 units. */
export function characterCount(text: string): number {
  let count = 0;
  for (const _ of text) count++;
  return count;
}
