import type { Page } from "playwright-core";
import { describe, expect, it } from "vitest";
import { browserPerFile, phoneContext } from "../fixtures/browser";
import { BROWSER_TEST_URL } from "../fixtures/server";
import { signInAs } from "../fixtures/sign-in";

const browser = browserPerFile();

async function chooseCurrency(page: Page, code: string) {
  await page.goto(`${BROWSER_TEST_URL}/settings`);
  await page.getByLabel("Currency (every cost is shown in it)").selectOption(code);
  await page.getByRole("button", { name: "Save settings" }).click();
  await page.getByRole("status").filter({ hasText: "Settings saved." }).waitFor();
}

describe("costs in the company's currency", () => {
  it("shows every unit cost in the currency the owner chose", async () => {
    const context = await phoneContext(browser());
    const page = await context.newPage();
    await signInAs(page, "owner", "/settings");
    try {
      await chooseCurrency(page, "EUR");
      await page.goto(`${BROWSER_TEST_URL}/products`);
      const cost = page.getByRole("cell", { name: /per fl oz$/ }).first();
      await cost.waitFor();
      // The demo's heavy-duty sequestrant costs 0.62 per fl oz.
      expect(await page.getByRole("cell", { name: "€0.62 per fl oz" }).count()).toBe(1);
      expect(await page.getByRole("cell", { name: /^\d/ }).filter({ hasText: "per fl oz" }).count()).toBe(0);
    } finally {
      await chooseCurrency(page, "USD");
    }
    await page.goto(`${BROWSER_TEST_URL}/products`);
    expect(await page.getByRole("cell", { name: "$0.62 per fl oz" }).count()).toBe(1);
    await context.close();
  });
});
