/**
 * A spreadsheet runs a cell that starts with =, +, -, @, tab or carriage
 * return as a formula. Text cells that start so get a leading apostrophe,
 * which spreadsheets show as plain text (OWASP, "CSV Injection").
 */
const FORMULA_START = /^[=+\-@\t\r]/;

export type CsvCell = string | number | boolean | Date | null | undefined;

export function neutraliseFormula(text: string): string {
  return FORMULA_START.test(text) ? `'${text}` : text;
}

export function csvCell(value: CsvCell): string {
  if (value === null || value === undefined) return "";
  if (typeof value === "number") return Number.isFinite(value) ? String(value) : "";
  if (typeof value === "boolean") return value ? "true" : "false";
  const text = value instanceof Date ? value.toISOString() : neutraliseFormula(value);
  return /[",\r\n]/.test(text) ? `"${text.replaceAll('"', '""')}"` : text;
}

export function csvLine(cells: readonly CsvCell[]): string {
  return `${cells.map(csvCell).join(",")}\r\n`;
}

export function toCsv(headers: readonly string[], rows: ReadonlyArray<readonly CsvCell[]>): string {
  return csvLine(headers) + rows.map(csvLine).join("");
}
