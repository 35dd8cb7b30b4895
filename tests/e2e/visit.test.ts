import type { BrowserContext, Page } from "playwright-core";
import { afterAll, describe, expect, it } from "vitest";
import { browserPerFile, phoneContext } from "../fixtures/browser";
import { BROWSER_TEST_URL } from "../fixtures/server";
import { signInAs } from "../fixtures/sign-in";

const browser = browserPerFile();

describe("a technician logs a visit on a phone", () => {
  it("saves readings and a treatment, and sees them on the pool page", async () => {
    const context = await phoneContext(browser());
    const page = await context.newPage();
    await signInAsTechnician(page);

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

    await typeReadings(page, { ph: "7.5", freeChlorine: "3", totalAlkalinity: "90", calciumHardness: "250", temperature: "80", copper: "<0.05" });
    // pH 7.5 + TF(80 degF: 0.65) + CF(250: 2.0) + AF(90: 1.96) - 12.1 = 0.01: shown before saving.
    await expect.poll(() => page.locator("output").innerText()).toContain("balanced");
    await noteCleanTreatment(page, "2");
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

/** Types each reading into its field, in order; the temperature in °F. */
async function typeReadings(page: Page, readings: Record<string, string>) {
  for (const [name, value] of Object.entries(readings)) {
    if (name === "temperature") await page.getByText("°F", { exact: true }).click();
    await page.locator(`input[name="${name}"]`).fill(value);
  }
}

/** A clean hardness endpoint and a treatment with the first product of the list. */
async function noteCleanTreatment(page: Page, amount: string) {
  await page.getByLabel("Clean").check();
  await page.getByLabel("Product 1").selectOption({ index: 1 });
  await page.getByLabel("Amount").fill(amount);
}

async function signInAsTechnician(page: Page) {
  await signInAs(page, "tech1", "/pools");
  await page.getByRole("heading", { level: 1, name: "Pools" }).waitFor();
}

/** The visit form's address for the n-th pool of the technician's own list. */
async function visitUrlOfPool(page: Page, n: number) {
  const href = await page.getByRole("table", { name: "Pools" }).locator("tbody a").nth(n).getAttribute("href");
  expect(href).toMatch(/^\/pools\/\d+$/);
  return `${BROWSER_TEST_URL}${href!.replace("/pools/", "/visit/")}`;
}

async function expectSavedOnPoolPage(page: Page, ph: string) {
  await page.getByRole("status").filter({ hasText: "Visit saved." }).waitFor();
  expect(new URL(page.url()).pathname).toMatch(/^\/pools\/\d+$/);
  expect(await page.getByRole("table", { name: "Latest test, each value judged" }).innerText()).toContain(ph);
}

describe("the visit form on a slow phone", () => {
  let context: BrowserContext;

  afterAll(async () => {
    await context?.close();
  });

  it("keeps what was typed before the page's script arrived, and saves it", async () => {
    context = await phoneContext(browser());
    const page = await context.newPage();
    await signInAsTechnician(page);
    const visitUrl = await visitUrlOfPool(page, 1);
    // A hydration mismatch would show up as a React error in the console.
    const reactErrors: string[] = [];
    page.on("console", (message) => {
      if (message.type() === "error" && /react|hydrat/i.test(message.text())) reactErrors.push(message.text());
    });

    // Hold the page's scripts back, as a slow connection would, until the typing is done.
    let releaseScripts: () => void = () => {};
    const scriptsHeld = new Promise<void>((resolve) => (releaseScripts = resolve));
    await page.route(/\/assets\/.*\.js$/, async (route) => {
      await scriptsHeld;
      await route.continue();
    });
    await page.goto(visitUrl, { waitUntil: "commit" });
    const form = page.locator("form[data-live]");
    await form.waitFor();
    expect(await form.getAttribute("data-live")).toBe("off");

    await typeReadings(page, { ph: "7.3", totalAlkalinity: "90", calciumHardness: "250", temperature: "80", iron: "<0.05" });
    await noteCleanTreatment(page, "3");
    expect(await form.getAttribute("data-live")).toBe("off");

    releaseScripts();
    await page.locator('form[data-live="on"]').waitFor();
    // Nothing typed was lost when the script took over the page.
    expect(await page.locator('input[name="ph"]').inputValue()).toBe("7.3");
    expect(await page.locator('input[name="temperature"]').inputValue()).toBe("80");
    expect(await page.locator('input[name="iron"]').inputValue()).toBe("<0.05");
    expect(await page.getByLabel("Amount").inputValue()).toBe("3");
    // The live figure was worked out from those values: pH 7.3 + TF(80 degF: 0.65) + CF(250: 2.0) + AF(90: 1.96) - 12.1 = -0.19.
    await expect.poll(() => page.locator("output").innerText()).toContain("-0.19");
    expect(reactErrors).toEqual([]);

    await page.getByRole("button", { name: "Save visit" }).click();
    await expectSavedOnPoolPage(page, "7.30");
    expect(await page.getByRole("table", { name: "Water tests, newest first" }).locator("tbody tr").first().innerText()).toContain("<0.05 mg/L");
  });

  it("works as a plain form without any script: refusals are shown beside the field and the typed values kept", async () => {
    const noScript = await browser().newContext({ viewport: { width: 390, height: 844 }, javaScriptEnabled: false });
    await noScript.addCookies(await context.cookies());
    const page = await noScript.newPage();
    await page.goto(`${BROWSER_TEST_URL}/pools`);
    const visitUrl = await visitUrlOfPool(page, 2);
    await page.goto(visitUrl);

    await typeReadings(page, { ph: "15", freeChlorine: "2.5" });
    await page.getByRole("button", { name: "Save visit" }).click();
    await page.locator("#ph-error").waitFor();
    expect(await page.locator("#ph-error").innerText()).toBe("pH: 15 is above the highest accepted value, 14.");
    expect(await page.locator('input[name="ph"]').inputValue()).toBe("15");
    expect(await page.locator('input[name="freeChlorine"]').inputValue()).toBe("2.5");

    await page.locator('input[name="ph"]').fill("7.2");
    await page.getByRole("button", { name: "Save visit" }).click();
    await expectSavedOnPoolPage(page, "7.20");
    await noScript.close();
  });
});
