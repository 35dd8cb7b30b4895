import { Readable } from "node:stream";
import Papa from "papaparse";

export type Encoding = "utf-8" | "windows-1252";
export type Delimiter = "," | ";" | "\t";

export type DecodedText = { text: string; encoding: Encoding; hadBom: boolean; note: string };

export const ENCODING_NOTES: Record<Encoding, string> = {
  "utf-8": "Read as UTF-8.",
  "windows-1252":
    "The file is not valid UTF-8, so it was read as Windows-1252 (the usual encoding of older spreadsheet exports). Check that names with accents look right.",
};

function startsWithBom(bytes: Uint8Array): boolean {
  return bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf;
}

/**
 * Reads the bytes as UTF-8 when they are valid UTF-8, otherwise as
 * Windows-1252 (what older spreadsheet programs save), and says which.
 */
export function decodeBytes(bytes: Uint8Array): DecodedText {
  const hadBom = startsWithBom(bytes);
  const body = hadBom ? bytes.subarray(3) : bytes;
  try {
    const text = new TextDecoder("utf-8", { fatal: true, ignoreBOM: true }).decode(body);
    return { text, encoding: "utf-8", hadBom, note: ENCODING_NOTES["utf-8"] };
  } catch {
    const text = new TextDecoder("windows-1252").decode(body);
    return { text, encoding: "windows-1252", hadBom, note: ENCODING_NOTES["windows-1252"] };
  }
}

/**
 * Tells, a piece at a time, whether bytes are valid UTF-8 (a character split
 * between two pieces is fine). The file is written once and checked on the way.
 */
export class Utf8Check {
  #decoder = new TextDecoder("utf-8", { fatal: true, ignoreBOM: true });
  #valid = true;

  push(bytes: Uint8Array) {
    if (!this.#valid) return;
    try {
      this.#decoder.decode(bytes, { stream: true });
    } catch {
      this.#valid = false;
    }
  }

  /** Whether every byte pushed was valid UTF-8, including the last character. */
  end(): boolean {
    if (!this.#valid) return false;
    try {
      this.#decoder.decode();
    } catch {
      this.#valid = false;
    }
    return this.#valid;
  }
}

/** Bytes of a stored file as they arrive (from the object store, or a file in tests). */
export type ByteSource = AsyncIterable<Uint8Array>;

/** Large pieces: the first one is what the line-ending guess looks at, as when the text was read whole. */
const READ_PIECE = 1024 * 1024;

/** Gathers the source's small pieces (a download's are some kilobytes) into pieces of `size` bytes. */
async function* gathered(source: ByteSource, size: number): AsyncGenerator<Uint8Array> {
  let held: Uint8Array[] = [];
  let heldBytes = 0;
  for await (const piece of source) {
    held.push(piece);
    heldBytes += piece.byteLength;
    if (heldBytes >= size) {
      yield Buffer.concat(held, heldBytes);
      held = [];
      heldBytes = 0;
    }
  }
  if (heldBytes > 0) yield Buffer.concat(held, heldBytes);
}

/**
 * The text of a stored file a piece at a time, in the encoding found when it
 * was uploaded, without its byte-order mark. With `partial` the source is
 * only the file's start, which may end inside a character: that part is left out.
 */
export async function* readFileText(source: ByteSource, encoding: Encoding, options: { partial?: boolean } = {}): AsyncGenerator<string> {
  const decoder = new TextDecoder(encoding, { fatal: encoding === "utf-8", ignoreBOM: true });
  let first = true;
  for await (const chunk of gathered(source, READ_PIECE)) {
    const bytes = first && startsWithBom(chunk) ? chunk.subarray(3) : chunk;
    first = false;
    const text = decoder.decode(bytes, { stream: true });
    if (text) yield text;
  }
  if (!options.partial) {
    const rest = decoder.decode();
    if (rest) yield rest;
  }
}

const CANDIDATES: Delimiter[] = [",", ";", "\t"];

/**
 * papaparse's own guess among comma, semicolon and tab (the separator that
 * splits the first lines into the steadiest number of columns, quotes
 * respected); comma when none splits them.
 */
export function detectDelimiter(text: string): Delimiter {
  const { meta } = Papa.parse<string[]>(text.slice(0, 64 * 1024), { delimitersToGuess: CANDIDATES, preview: 20, skipEmptyLines: true });
  return CANDIDATES.find((candidate) => candidate === meta.delimiter) ?? ",";
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

function headerNames(cells: string[]): string[] {
  let headers = cells.map((h) => h.trim());
  while (headers.length > 0 && headers[headers.length - 1] === "") headers = headers.slice(0, -1);
  return headers;
}

/**
 * Parses a stored file as it is read, by the same rules as parseTable, handing
 * each data record to `onRow` and keeping none of them. Resolves with the headers.
 */
export function parseStoredFile(
  source: ByteSource,
  encoding: Encoding,
  delimiter: Delimiter,
  onRow: (row: number, cells: string[]) => void,
  onHeaders?: (headers: string[]) => void,
): Promise<{ headers: string[] }> {
  const text = Readable.from(readFileText(source, encoding));
  let record = 0;
  let headers: string[] | null = null;
  let width = 1;
  return new Promise((resolve, reject) => {
    Papa.parse<string[]>(text, {
      delimiter,
      skipEmptyLines: false,
      chunk: ({ data }) => {
        for (const cells of data) {
          record++;
          if (isBlank(cells)) continue;
          if (headers === null) {
            headers = headerNames(cells);
            width = Math.max(headers.length, 1);
            onHeaders?.(headers);
            continue;
          }
          onRow(record, cells.length > width ? cells.slice(0, width) : cells);
        }
      },
      complete: () => resolve({ headers: headers ?? [] }),
      error: (error) => {
        text.destroy();
        reject(error);
      },
    });
  });
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
  const headers = headerNames(data[index] ?? []);
  const rows: ParsedTable["rows"] = [];
  for (let i = index + 1; i < data.length; i++) {
    const cells = data[i]!;
    if (isBlank(cells)) continue;
    rows.push({ row: i + 1, cells: cells.slice(0, Math.max(headers.length, 1)) });
  }
  return { headers, rows };
}
