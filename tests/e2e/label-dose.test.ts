import { describe, expect, it } from "vitest";
import { browserPerFile, phoneContext } from "../fixtures/browser";
import { BROWSER_TEST_URL } from "../fixtures/server";
import { firstPoolPathAs } from "../fixtures/sign-in";

const browser = browserPerFile();

describe("the label dose on the visit form", () => {
  it("shows the label amount for the pool's volume when a product is picked, without filling in the amount", async () => {
    const context = await phoneContext(browser());
    const page = await context.newPage();
    const poolPath = await firstPoolPathAs(page, "tech1");
    await page.goto(`${BROWSER_TEST_URL}${poolPath.replace("/pools/", "/visit/")}`);
    await page.getByRole("button", { name: "Save visit" }).waitFor();
    await page.waitForLoadState("networkidle");

    await page.getByLabel("Product 1").selectOption({ label: "House sequestrant, heavy duty" });
    const label = page.locator("[data-label-amount]");
    await label.waitFor();
    // Every demo pool has a recorded volume; the demo label is 32 fl oz start and 8 fl oz maintenance per 10,000 gal.
    expect(await label.innerText()).toMatch(/^Label amount for this pool \([\d,]+ gal\): start [\d.]+ fl oz · maintenance [\d.]+ fl oz$/);
    expect(await page.locator('input[name="treatmentAmount"]').first().inputValue()).toBe("");
    expect(await page.getByRole("note", { name: "Caution" }).filter({ hasText: "Doses are estimates" }).innerText()).toContain(
      "Follow the product label, local codes and licensed practice.",
    );

    await page.locator('input[name="ph"]').fill("7.9");
    await expect.poll(() => page.getByRole("status").filter({ hasText: "sequestrants are usually dosed" }).count()).toBe(1);
    await page.locator('input[name="ph"]').fill("7.4");
    await expect.poll(() => page.getByRole("status").filter({ hasText: "sequestrants are usually dosed" }).count()).toBe(0);

    // Nothing is cut off at 390 px: the line fits the page's width.
    const box = await label.boundingBox();
    expect(box!.x + box!.width).toBeLessThanOrEqual(390);
    await context.close();
  });
});
