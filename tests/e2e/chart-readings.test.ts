import { describe, expect, it } from "vitest";
import { browserPerFile, phoneContext } from "../fixtures/browser";
import { signInAs } from "../fixtures/sign-in";

const browser = browserPerFile();

describe("charts say their main result in words", () => {
  it("the risk page names the group furthest above the rest, with its lower bound", async () => {
    const context = await phoneContext(browser());
    const page = await context.newPage();
    await signInAs(page, "manager", "/risk?grouping=fill-source&metal=iron");
    const reading = page.locator("figure", { has: page.locator("figcaption", { hasText: "Metal episodes per pool-year" }) }).locator("[data-chart-reading]");
    await reading.waitFor();
    // The demo's iron well is the planted cause.
    const text = await reading.innerText();
    const estimated = /^Quarry Heights shared well: ([\d.]+) times the rest of the route book's rate \(at least ([\d.]+) times, 95%\)\.$/.exec(text);
    const unbounded = /^Quarry Heights shared well: at least ([\d.]+) times the rest of the route book's rate \(95%\); the rest had no opening to compare with\.$/.exec(text);
    expect(estimated ?? unbounded).not.toBeNull();
    if (estimated) {
      expect(Number(estimated[2])).toBeGreaterThan(1);
      expect(Number(estimated[1])).toBeGreaterThanOrEqual(Number(estimated[2]));
    } else {
      expect(Number(unbounded![1])).toBeGreaterThan(1);
    }
    await context.close();
  });

  it("the overview names the metal with the most open episodes", async () => {
    const context = await phoneContext(browser());
    const page = await context.newPage();
    await signInAs(page, "owner", "/overview");
    const reading = page.locator("figure", { has: page.locator("figcaption", { hasText: "Open metal episodes, by metal" }) }).locator("[data-chart-reading]");
    await reading.waitFor();
    expect(await reading.innerText()).toMatch(
      /^(Most open: (copper|iron|manganese), \d+ of \d+ open episodes\.|Most open: [a-z, ]+ and [a-z]+, \d+ each of \d+ open episodes\.|No pool has an open episode\.)$/,
    );
    await context.close();
  });
});
