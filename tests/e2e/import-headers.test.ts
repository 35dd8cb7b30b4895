import { fileURLToPath } from "node:url";
import type { Page } from "playwright-core";
import { describe, expect, it } from "vitest";
import { browserPerFile, phoneContext } from "../fixtures/browser";
import { signInAs } from "../fixtures/sign-in";

const browser = browserPerFile();

async function upload(page: Page, fixture: string) {
  await signInAs(page, "analyst", "/imports/new");
  await page.getByLabel("CSV file").setInputFiles(fileURLToPath(new URL(`../fixtures/imports/${fixture}`, import.meta.url)));
  await page.getByRole("button", { name: "Upload and check" }).click();
  await page.getByRole("heading", { level: 1, name: `Check “${fixture}”` }).waitFor();
}

describe("an old log with short headers", () => {
  it("is read column by column, saying how sure each reading is", async () => {
    const context = await phoneContext(browser());
    const page = await context.newPage();
    await upload(page, "abbreviated-headers.csv");

    const readings: Array<[string, string, string]> = [
      ["Acct #", "accountCode", "Read from its name."],
      ["Svc Dt", "sampledAt", "Read from a short form of its name."],
      ["Chem Added", "product", "Read from a short form of its name."],
      ["Qty", "amount", "Read from its name."],
      ["Cu", "copper", "Read from its name."],
      ["Last tech", "ignore", ""],
    ];
    for (const [header, field, words] of readings) {
      expect(await page.getByLabel(header, { exact: true }).inputValue()).toBe(field);
      const row = page.locator("li", { has: page.getByLabel(header, { exact: true }) });
      if (words) expect(await row.locator("[data-confidence]").innerText()).toBe(words);
      else expect(await row.locator("[data-confidence]").count()).toBe(0);
    }
    expect(await page.getByRole("alert").filter({ hasText: "No column is read as the sample date" }).count()).toBe(0);

    // Every row is for a pool Patina does not know: nothing would be stored, and no import is offered.
    await page.getByRole("button", { name: "Check the file" }).click();
    await page.getByText("Checked. Nothing has been stored yet.").waitFor();
    const said = page.getByRole("status").filter({ hasText: "Nothing to import" });
    await said.waitFor();
    expect(await said.innerText()).toContain("Of its rows: 2 for pools Patina does not know.");
    expect(await page.getByRole("button", { name: /^Import / }).count()).toBe(0);
    await context.close();
  });

  it("says at the top, before any check, when no column is the sample date", async () => {
    const context = await phoneContext(browser());
    const page = await context.newPage();
    await upload(page, "no-date-column.csv");
    const warning = page.getByRole("alert").filter({ hasText: "No column is read as the sample date" });
    await warning.waitFor();
    const columnsHeading = await page.getByRole("heading", { name: "Columns" }).boundingBox();
    expect((await warning.boundingBox())!.y).toBeLessThan(columnsHeading!.y);

    // Choosing a date column takes the warning away.
    await page.getByLabel("Reading", { exact: true }).selectOption("sampledAt");
    await expect.poll(() => warning.count()).toBe(0);
    await context.close();
  });
});
