import { describe, expect, it } from "vitest";
import { browserPerFile, phoneContext } from "../fixtures/browser";
import { BROWSER_TEST_URL } from "../fixtures/server";
import { firstPoolPathAs } from "../fixtures/sign-in";

const browser = browserPerFile();

describe("states are marked by shape and word, colour second", () => {
  it("on the pool page's latest test and on source health", async () => {
    const context = await phoneContext(browser());
    const page = await context.newPage();
    await page.goto(`${BROWSER_TEST_URL}${await firstPoolPathAs(page, "owner")}`);
    const table = page.getByRole("table", { name: "Latest test, each value judged" });
    await table.waitFor();
    const marks = await table.locator("[data-state]").evaluateAll((spans) =>
      spans.map((s) => ({ state: s.getAttribute("data-state"), text: s.textContent ?? "", classes: s.className })),
    );
    expect(marks.length).toBeGreaterThan(0);
    for (const mark of marks) {
      if (mark.state === "fine") expect(mark.text).not.toMatch(/[◆▲]/);
      if (mark.state === "between") expect(mark.text.startsWith("◆")).toBe(true);
      if (mark.state === "above") expect(mark.text.startsWith("▲")).toBe(true);
      if (mark.text.endsWith("in range")) expect(mark.state).toBe("fine");
      // Fine is never painted green: the word says it.
      expect(mark.classes).not.toContain("verdigris");
    }

    await page.goto(`${BROWSER_TEST_URL}/sources/health`);
    const open = page.locator('[data-state="above"]', { hasText: "episode open" });
    await open.first().waitFor();
    expect(await open.first().innerText()).toMatch(/^▲\s?episode open$/);
    expect(await page.locator('[data-state="fine"]', { hasText: /^no open episode$/ }).count()).toBeGreaterThan(0);
    await context.close();
  });
});
