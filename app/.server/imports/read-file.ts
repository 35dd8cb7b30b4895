import Papa from "papaparse";

export type Encoding = "utf-8" | "windows-1252";
export type Delimiter = "," | ";" | "\t";

export type DecodedText = { text: string; encoding: Encoding; hadBom: boolean; note: string };

/**
 * Reads the bytes as UTF-8 when they are valid UTF-8, otherwise as
 * Windows-1252 (what older spreadsheet programs save), and says which.
 */
export function decodeBytes(bytes: Uint8Array): DecodedText {
  const hadBom = bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf;
  const body = hadBom ? bytes.subarray(3) : bytes;
  try {
    const text = new TextDecoder("utf-8", { fatal: true, ignoreBOM: true }).decode(body);
    return { text, encoding: "utf-8", hadBom, note: "Read as UTF-8." };
  } catch {
    const text = new TextDecoder("windows-1252").decode(body);
    return {
      text,
      encoding: "windows-1252",
      hadBom,
      note: "The file is not valid UTF-8, so it was read as Windows-1252 (the usual encoding of older spreadsheet exports). Check that names with accents look right.",
    };
  }
}

const CANDIDATES: Delimiter[] = [",", ";", "\t"];

/**
 * The separator that splits the first lines into the most columns, the same
 * number on each line. Quotes are respected, so "1,5" inside quotes does not count.
 */
export function detectDelimiter(text: string): Delimiter {
  const sample = text.slice(0, 64 * 1024);
  let best: { delimiter: Delimiter; score: number } = { delimiter: ",", score: -1 };
  for (const delimiter of CANDIDATES) {
    const { data } = Papa.parse<string[]>(sample, { delimiter, preview: 20, skipEmptyLines: true });
    const widths = data.map((row) => row.filter((cell, i) => cell !== "" || i < row.length - 1).length);
    const first = widths[0] ?? 0;
    if (first < 2) continue;
    const steady = widths.filter((w) => w === first).length / Math.max(widths.length, 1);
    const score = first * steady;
    if (score > best.score) best = { delimiter, score };
  }
  return best.delimiter;
}

export const DELIMITER_NAMES: Record<Delimiter, string> = { ",": "comma", ";": "semicolon", "\t": "tab" };

export type ParsedTable = {
  headers: string[];
  /** Data records with their row number as a spreadsheet shows it (the header is row 1). */
  rows: Array<{ row: number; cells: string[] }>;
};

function isBlank(cells: string[]): boolean {
  return cells.every((cell) => cell.trim() === "");
}

/**
 * Parses the whole text. Blank lines are skipped but still counted, so row
 * numbers match the spreadsheet. Trailing separators (empty last cells with
 * no header) are dropped.
 */
export function parseTable(text: string, delimiter: Delimiter, preview = 0): ParsedTable {
  const { data } = Papa.parse<string[]>(text, { delimiter, newline: undefined, skipEmptyLines: false, preview });
  let index = 0;
  while (index < data.length && isBlank(data[index]!)) index++;
  const headerRow = data[index] ?? [];
  let headers = headerRow.map((h) => h.trim());
  while (headers.length > 0 && headers[headers.length - 1] === "") headers = headers.slice(0, -1);
  const rows: ParsedTable["rows"] = [];
  for (let i = index + 1; i < data.length; i++) {
    const cells = data[i]!;
    if (isBlank(cells)) continue;
    rows.push({ row: i + 1, cells: cells.slice(0, Math.max(headers.length, 1)) });
  }
  return { headers, rows };
}
