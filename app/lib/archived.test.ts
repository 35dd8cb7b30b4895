import { describe, expect, it } from "vitest";
import { filterOptions, pickerOptions } from "./archived";

const routes = [
  { id: 1, name: "North loop", active: true },
  { id: 2, name: "Old loop", active: false },
  { id: 3, name: "South loop", active: true },
];

describe("archived entries in pickers and filters", () => {
  it("leaves archived entries out of a picker", () => {
    expect(pickerOptions(routes, null).map((o) => o.value)).toEqual(["1", "3"]);
  });

  it("keeps the archived entry a pool already has, marked", () => {
    expect(pickerOptions(routes, 2)).toEqual([
      { value: "1", label: "North loop" },
      { value: "2", label: "Old loop (archived)" },
      { value: "3", label: "South loop" },
    ]);
  });

  it("lists every entry in a filter, archived ones marked", () => {
    expect(filterOptions(routes).map((o) => o.label)).toEqual(["North loop", "Old loop (archived)", "South loop"]);
  });
});
