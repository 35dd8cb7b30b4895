import type { Page } from "playwright-core";
import { describe, expect, it } from "vitest";
import { browserPerFile, phoneContext } from "../fixtures/browser";
import { BROWSER_TEST_URL } from "../fixtures/server";
import { signInAs } from "../fixtures/sign-in";

const browser = browserPerFile();

/** The names of the menu entries marked as the current page. */
async function currentEntries(page: Page): Promise<string[]> {
  return page.getByRole("navigation", { name: "Main" }).locator('a[aria-current="page"]').allInnerTexts();
}

describe("the main menu", () => {
  it("marks Fill sources on the list and on a source's page, and Source health only on its own page", async () => {
    const context = await phoneContext(browser());
    const page = await context.newPage();
    await signInAs(page, "owner");
    await expect.poll(() => new URL(page.url()).pathname).toBe("/");
    await expect.poll(() => currentEntries(page)).toEqual(["Home"]);

    await page.goto(`${BROWSER_TEST_URL}/sources`);
    await expect.poll(() => currentEntries(page)).toEqual(["Fill sources"]);

    const sourceHref = await page
      .locator("main a")
      .evaluateAll((links) => links.map((a) => a.getAttribute("href") ?? "").find((href) => /^\/sources\/\d+$/.test(href)));
    expect(sourceHref).toBeDefined();
    await page.locator(`main a[href="${sourceHref}"]`).first().click();
    await expect.poll(() => new URL(page.url()).pathname).toMatch(/^\/sources\/\d+$/);
    await expect.poll(() => currentEntries(page)).toEqual(["Fill sources"]);

    await page.goto(`${BROWSER_TEST_URL}/sources/health`);
    await expect.poll(() => currentEntries(page)).toEqual(["Source health"]);
    await context.close();
  });
});
