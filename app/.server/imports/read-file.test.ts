import { createReadStream, mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { decodeBytes, detectDelimiter, type Encoding, parseStoredFile, parseTable, Utf8Check } from "./read-file";

const folder = mkdtempSync(join(tmpdir(), "patina-read-file-"));

function writeBytes(name: string, bytes: Uint8Array): string {
  const path = join(folder, name);
  writeFileSync(path, bytes);
  return path;
}

/** Reads in pieces of `pieceBytes`, as a download delivers them (some kilobytes each by default). */
async function streamed(path: string, encoding: Encoding, delimiter: "," | ";" | "\t", pieceBytes = 16 * 1024) {
  const rows: Array<{ row: number; cells: string[] }> = [];
  const source = createReadStream(path, { highWaterMark: pieceBytes });
  const { headers } = await parseStoredFile(source, encoding, delimiter, (row, cells) => rows.push({ row, cells }));
  return { headers, rows };
}

describe("decoding", () => {
  it("strips a byte-order mark and reads UTF-8", () => {
    const bytes = new Uint8Array([0xef, 0xbb, 0xbf, ...new TextEncoder().encode("Name\nSão")]);
    expect(decodeBytes(bytes)).toMatchObject({ text: "Name\nSão", encoding: "utf-8", hadBom: true });
  });

  it("falls back to Windows-1252 and says so", () => {
    // "Müller" in Windows-1252: ü is 0xFC, which is not valid UTF-8 on its own.
    const bytes = new Uint8Array([0x4d, 0xfc, 0x6c, 0x6c, 0x65, 0x72]);
    const decoded = decodeBytes(bytes);
    expect(decoded.text).toBe("Müller");
    expect(decoded.encoding).toBe("windows-1252");
    expect(decoded.note).toContain("Windows-1252");
  });
});

describe("separators and rows", () => {
  it("detects comma, semicolon and tab", () => {
    expect(detectDelimiter("a,b,c\n1,2,3\n")).toBe(",");
    expect(detectDelimiter("a;b;c\n\"1,5\";2,5;3\n")).toBe(";");
    expect(detectDelimiter("a\tb\tc\n1,5\t2\t3\n")).toBe("\t");
  });

  it("keeps quoted separators and line breaks, counts blank lines, drops trailing separators", () => {
    const text = 'Code,Note,pH,\r\nA,"one, two",7.2,\r\n\r\nB,"line one\r\nline two",7.4,\r\n';
    const table = parseTable(text, ",");
    expect(table.headers).toEqual(["Code", "Note", "pH"]);
    expect(table.rows).toEqual([
      { row: 2, cells: ["A", "one, two", "7.2"] },
      // row 3 is the blank line
      { row: 4, cells: ["B", "line one\r\nline two", "7.4"] },
    ]);
  });
});

describe("a stored file read as it streams", () => {
  it("gives the same headers, rows and row numbers as the whole text, across 1 MiB pieces", async () => {
    // About 3 MiB: quoted separators and line breaks, blank lines and accents land on piece boundaries somewhere.
    const lines = ["Code,Note,pH,"];
    for (let i = 0, length = 0; length < 3 * 1024 * 1024; i++) {
      const line = i % 7 === 0 ? "" : `P-${i},"São, line ${i}\r\nsecond line",7.${i % 10},`;
      lines.push(line);
      length += line.length + 2;
    }
    const text = lines.join("\r\n");
    const bytes = new Uint8Array([0xef, 0xbb, 0xbf, ...new TextEncoder().encode(text)]);
    const path = writeBytes("long.csv", bytes);
    const whole = parseTable(decodeBytes(bytes).text, ",");
    const pieces = await streamed(path, "utf-8", ",");
    expect(pieces.headers).toEqual(["Code", "Note", "pH"]);
    expect(pieces.rows.length).toBe(whole.rows.length);
    expect(pieces).toEqual(whole);
    // 3 MiB parsed twice and compared row by row: seconds on a busy shared machine, so more room than the default 5 s.
  }, 30_000);

  it("reads a byte-order mark and characters split between two-byte pieces", async () => {
    // "São" has the two-byte character ã (0xC3 0xA3); pieces of 2 bytes split it and the 3-byte mark.
    const path = writeBytes("split.csv", new Uint8Array([0xef, 0xbb, 0xbf, ...new TextEncoder().encode("Name,pH\nSão,7.4\nÅs,7.2\n")]));
    expect(await streamed(path, "utf-8", ",", 2)).toEqual({
      headers: ["Name", "pH"],
      rows: [
        { row: 2, cells: ["São", "7.4"] },
        { row: 3, cells: ["Ås", "7.2"] },
      ],
    });
  });

  it("reads Windows-1252 bytes in that encoding", async () => {
    // "Müller" with ü as the single byte 0xFC
    const path = writeBytes("cp1252.csv", new Uint8Array([...new TextEncoder().encode("Name;pH\n"), 0x4d, 0xfc, 0x6c, 0x6c, 0x65, 0x72, 0x3b, 0x37]));
    expect(await streamed(path, "windows-1252", ";")).toEqual({ headers: ["Name", "pH"], rows: [{ row: 2, cells: ["Müller", "7"] }] });
  });

  it("refuses bytes that are not UTF-8 when the file was found to be UTF-8", async () => {
    const path = writeBytes("changed.csv", new Uint8Array([0x41, 0x0a, 0xfc, 0x0a]));
    await expect(streamed(path, "utf-8", ",")).rejects.toThrow();
  });
});

describe("checking UTF-8 a piece at a time", () => {
  it("accepts a character split between two pieces", () => {
    // "ã" is 0xC3 0xA3 in UTF-8
    const check = new Utf8Check();
    check.push(new Uint8Array([0x53, 0xc3]));
    check.push(new Uint8Array([0xa3, 0x6f]));
    expect(check.end()).toBe(true);
  });

  it("finds a lone Windows-1252 byte, and a character cut off at the end", () => {
    const lone = new Utf8Check();
    lone.push(new Uint8Array([0x4d, 0xfc, 0x6c]));
    expect(lone.end()).toBe(false);
    const cut = new Utf8Check();
    cut.push(new Uint8Array([0x53, 0xc3]));
    expect(cut.end()).toBe(false);
  });
});
