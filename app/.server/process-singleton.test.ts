import { describe, expect, it } from "vitest";
import { existingProcessSingleton, processSingleton, releaseProcessSingleton } from "./process-singleton";

describe("process singletons", () => {
  it("makes the value once and hands the same one back", () => {
    let made = 0;
    const create = () => ({ n: ++made });
    const first = processSingleton("test: once", create);
    expect(processSingleton("test: once", create)).toBe(first);
    expect(made).toBe(1);
  });

  it("keeps the value on globalThis, so a reloaded module finds it", async () => {
    const value = processSingleton("test: reload", () => ({}));
    const reloaded = await import(`./process-singleton?reload=${Date.now()}`);
    expect(reloaded.existingProcessSingleton("test: reload")).toBe(value);
  });

  it("is not made by a look, and is made anew after a release", () => {
    expect(existingProcessSingleton("test: release")).toBeUndefined();
    const first = processSingleton("test: release", () => ({}));
    expect(releaseProcessSingleton("test: release")).toBe(first);
    expect(existingProcessSingleton("test: release")).toBeUndefined();
    expect(processSingleton("test: release", () => ({}))).not.toBe(first);
  });
});
