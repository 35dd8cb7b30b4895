import { parseMetalReading } from "@analysis/metals/parse-reading";
import { fahrenheitToCelsius, microgramsPerLitreToMilligramsPerLitre } from "@analysis/units/convert";
import { parseDecimal } from "@analysis/units/decimal";
import type { ColumnUnit } from "./fields";

/** Cells that mean "not measured". */
const MISSING = new Set(["", "-", "--", "—", "n/a", "na", "n.a.", "none", "not tested", "nt", "null", "?"]);

export function isMissing(cell: string): boolean {
  return MISSING.has(cell.trim().toLowerCase());
}

export type NumberStyle = {
  /** Semicolon and tab files may write 7,4 for 7.4; comma files cannot without quoting. */
  decimalComma: boolean;
};

export type CellNumber = { ok: true; value: number } | { ok: false; reason: string };

/** Reads a number as written in a spreadsheet, without guessing: anything unclear is refused. */
export function readNumber(text: string, style: NumberStyle): CellNumber {
  const cell = text.trim().replace(/\s+/g, "");
  const value = parseDecimal(cell, { decimalComma: style.decimalComma, groups: true });
  if (value !== null) return { ok: true, value };
  if (/^-\d/.test(cell)) return { ok: false, reason: "is negative" };
  if (!style.decimalComma && parseDecimal(cell, { decimalComma: true }) !== null) {
    return { ok: false, reason: "is written with a decimal comma, which a comma-separated file cannot tell from a column break; write it with a point" };
  }
  return { ok: false, reason: "is not a number" };
}

/** Unit words a cell may carry after its number ("82 F", "120 ug/L", "0.3 ppm"). */
const CELL_UNITS: Array<{ pattern: RegExp; unit: ColumnUnit }> = [
  { pattern: /\s*°?\s*f(ahrenheit)?$/i, unit: "degF" },
  { pattern: /\s*°?\s*c(elsius)?$/i, unit: "degC" },
  { pattern: /\s*(µg|ug|μg)\s*\/\s*l$|\s*ppb$/i, unit: "ugL" },
  { pattern: /\s*mg\s*\/\s*l$|\s*ppm$/i, unit: "mgL" },
];

export function splitCellUnit(text: string): { number: string; unit?: ColumnUnit } {
  const cell = text.trim();
  for (const { pattern, unit } of CELL_UNITS) {
    const match = pattern.exec(cell);
    if (match && match.index > 0) return { number: cell.slice(0, match.index).trim(), unit };
  }
  return { number: cell };
}

export type ReadingCell =
  | { ok: true; value: number | null; belowDetection: boolean }
  | { ok: false; reason: string };

/**
 * Reads an analyte cell into the canonical unit: temperature to degC, metals
 * to mg/L. "<x" is kept as a detection limit for metals; a unit written in the
 * cell wins over the column's unit.
 */
export function readReading(
  text: string,
  kind: "metal" | "temperature" | "plain",
  columnUnit: ColumnUnit | undefined,
  style: NumberStyle,
): ReadingCell {
  if (isMissing(text)) return { ok: true, value: null, belowDetection: false };
  const { number, unit: cellUnit } = splitCellUnit(text);
  const unit = cellUnit ?? columnUnit;
  if (kind === "metal") {
    const below = number.startsWith("<");
    const digits = below ? number.slice(1).trim() : number;
    const parsed = readNumber(digits, style);
    if (!parsed.ok) return parsed;
    // The shared metal parser holds the detection-limit rules ("<0" is impossible, etc.).
    const asMg = unit === "ugL" ? microgramsPerLitreToMilligramsPerLitre(parsed.value) : parsed.value;
    const checked = parseMetalReading(`${below ? "<" : ""}${roundTo(asMg, 6)}`, "value");
    if (!checked.ok) return { ok: false, reason: checked.message.replace(/^value: /, "") };
    return { ok: true, value: checked.reading?.value ?? null, belowDetection: checked.reading?.belowDetection ?? false };
  }
  if (number.startsWith("<")) return { ok: false, reason: "a detection limit (\"<x\") is only kept for metals" };
  const parsed = readNumber(number, style);
  if (!parsed.ok) return parsed;
  if (kind === "temperature") {
    if (unit === undefined) return { ok: false, reason: "has no unit: choose °F or °C for this column" };
    const celsius = unit === "degF" ? fahrenheitToCelsius(parsed.value) : parsed.value;
    return { ok: true, value: roundTo(celsius, 1), belowDetection: false };
  }
  return { ok: true, value: parsed.value, belowDetection: false };
}

function roundTo(value: number, digits: number): number {
  const factor = 10 ** digits;
  return Math.round(value * factor) / factor;
}
