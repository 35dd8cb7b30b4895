import { describe, expect, it } from "vitest";
import { browserPerFile } from "../fixtures/browser";
import { signInAs } from "../fixtures/sign-in";

const browser = browserPerFile();

describe("source health at 1280 px", () => {
  it("leads with the sources that need a look, one line each, pages the full list and stays under 4,000 px tall", async () => {
    const context = await browser().newContext({ viewport: { width: 1280, height: 900 } });
    const page = await context.newPage();
    await signInAs(page, "manager", "/sources/health");
    const attention = page.locator("section", { has: page.getByRole("heading", { name: "Needs a look" }) }).getByRole("listitem");
    await attention.first().waitFor();
    // The demo's iron well set off a wave: it leads, with its reason in words.
    expect(await attention.first().innerText()).toMatch(/^Quarry Heights shared well · \d+ waves? of iron episodes \(the latest: \d+ pools by \d{4}-\d{2}-\d{2}\)/);
    await page.waitForLoadState("networkidle");
    expect(await page.evaluate(() => document.documentElement.scrollHeight)).toBeLessThan(4000);

    const heading = page.getByRole("heading", { name: /^Every source \(\d+\), page 1 of \d+$/ });
    await heading.waitFor();
    const total = Number(/\((\d+)\)/.exec(await heading.innerText())![1]);
    expect(total).toBeGreaterThan(4);
    await page.getByRole("navigation", { name: "Source pages" }).getByRole("link", { name: "Next sources" }).click();
    await page.getByRole("heading", { name: /^Every source \(\d+\), page 2 of \d+$/ }).waitFor();
    await context.close();
  });
});
