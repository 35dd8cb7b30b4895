import { METAL_INPUT_BOUNDS, type MetalReading } from "@analysis/metals/reading";
import { parseDecimal } from "../units/decimal";

export type ParsedMetalReading =
  | { ok: true; reading: MetalReading | null }
  | { ok: false; message: string };

const READING_PATTERN = /^(<)?\s*(\d+(?:[.,]\d*)?|[.,]\d+)\s*(?:ppm|mg\s*\/\s*l)?$/i;

/**
 * Parses a technician's or spreadsheet's metal result: "0.3", "<0.05",
 * "< 0.05 ppm", "0,3" (decimal comma). An empty cell is "not tested" (null).
 */
export function parseMetalReading(text: string, field = "metal"): ParsedMetalReading {
  const trimmed = text.trim();
  if (trimmed === "" || trimmed === "-") return { ok: true, reading: null };
  const match = READING_PATTERN.exec(trimmed);
  if (!match) return { ok: false, message: `${field}: "${trimmed}" is not a number or a "<x" detection limit` };
  const value = parseDecimal(match[2]!, { decimalComma: true });
  const belowDetection = match[1] === "<";
  if (value === null) return { ok: false, message: `${field}: "${trimmed}" is not a number` };
  if (value > METAL_INPUT_BOUNDS.max) {
    return { ok: false, message: `${field}: ${value} mg/L is above the accepted maximum of ${METAL_INPUT_BOUNDS.max} mg/L` };
  }
  if (belowDetection && value === 0) return { ok: false, message: `${field}: a detection limit of 0 is not possible` };
  return { ok: true, reading: { value, belowDetection } };
}
