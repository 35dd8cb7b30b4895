import { describe, expect, it } from "vitest";
import { safeNext } from "./safe-next";

describe("safeNext keeps sign-in redirects on this site", () => {
  it.each(["/pools/12", "/pools?route=3#top", "/"])("keeps %s", (next) => {
    expect(safeNext(next)).toBe(next);
  });

  it.each([
    // Another host, however the slashes are written, also with characters browsers drop.
    "//evil.example", "/\\evil.example", "/\\/evil.example", "/\t/evil.example", "/\n/evil.example", "/\r\n/evil.example",
    // Another scheme, a bare host name, or nothing.
    "https://evil.example", "javascript:alert(1)", "evil.example", "", null, undefined,
  ])("refuses %j", (next) => {
    expect(safeNext(next)).toBe("/");
  });
});
