import { describe, expect, it } from "vitest";
import { DEMO_USERS } from "../../drizzle/seed/names";
import { browserPerFile, phoneContext } from "../fixtures/browser";
import { BROWSER_TEST_URL } from "../fixtures/server";
import { demoEmail, demoMember, submitSignIn } from "../fixtures/sign-in";

const browser = browserPerFile();

const HOME_HEADINGS: Record<string, RegExp> = {
  owner: /The company at a glance/,
  manager: /Your routes at a glance/,
  technician: /Today on your routes/,
  analyst: /The record at a glance/,
};

describe("each demo member signs in on a phone and sees their home page", () => {
  for (const member of DEMO_USERS) {
    it(`${member.key} (${member.role})`, async () => {
      const context = await phoneContext(browser());
      const page = await context.newPage();
      const requestsElsewhere: string[] = [];
      page.on("request", (request) => {
        if (!request.url().startsWith(BROWSER_TEST_URL) && !request.url().startsWith("data:")) {
          requestsElsewhere.push(request.url());
        }
      });

      await page.goto(`${BROWSER_TEST_URL}/`);
      await expect.poll(() => new URL(page.url()).pathname).toBe("/sign-in");
      await submitSignIn(page, demoEmail(member), member.password);

      await page.getByRole("heading", { level: 1, name: HOME_HEADINGS[member.role] }).waitFor();
      // Real figures from the database, not placeholders.
      const testsOnRecord = await page.locator("dt", { hasText: "Water tests on record" }).locator("+ dd").innerText();
      expect(Number(testsOnRecord.replaceAll(",", ""))).toBeGreaterThan(100);
      const navLinks = await page.getByRole("navigation", { name: "Main" }).getByRole("link").allInnerTexts();
      expect(navLinks.includes("Settings")).toBe(member.role === "owner");
      expect(requestsElsewhere).toEqual([]);

      await page.getByRole("button", { name: "Sign out" }).click();
      await expect.poll(() => new URL(page.url()).pathname).toBe("/sign-in");
      await context.close();
    });
  }

  it("a wrong password gets a message on the page", async () => {
    const context = await phoneContext(browser());
    const page = await context.newPage();
    await page.goto(`${BROWSER_TEST_URL}/sign-in`);
    await submitSignIn(page, demoEmail(demoMember("owner")), "not-the-password");
    await page.getByRole("alert").waitFor();
    expect(await page.getByRole("alert").innerText()).toContain("do not match");
    await context.close();
  });
});
