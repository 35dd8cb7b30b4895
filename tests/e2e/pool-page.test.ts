import { describe, expect, it } from "vitest";
import { browserPerFile } from "../fixtures/browser";
import { BROWSER_TEST_URL } from "../fixtures/server";
import { firstPoolPathAs } from "../fixtures/sign-in";

const browser = browserPerFile();

describe("the pool page at 1280 px", () => {
  it("leads with the latest test, pages its history 25 at a time, and stays under 4,000 px tall", async () => {
    const context = await browser().newContext({ viewport: { width: 1280, height: 900 } });
    const page = await context.newPage();
    await page.goto(`${BROWSER_TEST_URL}${await firstPoolPathAs(page, "owner")}`);
    const history = page.getByRole("table", { name: "Water tests, newest first" });
    await history.waitFor();
    await page.waitForLoadState("networkidle");
    expect(await history.locator("tbody tr").count()).toBe(25);
    expect(await page.evaluate(() => document.documentElement.scrollHeight)).toBeLessThan(4000);
    const latest = await page.getByRole("table", { name: "Latest test, each value judged" }).boundingBox();
    expect(latest!.y).toBeLessThan((await history.boundingBox())!.y);

    const firstRow = await history.locator("tbody tr").first().innerText();
    await page.getByRole("navigation", { name: "Water test pages" }).getByRole("link", { name: "Older" }).click();
    await page.waitForURL(/page=2/);
    await expect.poll(() => history.locator("tbody tr").first().innerText()).not.toBe(firstRow);
    expect(await page.getByRole("navigation", { name: "Water test pages" }).innerText()).toContain("Page 2 of");

    await page.getByLabel("Metal tests only").check();
    await page.getByRole("button", { name: "Show", exact: true }).click();
    await page.waitForURL(/metal=only/);
    // Columns 8 to 10 are copper, iron and manganese: once the filtered page is drawn, each row has at least one.
    const rowsWithoutMetal = () =>
      history.locator("tbody tr").evaluateAll(
        (rows) => rows.filter((row) => ![...row.querySelectorAll("td")].slice(7, 10).some((td) => (td.textContent ?? "").includes("mg/L"))).length,
      );
    await expect.poll(rowsWithoutMetal).toBe(0);
    expect(await history.locator("tbody tr").count()).toBeGreaterThan(0);
    await context.close();
  });
});
