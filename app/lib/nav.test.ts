import { describe, expect, it } from "vitest";
import { currentNavTarget } from "./nav";

const targets = ["/", "/visit", "/pools", "/sources", "/sources/health", "/overview"];

describe("currentNavTarget", () => {
  it("gives a fill source's own pages to the fill-source list", () => {
    expect(currentNavTarget("/sources", targets)).toBe("/sources");
    expect(currentNavTarget("/sources/12", targets)).toBe("/sources");
    expect(currentNavTarget("/sources/12/edit", targets)).toBe("/sources");
    expect(currentNavTarget("/sources/new", targets)).toBe("/sources");
  });

  it("gives source health to its own entry only", () => {
    expect(currentNavTarget("/sources/health", targets)).toBe("/sources/health");
    expect(currentNavTarget("/sources/health/", targets)).toBe("/sources/health");
  });

  it("matches home only on its own address and never by a shared prefix of letters", () => {
    expect(currentNavTarget("/", targets)).toBe("/");
    expect(currentNavTarget("/visit/4", targets)).toBe("/visit");
    expect(currentNavTarget("/poolside", targets)).toBeNull();
    expect(currentNavTarget("/team", targets)).toBeNull();
  });
});
