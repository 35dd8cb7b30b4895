import type { Page } from "playwright-core";
import { describe, expect, it } from "vitest";
import { browserPerFile, phoneContext } from "../fixtures/browser";
import { signInAs } from "../fixtures/sign-in";

const browser = browserPerFile();

const columnTexts = (page: Page, index: number) =>
  page
    .getByRole("table", { name: "Recurring and chronic pools, sortable by each column" })
    .locator(`tbody tr td:nth-child(${index})`)
    .allInnerTexts();

describe("the recurring page's table of listed pools", () => {
  it("comes before the charts and sorts by any column", async () => {
    const context = await phoneContext(browser());
    const page = await context.newPage();
    await signInAs(page, "manager", "/recurring");
    const table = page.getByRole("table", { name: "Recurring and chronic pools, sortable by each column" });
    await table.waitFor();
    const firstChart = page.locator("figure").first();
    await firstChart.waitFor();
    expect((await table.boundingBox())!.y).toBeLessThan((await firstChart.boundingBox())!.y);

    // Most openings first to start.
    const openings = (await columnTexts(page, 3)).map(Number);
    expect(openings.length).toBeGreaterThan(1);
    expect(openings).toEqual([...openings].sort((a, b) => b - a));

    await table.getByRole("button", { name: "Openings" }).click();
    expect((await columnTexts(page, 3)).map(Number)).toEqual([...openings].sort((a, b) => a - b));
    expect(await table.locator("th", { hasText: "Openings" }).getAttribute("aria-sort")).toBe("ascending");

    await table.getByRole("button", { name: "Pool" }).click();
    const streets = await columnTexts(page, 1);
    expect(streets).toEqual([...streets].sort((a, b) => a.localeCompare(b)));
    await context.close();
  });
});
