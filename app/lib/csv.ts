import Papa from "papaparse";

/**
 * The one CSV writer, for server exports and the charts' downloads alike.
 * papaparse quotes, joins and writes dates; this module adds the formula
 * guard: a spreadsheet runs a text cell that starts with =, +, -, @, tab or
 * carriage return as a formula, so such cells get a leading apostrophe,
 * which spreadsheets show as plain text (OWASP, "CSV Injection").
 */
const FORMULA_START = /^[=+\-@\t\r]/;
/** Text that is only a number, like "-0.30": a spreadsheet reads it as that number, nothing runs. */
const PLAIN_NUMBER = /^-?(\d+(\.\d*)?|\.\d+)$/;

export type CsvCell = string | number | boolean | Date | null | undefined;

export function neutraliseFormula(text: string): string {
  return FORMULA_START.test(text) ? `'${text}` : text;
}

/** Display text that is only a number keeps its digits (a spreadsheet reads it as that number); other text is guarded. */
function guardDisplayText(text: string): string {
  return PLAIN_NUMBER.test(text) ? text : neutraliseFormula(text);
}

function cellForPapa(value: CsvCell, guardText: (text: string) => string): string | number | boolean | Date | null {
  if (value === null || value === undefined) return null;
  if (typeof value === "number") return Number.isFinite(value) ? value : null;
  if (typeof value === "string") return guardText(value);
  return value;
}

/** Rows of cells as CSV, each line ended by CRLF (so pages of a stream can be joined). */
export function csvLines(rows: ReadonlyArray<readonly CsvCell[]>, guardText = neutraliseFormula): string {
  if (rows.length === 0) return "";
  const data = rows.map((row) => row.map((cell) => cellForPapa(cell, guardText)));
  return `${Papa.unparse(data, { newline: "\r\n", escapeFormulae: false, header: false })}\r\n`;
}

export function csvLine(cells: readonly CsvCell[]): string {
  return csvLines([cells]);
}

export function csvCell(value: CsvCell): string {
  return csvLine([value]).slice(0, -2);
}

export function toCsv(headers: readonly string[], rows: ReadonlyArray<readonly CsvCell[]>): string {
  return csvLines([headers, ...rows]);
}

/**
 * A table of display text as CSV (the charts' "Download CSV"): text that is
 * only a number, negative ones included, stays a number; any other text is
 * guarded like every other cell.
 */
export function displayTableCsv(headers: readonly string[], rows: ReadonlyArray<readonly string[]>): string {
  return csvLines([headers, ...rows], guardDisplayText);
}
