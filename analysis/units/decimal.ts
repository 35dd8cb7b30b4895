/**
 * The one reader of typed and imported decimal numbers: "7.4", "7,4", ".5",
 * and, where a file's style allows it, digit groups ("1,234.5" or
 * "1.234,5"). Anything unclear is not a number (null); nothing is guessed.
 */
export type DecimalRules = {
  /** A comma may be the decimal mark ("7,4"): typed input, semicolon and tab files. */
  decimalComma: boolean;
  /** Digit groups are allowed: "1,234.5" with point decimals, "1.234,5" with comma decimals. */
  groups?: boolean;
  /** A leading minus is allowed. */
  negative?: boolean;
};

const POINT_DECIMAL = /^(\d+(\.\d*)?|\.\d+)$/;
const COMMA_DECIMAL = /^(\d+(,\d*)?|,\d+)$/;
const POINT_GROUPS_COMMA_DECIMAL = /^\d{1,3}(\.\d{3})+(,\d+)?$/;
const COMMA_GROUPS_POINT_DECIMAL = /^\d{1,3}(,\d{3})+(\.\d+)?$/;

export function parseDecimal(text: string, rules: DecimalRules): number | null {
  const trimmed = text.trim();
  const sign = trimmed[0] === "-" || trimmed[0] === "+" ? trimmed[0] : "";
  if (sign === "-" && !rules.negative) return null;
  const digits = trimmed.slice(sign.length);
  const magnitude = unsignedDecimal(digits, rules);
  if (magnitude === null) return null;
  return sign === "-" ? -magnitude : magnitude;
}

function unsignedDecimal(digits: string, rules: DecimalRules): number | null {
  if (POINT_DECIMAL.test(digits)) return Number(digits);
  if (rules.decimalComma) {
    if (COMMA_DECIMAL.test(digits)) return Number(digits.replace(",", "."));
    if (rules.groups && POINT_GROUPS_COMMA_DECIMAL.test(digits)) return Number(digits.replaceAll(".", "").replace(",", "."));
  } else if (rules.groups && COMMA_GROUPS_POINT_DECIMAL.test(digits)) {
    return Number(digits.replaceAll(",", ""));
  }
  return null;
}
