import type { Page } from "playwright-core";
import { describe, expect, it } from "vitest";
import { browserPerFile } from "../fixtures/browser";
import { BROWSER_TEST_URL } from "../fixtures/server";
import { firstPoolPathAs, signInAs } from "../fixtures/sign-in";

const browser = browserPerFile();

const WIDTHS = [1280, 390] as const;

async function pageAt(width: number): Promise<Page> {
  const context = await browser().newContext({ viewport: { width, height: 900 } });
  return context.newPage();
}

function chart(page: Page, title: string) {
  return page.locator("figure", { has: page.locator("figcaption", { hasText: title }) }).first();
}

/** The y axis's tick labels of a drawn chart, as numbers. */
async function yTicks(page: Page, title: string): Promise<number[]> {
  // The drawing itself, not a legend's swatches.
  const svg = chart(page, title).locator('svg:has(g[aria-label="y-axis tick label"])').first();
  await svg.waitFor();
  const texts = await svg.locator('g[aria-label="y-axis tick label"] text').allTextContents();
  return texts.map((t) => Number(t.replace("−", "-")));
}

/** Text of a chart that reaches past the drawing's right or left edge. */
async function cutOffTexts(page: Page, title: string): Promise<string[]> {
  const svg = chart(page, title).locator('svg:has(g[aria-label="y-axis tick label"])').first();
  await svg.waitFor();
  return svg.evaluate((element) => {
    const box = element.getBoundingClientRect();
    return [...element.querySelectorAll("text")]
      .filter((t) => {
        const r = t.getBoundingClientRect();
        return r.width > 0 && (r.right > box.right + 0.5 || r.left < box.left - 0.5);
      })
      .map((t) => t.textContent ?? "");
  });
}

async function firstPoolPage(page: Page) {
  await page.goto(`${BROWSER_TEST_URL}${await firstPoolPathAs(page, "owner")}`);
  await chart(page, "pH at each test").locator("svg").first().waitFor();
}

describe.each(WIDTHS)("charts at %i px", (width) => {
  it("the pool page draws pH and the saturation index each on its own scale, and cuts no label off", async () => {
    const page = await pageAt(width);
    await firstPoolPage(page);

    const ph = await yTicks(page, "pH at each test");
    expect(ph.length).toBeGreaterThan(2);
    // At least 6.5 to 8.5: the ticks reach 7 and 8 and stay on the pH scale, never from 0.
    expect(Math.min(...ph)).toBeGreaterThanOrEqual(6.5);
    expect(Math.max(...ph)).toBeLessThanOrEqual(14);
    expect(ph).toEqual(expect.arrayContaining([7, 8]));

    const index = await yTicks(page, "Saturation index at each test");
    // Centred on 0: as far below as above, and 0 itself marked.
    expect(index).toContain(0);
    expect(Math.min(...index)).toBeCloseTo(-Math.max(...index), 6);

    for (const title of ["pH at each test", "Saturation index at each test", "Dissolved metals at each test"]) {
      expect(await cutOffTexts(page, title)).toEqual([]);
    }
    // The metal panels are named inside the drawing, in full.
    const metalTexts = await chart(page, "Dissolved metals at each test").locator("svg text").allTextContents();
    expect(metalTexts).toEqual(expect.arrayContaining(["Copper", "Iron", "Manganese"]));
    await page.context().close();
  });

  it("the overview's monthly chart is a share in %, with its reading in words", async () => {
    const page = await pageAt(width);
    await signInAs(page, "owner", "/overview");
    const title = "Share of metal tests at or above the elevated level, per month";
    const ticks = await yTicks(page, title);
    expect(Math.min(...ticks)).toBe(0);
    const yLabel = await chart(page, title).locator('svg g[aria-label="y-axis label"] text').textContent();
    expect(yLabel).toContain("(%)");
    expect(await cutOffTexts(page, title)).toEqual([]);
    expect(await chart(page, title).locator("[data-chart-reading]").innerText()).toMatch(/^Worst month: /);
    await page.context().close();
  });
});
