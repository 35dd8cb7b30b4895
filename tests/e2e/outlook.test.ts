import { describe, expect, it } from "vitest";
import { browserPerFile } from "../fixtures/browser";
import { signInAs } from "../fixtures/sign-in";

const browser = browserPerFile();

describe("the metal outlook", () => {
  it("leads the owner's home with the pools most likely to open an episode, each with reasons", async () => {
    const context = await browser().newContext({ viewport: { width: 1280, height: 900 } });
    const page = await context.newPage();
    await signInAs(page, "owner", "/");
    const section = page.locator("section", { has: page.getByRole("heading", { name: /^Metal outlook: the next four weeks$/ }) });
    const rows = section.locator("[data-outlook-list] tbody tr");
    await rows.first().waitFor();
    expect(await rows.count()).toBe(8);
    // The model won its backtest on the demo, so chances are shown as percentages, and each row gives its reasons.
    expect(await section.innerText()).toMatch(/found \d+% of the openings in its top 10%/);
    expect(await rows.first().locator("td").nth(2).innerText()).toMatch(/\d+%|under 1%/);
    expect(await rows.first().locator("li").count()).toBeGreaterThanOrEqual(1);
    await context.close();
  });

  it("opens the page with the list, the backtest figures and the calibration chart", async () => {
    const context = await browser().newContext({ viewport: { width: 1280, height: 900 } });
    const page = await context.newPage();
    await signInAs(page, "manager", "/outlook");
    await page.getByRole("heading", { level: 1, name: "Metal outlook" }).waitFor();
    expect(await page.locator("[data-outlook-method]").getAttribute("data-outlook-method")).toBe("model");
    const figures = page.locator("[data-backtest]");
    expect(await figures.innerText()).toMatch(/Brier score\s+0\.\d{4}/);
    expect(await figures.innerText()).toMatch(/by latest reading\s+\d+%/);
    // The chart draws after hydration; its reading names the largest calibration gap.
    await page.locator("figure svg").first().waitFor();
    expect(await page.locator("[data-chart-reading]").innerText()).toMatch(/^Largest gap|^Too few/);
    await page.getByRole("button", { name: "Show as a table" }).click();
    expect(await page.getByRole("table", { name: /^Calibration/ }).locator("tbody tr").count()).toBeGreaterThan(2);

    // Narrowing to iron keeps only iron rows.
    await page.getByLabel("Metal").selectOption("iron");
    await page.getByRole("button", { name: "Show" }).click();
    await page.waitForURL(/metal=iron/);
    const metals = await page.locator("[data-outlook-list] tbody tr td:nth-child(2)").allInnerTexts();
    expect(metals.length).toBeGreaterThan(0);
    expect(new Set(metals)).toEqual(new Set(["Iron"]));
    await context.close();
  });

  it("gives the technician the pools to test for metals this week, with the reason", async () => {
    const context = await browser().newContext({ viewport: { width: 390, height: 844 } });
    const page = await context.newPage();
    await signInAs(page, "tech1", "/");
    const section = page.locator("section", { has: page.getByRole("heading", { name: "Test for metals this week" }) });
    await section.waitFor();
    const items = section.locator("[data-metal-tests-due] li");
    const none = section.getByText("None of your pools is in the company's top tenth this week.");
    expect((await items.count()) > 0 || (await none.count()) === 1).toBe(true);
    if ((await items.count()) > 0) expect(await items.first().innerText()).toMatch(/(Copper|Iron|Manganese), (\d+%|under 1%) in 4 weeks\n.+/);
    await context.close();
  });
});
