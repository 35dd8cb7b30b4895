import type { Page } from "playwright-core";
import { afterAll, describe, expect, it } from "vitest";
import type { DemoUserKey } from "../../drizzle/seed/names";
import { browserPerFile } from "../fixtures/browser";
import { BROWSER_TEST_URL } from "../fixtures/server";
import { signInAs } from "../fixtures/sign-in";

const browser = browserPerFile();

afterAll(async () => {
  for (const page of pages.values()) await page.context().close();
});

// Sign-in is rate limited, so each member signs in once and keeps their page.
const pages = new Map<DemoUserKey, Page>();

async function signedIn(key: DemoUserKey, path: string): Promise<Page> {
  const open = pages.get(key);
  if (open) {
    await open.goto(`${BROWSER_TEST_URL}${path}`);
    return open;
  }
  const context = await browser().newContext({ viewport: { width: 1200, height: 900 } });
  const page = await context.newPage();
  pages.set(key, page);
  await signInAs(page, key, path);
  expect(new URL(page.url()).pathname).toBe(path.split("?")[0]);
  return page;
}

/** Opens a chart's table view and returns its rows as arrays of cell texts. */
async function tableOf(page: Page, title: string | RegExp): Promise<string[][]> {
  const figure = page.locator("figure", { has: page.locator("figcaption", { hasText: title }) }).first();
  await figure.getByRole("button", { name: "Show as a table" }).click();
  const rows = figure.locator("table tbody tr");
  await rows.first().waitFor();
  return rows.evaluateAll((trs) => trs.map((tr) => [...tr.querySelectorAll("td")].map((td) => td.textContent ?? "")));
}

describe("analytics pages", () => {
  it("the owner reads open episodes by metal on the overview, and they add up to the headline figure", async () => {
    const page = await signedIn("owner", "/overview");
    await page.getByRole("heading", { level: 1, name: "Overview" }).waitFor();
    const headline = Number(await page.locator("dt", { hasText: "Open metal episodes" }).locator("+ dd").innerText());
    const rows = await tableOf(page, "Open metal episodes, by metal");
    const byMetal = Object.fromEntries(rows.map(([metal, n]) => [metal, Number(n)]));
    expect(Object.keys(byMetal)).toEqual(["Copper", "Iron", "Manganese"]);
    expect(byMetal.Copper! + byMetal.Iron! + byMetal.Manganese!).toBe(headline);
    const trend = await tableOf(page, "Share of metal tests at or above the elevated level, per month");
    expect(trend.length).toBeGreaterThan(12);
    expect(Number(trend[0]![6])).toBeGreaterThanOrEqual(0); // median (mg/L)
    // Month, metal, tests, at or above elevated, share (%), pools: the share is the one over the other.
    for (const [, , tests, elevated, share, pools] of trend) {
      expect(Number(share)).toBeCloseTo((100 * Number(elevated)) / Number(tests), 1);
      expect(Number(pools)).toBeLessThanOrEqual(Number(elevated));
    }
    // The reading under the chart names the worst month in words.
    expect(await page.locator("[data-chart-reading]").filter({ hasText: "Worst month:" }).innerText()).toMatch(
      /^Worst month: (copper|iron|manganese) in \d{4}-\d{2}, [\d.]+% of \d+ tests at or above the elevated level, on \d+ pools?\.$/,
    );
  });

  it("the manager sees the iron well flagged on the risk page, then switches to heater age without a reload", async () => {
    const page = await signedIn("manager", "/risk?grouping=fill-source&metal=iron");
    const rows = await tableOf(page, "Metal episodes per pool-year");
    const well = rows.find((r) => r[0] === "Quarry Heights shared well")!;
    expect(well.at(-1)).toBe("Risky");
    expect(Number(well[1])).toBe(12); // pools on the well in the demo
    const copper = page;
    await copper.goto(`${BROWSER_TEST_URL}/risk?grouping=heater-age&metal=copper`);
    await copper.getByRole("button", { name: "Kind of fill source" }).click();
    await copper.getByRole("button", { name: "Heater age at the test" }).click();
    const ages = await tableOf(copper, "Metal episodes per pool-year, by heater age");
    expect(ages.find((r) => r[0] === "15 years or more")?.at(-1)).toBe("Risky");
    expect(ages.find((r) => r[0] === "10–14 years")?.at(-1)).toBe("Risky");
  });

  it("the analyst recomputes recurring pools in the browser when the levels change", async () => {
    const page = await signedIn("analyst", "/recurring");
    const stat = page.locator("dt", { hasText: "Recurring pools" }).locator("+ dd");
    const before = Number(await stat.innerText());
    expect(before).toBeGreaterThan(0);
    const readings = await tableOf(page, /metal readings \(mg\/L\)/);
    expect(readings[0]![2]).toMatch(/^<?\d/);
    for (const metal of ["Copper", "Iron", "Manganese"]) {
      await page.getByLabel(`${metal} elevated at or above`).fill("9.5");
    }
    await expect.poll(async () => Number(await stat.innerText())).toBe(0);
    await page.getByText("No pool shows a recurring or chronic episode at these levels").waitFor();
  });

  it("the manager finds sequestrant with a pad clearing iron fastest on the outcomes page", async () => {
    const page = await signedIn("manager", "/outcomes?metal=iron&arm=combination");
    const curve = await tableOf(page, "Time to clear");
    expect(curve.some((r) => r[0] === "House sequestrant, heavy duty + Skimmer collector pad")).toBe(true);
    const table = page.locator("section", { has: page.getByRole("heading", { name: /Each treatment side by side/ }) }).locator("tbody tr");
    const sideBySide = await table.evaluateAll((trs) =>
      trs.map((tr) => [tr.querySelector("th")?.firstChild?.textContent ?? "", ...[...tr.querySelectorAll("td")].map((td) => td.textContent ?? "")]),
    );
    const pair = sideBySide.find((r) => r[0] === "House sequestrant, heavy duty + Skimmer collector pad")!;
    const medianDays = Number(pair[2]);
    expect(medianDays).toBeLessThanOrEqual(10);
    await page.getByText("Add acid to water, never water to acid.").or(page.getByText("No pool has had three courses")).first().waitFor();
  });

  it("a technician sees the flagged well among their sources, with the fill-water tests as a table", async () => {
    const page = await signedIn("tech2", "/sources/health");
    await page.getByRole("heading", { level: 2, name: /Quarry Heights shared well/ }).waitFor();
    await expect.poll(() => page.getByText("flagged", { exact: true }).count()).toBeGreaterThan(0);
    const tests = await tableOf(page, "Metals in the fill water of Quarry Heights shared well");
    const iron = tests.filter((r) => r[1] === "Iron").map((r) => Number(r[2]!.replace("<", "")));
    expect(Math.max(...iron)).toBeGreaterThan(0.2);
    // Analytics for the whole company are not a technician's.
    const response = await page.goto(`${BROWSER_TEST_URL}/overview`);
    expect(response?.status()).toBe(403);
  });
});


