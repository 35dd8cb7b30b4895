import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO_EMAIL_DOMAIN } from "../../drizzle/seed/names";
import { launchBrowser, phoneContext } from "../fixtures/browser";
import { BROWSER_TEST_URL } from "../fixtures/server";

let browser: Browser;

beforeAll(async () => {
  browser = await launchBrowser();
});

afterAll(async () => {
  await browser?.close();
});

describe("a technician logs a visit on a phone", () => {
  it("saves readings and a treatment, and sees them on the pool page", async () => {
    const context = await phoneContext(browser);
    const page = await context.newPage();
    await page.goto(`${BROWSER_TEST_URL}/sign-in?next=/pools`);
    await page.getByLabel("E-mail").fill(`tech@${DEMO_EMAIL_DOMAIN}`);
    await page.getByLabel("Password").fill("tech-demo-2026");
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.getByRole("heading", { level: 1, name: "Pools" }).waitFor();

    // The first pool of the technician's own list, then its visit form.
    const firstPool = page.getByRole("table", { name: "Pools" }).locator("tbody a").first();
    const street = await firstPool.innerText();
    await firstPool.click();
    await page.getByRole("heading", { level: 1, name: street }).waitFor();
    await page.getByRole("link", { name: "Log a visit" }).click();
    await page.getByRole("heading", { level: 1, name: street }).waitFor();
    await page.getByRole("button", { name: "Save visit" }).waitFor();
    // The live saturation index needs the page's script: wait until it has loaded.
    await page.waitForLoadState("networkidle");

    await page.locator('input[name="ph"]').fill("7.5");
    await page.locator('input[name="freeChlorine"]').fill("3");
    await page.locator('input[name="totalAlkalinity"]').fill("90");
    await page.locator('input[name="calciumHardness"]').fill("250");
    await page.getByText("°F", { exact: true }).click();
    await page.locator('input[name="temperature"]').fill("80");
    await page.locator('input[name="copper"]').fill("<0.05");
    // pH 7.5 + TF(80 degF: 0.65) + CF(250: 2.0) + AF(90: 1.96) - 12.1 = 0.01: shown before saving.
    await expect.poll(() => page.locator("output").innerText()).toContain("balanced");
    await page.getByLabel("Clean").check();
    await page.getByLabel("Product 1").selectOption({ index: 1 });
    await page.getByLabel("Amount").fill("2");
    expect(await page.locator('input[inputmode="decimal"]').count()).toBeGreaterThan(10);

    await page.getByRole("button", { name: "Save visit" }).click();
    await page.getByRole("status").filter({ hasText: "Visit saved." }).waitFor();
    expect(new URL(page.url()).pathname).toMatch(/^\/pools\/\d+$/);
    const latest = page.getByRole("table", { name: "Latest test, each value judged" });
    expect(await latest.innerText()).toContain("7.50");
    expect(await page.getByRole("table", { name: "Water tests, newest first" }).locator("tbody tr").first().innerText()).toContain("<0.05 mg/L");
    // The viewport is a phone: nothing forces the page wider than 390 px.
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390);
    await context.close();
  });
});
