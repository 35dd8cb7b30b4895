import type { Page } from "playwright-core";
import { describe, expect, it } from "vitest";
import { browserPerFile, phoneContext } from "../fixtures/browser";
import { signInAs } from "../fixtures/sign-in";

const browser = browserPerFile();

const chartOf = (page: Page, title: string) => page.locator("figure", { has: page.locator("figcaption", { hasText: title }) }).first();

/** A chart's table view, as rows of cell texts. */
async function tableOf(page: Page, title: string): Promise<string[][]> {
  const figure = chartOf(page, title);
  await figure.getByRole("button", { name: "Show as a table" }).click();
  const rows = figure.locator("table tbody tr");
  await rows.first().waitFor();
  return rows.evaluateAll((trs) => trs.map((tr) => [...tr.querySelectorAll("td")].map((td) => td.textContent ?? "")));
}

type ArmRow = { label: string; tooFew: boolean; medianDays: number | null; medianFall: number | null };

/** The outcomes page's side-by-side table: each treatment's label, whether it is too small to compare, median days to clear and median fall. */
async function sideBySide(page: Page): Promise<ArmRow[]> {
  const rows = page.locator("section", { has: page.getByRole("heading", { name: /Each treatment side by side/ }) }).locator("tbody tr");
  await rows.first().waitFor();
  const cells = await rows.evaluateAll((trs) =>
    trs.map((tr) => ({
      label: tr.querySelector("th")?.firstChild?.textContent ?? "",
      tooFew: tr.querySelector("th span") !== null,
      tds: [...tr.querySelectorAll("td")].map((td) => td.textContent ?? ""),
    })),
  );
  const number = (text: string) => (/^-?\d+/.test(text) ? Number.parseInt(text, 10) : null);
  return cells.map((c) => ({ label: c.label, tooFew: c.tooFew, medianDays: number(c.tds[1]!), medianFall: number(c.tds[2]!) }));
}

describe("charts say their main result in words", () => {
  it("the risk page names the group furthest above the rest, with its lower bound", async () => {
    const context = await phoneContext(browser());
    const page = await context.newPage();
    await signInAs(page, "manager", "/risk?grouping=fill-source&metal=iron");
    const reading = page.locator("figure", { has: page.locator("figcaption", { hasText: "Metal episodes per pool-year" }) }).locator("[data-chart-reading]");
    await reading.waitFor();
    // The demo's iron well is the planted cause.
    const text = await reading.innerText();
    const estimated = /^Quarry Heights shared well: ([\d.]+) times the rest of the route book's rate \(at least ([\d.]+) times, 95%\)\.$/.exec(text);
    const unbounded =
      /^Quarry Heights shared well: at least ([\d.]+) times the rest of the route book's rate \(95%\); the rest had no opening to compare with\.$/.exec(text);
    expect(estimated ?? unbounded).not.toBeNull();
    if (estimated) {
      expect(Number(estimated[2])).toBeGreaterThan(1);
      expect(Number(estimated[1])).toBeGreaterThanOrEqual(Number(estimated[2]));
    } else {
      expect(Number(unbounded![1])).toBeGreaterThan(1);
    }
    await context.close();
  });

  it("the overview names the metal with the most open episodes", async () => {
    const context = await phoneContext(browser());
    const page = await context.newPage();
    await signInAs(page, "owner", "/overview");
    const reading = page.locator("figure", { has: page.locator("figcaption", { hasText: "Open metal episodes, by metal" }) }).locator("[data-chart-reading]");
    await reading.waitFor();
    expect(await reading.innerText()).toMatch(
      /^(Most open: (copper|iron|manganese), \d+ of \d+ open episodes\.|Most open: [a-z, ]+ and [a-z]+, \d+ each of \d+ open episodes\.|No pool has an open episode\.)$/,
    );
    await context.close();
  });

  it("the outcomes readings name what the side-by-side table shows: the soonest median time to clear and the largest median fall", async () => {
    const context = await phoneContext(browser());
    const page = await context.newPage();
    await signInAs(page, "manager", "/outcomes?metal=iron");
    const compared = (await sideBySide(page)).filter((r) => !r.tooFew);
    expect(compared.length).toBeGreaterThan(1);

    const clearing = await chartOf(page, "Time to clear").locator("[data-chart-reading]").innerText();
    const soonest = Math.min(...compared.flatMap((r) => (r.medianDays === null ? [] : [r.medianDays])));
    const fastest = compared.filter((r) => r.medianDays === soonest).map((r) => r.label);
    // The demo's iron treatments clear within the follow-up, so there is a soonest (or a tie for it).
    const single = /^Soonest to clear: (.+), half its courses clear by day (\d+)/.exec(clearing);
    const tied = /^Tied soonest to clear, half their courses clear by day (\d+): (.+)\.$/.exec(clearing);
    expect(single ?? tied, clearing).not.toBeNull();
    expect(Number(single ? single[2] : tied![1])).toBe(soonest);
    if (single) expect([single[1]]).toEqual(fastest);
    else for (const label of fastest) expect(tied![2]).toContain(label);

    const falling = await chartOf(page, "Median fall at the first follow-up").locator("[data-chart-reading]").innerText();
    const largest = /^Largest median fall: (.+), (\d+)% over (\d+) courses?(; next: (.+), (-?\d+)%)?\.$/.exec(falling);
    expect(largest, falling).not.toBeNull();
    const falls = compared.flatMap((r) => (r.medianFall === null ? [] : [r]));
    // The table rounds to whole percents as the reading does.
    expect(Number(largest![2])).toBe(Math.max(...falls.map((r) => r.medianFall!)));
    expect(falls.find((r) => r.label === largest![1])?.medianFall).toBe(Number(largest![2]));
    await context.close();
  });

  it("the flagged well's fill-water reading counts its tests and names its highest reading, as the chart's table lists them", async () => {
    const context = await phoneContext(browser());
    const page = await context.newPage();
    await signInAs(page, "manager", "/sources/health");
    const title = "Metals in the fill water of Quarry Heights shared well";
    const reading = await chartOf(page, title).locator("[data-chart-reading]").innerText();
    const parts =
      /^(\d+) of (\d+) tests? at or above the elevated level; the highest: (copper|iron|manganese) <?([\d.]+) mg\/L on (\d{4}-\d{2}-\d{2}) \(elevated level ([\d.]+) mg\/L\)\.$/.exec(
        reading,
      );
    expect(parts, reading).not.toBeNull();
    const [, elevatedTests, allTests, metal, value, on, level] = parts!;
    const rows = await tableOf(page, title);
    expect(new Set(rows.map((r) => r[0])).size).toBe(Number(allTests));
    expect(Number(elevatedTests)).toBeGreaterThan(0);
    expect(Number(elevatedTests)).toBeLessThanOrEqual(Number(allTests));
    const ofMetal = rows.filter((r) => r[1]!.toLowerCase() === metal);
    const highest = Math.max(...ofMetal.map((r) => Number(r[2]!.replace("<", ""))));
    expect(Number(value)).toBe(highest);
    expect(ofMetal.find((r) => Number(r[2]) === highest)?.[0]).toBe(on);
    expect(Number(value)).toBeGreaterThanOrEqual(Number(level));
    await context.close();
  });
});
