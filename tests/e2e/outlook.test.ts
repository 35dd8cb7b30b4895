import type { Page } from "playwright-core";
import { describe, expect, it } from "vitest";
import { browserPerFile } from "../fixtures/browser";
import { BROWSER_TEST_URL } from "../fixtures/server";
import { signInAs } from "../fixtures/sign-in";

const browser = browserPerFile();

/**
 * The first outlook of a server is fitted on demand (seconds, longer on a busy
 * machine); the home page does not wait for it, the outlook page does.
 */
async function openOutlook(page: Page, search = "") {
  await page.goto(`${BROWSER_TEST_URL}/outlook${search}`, { timeout: 120_000 });
  await page.getByRole("heading", { level: 1, name: "Metal outlook" }).waitFor();
}

describe("the metal outlook", () => {
  it("leads the owner's home with the pools most likely to open an episode, each with reasons", async () => {
    const context = await browser().newContext({ viewport: { width: 1280, height: 900 } });
    const page = await context.newPage();
    await signInAs(page, "owner", "/");
    await openOutlook(page);
    await page.goto(`${BROWSER_TEST_URL}/`);
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
    await signInAs(page, "manager", "/");
    await openOutlook(page);
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
    // The address changes as the navigation starts; the list follows when the loader answers.
    const metalCells = page.locator("[data-outlook-list] tbody tr td:nth-child(2)");
    await expect.poll(async () => [...new Set(await metalCells.allInnerTexts())], { timeout: 30_000 }).toEqual(["Iron"]);
    await context.close();
  });

  it("gives the technician the pools to test for metals this week, with the reason", async () => {
    const context = await browser().newContext({ viewport: { width: 390, height: 844 } });
    const page = await context.newPage();
    await signInAs(page, "tech1", "/");
    await openOutlook(page);
    await page.goto(`${BROWSER_TEST_URL}/`);
    const section = page.locator("section", { has: page.getByRole("heading", { name: "Test for metals this week" }) });
    await section.waitFor();
    // On the demo, pools of the first technician's routes are in the company's top tenth (20 of them; the home shows 8).
    const items = section.locator("[data-metal-tests-due] li");
    expect(await items.count()).toBe(8);
    expect(await items.first().innerText()).toMatch(/(Copper|Iron|Manganese), (\d+%|under 1%) in 4 weeks\n.+/);
    await context.close();
  });
});
