import { describe, expect, it } from "vitest";
import { decodeBytes, detectDelimiter, parseTable } from "./read-file";

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
