import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { DEMO_USERS } from "../../drizzle/seed/names";
import { browserPerFile, phoneContext } from "../fixtures/browser";
import { signInAs } from "../fixtures/sign-in";

const browser = browserPerFile();

describe("an analyst imports an old log", () => {
  it("uploads a file, changes one column's meaning and imports it", async () => {
    const context = await phoneContext(browser());
    const page = await context.newPage();
    await signInAs(page, "analyst");
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Imports" }).click();
    await page.getByRole("link", { name: "Upload a log" }).click();

    await page.getByLabel("CSV file").setInputFiles(fileURLToPath(new URL("../fixtures/imports/browser-upload.csv", import.meta.url)));
    await page.getByRole("button", { name: "Upload and check" }).click();
    await page.getByRole("heading", { level: 1, name: /Check “browser-upload.csv”/ }).waitFor();

    // "Metal A" means nothing to Patina, so it is left out until the analyst says it is copper.
    const metalColumn = page.getByLabel("Metal A", { exact: true });
    expect(await metalColumn.inputValue()).toBe("ignore");
    await metalColumn.selectOption({ label: "Copper" });
    expect(await page.getByLabel("Unit of Metal A").inputValue()).toBe("mgL");

    await page.getByRole("button", { name: "Check the file" }).click();
    await page.getByText("Checked. Nothing has been stored yet.").waitFor();
    const toAdd = page.locator("dt", { hasText: "Water tests to add" }).locator("+ dd");
    expect(await toAdd.innerText()).toBe("2");

    await page.getByRole("button", { name: "Import 2 tests and 0 treatments" }).click();
    await page.getByRole("heading", { level: 1, name: "Imports" }).waitFor();
    const entry = page.getByRole("list", { name: "Imports, newest first" }).getByRole("listitem").filter({ hasText: "browser-upload.csv" });
    await entry.waitFor();
    const figure = async (label: string) => entry.locator("dt", { hasText: label }).locator("+ dd").innerText();
    expect(await figure("Tests added")).toBe("2");
    expect(await figure("Treatments added")).toBe("0");
    expect(await figure("Refused")).toBe("0");
    expect(await entry.innerText()).toContain(DEMO_USERS.find((u) => u.role === "analyst")!.name);

    // The copper readings arrived: the export shows them for the demo pools.
    const exported = await page.evaluate(async () => (await fetch("/api/exports/water-tests.csv")).text());
    const imported = exported.split("\r\n").filter((line) => line.includes("2019-03-04T"));
    expect(imported).toHaveLength(2);
    expect(imported.some((line) => line.includes(",0.15,false,") && line.includes("first visit"))).toBe(true);
    expect(imported.some((line) => line.includes(",0.05,true,") && line.includes("second visit"))).toBe(true);
    await context.close();
  });
});
