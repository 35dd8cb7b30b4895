import type { BrowserContext, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { browserPerFile } from "../fixtures/browser";
import { BROWSER_TEST_URL } from "../fixtures/server";
import { signInAs } from "../fixtures/sign-in";

/**
 * Every chart of the analytics pages and the pool page, on a phone 390 px wide
 * with a touch screen: its title asks a question, its axes are labelled, its
 * main result is written under it, no text reaches out of the drawing and no
 * two labels cover each other; a tap on a mark shows that mark's tip on screen.
 */

const browser = browserPerFile();
const WIDTH = 390;

let context: BrowserContext;
let page: Page;

beforeAll(async () => {
  context = await browser().newContext({ viewport: { width: WIDTH, height: 844 }, deviceScaleFactor: 2, hasTouch: true, isMobile: true });
  page = await context.newPage();
  // Sign-in is rate limited: one sign-in for the file.
  await signInAs(page, "owner", "/overview");
});

afterAll(async () => {
  await context?.close();
});

type ChartReport = {
  title: string;
  empty: boolean;
  reading: string;
  axisLabels: string[];
  /** Text reaching past the drawing's box. */
  outside: string[];
  /** Pairs of labels whose boxes cover each other. */
  overlapping: string[];
};

const figures = () => page.locator("figure:has(> figcaption)");

/** Waits until every chart with data has drawn its svg (Plot draws after hydration, at the measured width). */
async function chartsDrawn(): Promise<void> {
  await expect
    .poll(() =>
      figures().evaluateAll(
        (all) =>
          all.filter(
            (f) =>
              f.querySelector("[data-chart-drawing]") &&
              !f.querySelector('[data-chart-drawing] svg g[aria-label$="axis tick label"], [data-chart-drawing] svg g[aria-label$="axis label"]'),
          ).length,
      ),
    )
    .toBe(0);
}

async function chartReports(): Promise<ChartReport[]> {
  return figures().evaluateAll((all) =>
    all.map((figure) => {
      const title = figure.querySelector("figcaption span")?.textContent?.trim() ?? "";
      const empty = figure.querySelector("[data-chart-empty]") !== null;
      const reading = figure.querySelector("[data-chart-reading]")?.textContent?.trim() ?? "";
      const svgs = [...figure.querySelectorAll("[data-chart-drawing] svg")].filter((s) =>
        s.querySelector('g[aria-label$="axis tick label"], g[aria-label$="axis label"]'),
      );
      const axisLabels = svgs.flatMap((s) => [...s.querySelectorAll('g[aria-label$="axis label"] text')].map((t) => t.textContent ?? ""));
      const outside: string[] = [];
      const overlapping: string[] = [];
      for (const svg of svgs) {
        const box = svg.getBoundingClientRect();
        const texts = [...svg.querySelectorAll("text")]
          .filter((t) => !t.closest('g[aria-label="tip"]'))
          .map((t) => ({ text: t.textContent ?? "", r: t.getBoundingClientRect() }))
          .filter((t) => t.r.width > 0 && t.text.trim() !== "");
        for (const t of texts) {
          if (t.r.left < box.left - 0.5 || t.r.right > box.right + 0.5 || t.r.top < box.top - 0.5 || t.r.bottom > box.bottom + 0.5) outside.push(t.text);
        }
        // Text boxes include the font's line gap; a pixel of touching is not covering.
        for (let i = 0; i < texts.length; i++) {
          for (let j = i + 1; j < texts.length; j++) {
            const a = texts[i]!.r;
            const b = texts[j]!.r;
            const across = Math.min(a.right, b.right) - Math.max(a.left, b.left);
            const down = Math.min(a.bottom, b.bottom) - Math.max(a.top, b.top);
            if (across > 1 && down > 2) overlapping.push(`${texts[i]!.text} / ${texts[j]!.text}`);
          }
        }
      }
      return { title, empty, reading, axisLabels, outside, overlapping };
    }),
  );
}

type Tip = { chart: string; text: string; left: number; right: number; svgLeft: number; svgRight: number };

/** Taps the middle of the first mark (dot or bar) with a size of the chart at `index`, and returns the tip that appears; null for a chart without such a mark. */
async function tapFirstMark(index: number): Promise<Tip | null> {
  const figure = figures().nth(index);
  const target = await figure.evaluate((f) => {
    for (const mark of f.querySelectorAll('[data-chart-drawing] svg g[aria-label="dot"] > *, [data-chart-drawing] svg g[aria-label="bar"] > *')) {
      const r = mark.getBoundingClientRect();
      if (r.width < 2 || r.height < 2) continue;
      mark.scrollIntoView({ block: "center" });
      const at = mark.getBoundingClientRect();
      mark.closest("svg")!.setAttribute("data-tapped", "");
      return { x: at.left + at.width / 2, y: at.top + at.height / 2 };
    }
    return null;
  });
  if (!target) return null;
  await page.touchscreen.tap(target.x, target.y);
  const svg = figure.locator("svg[data-tapped]");
  const shownTip = () =>
    svg.evaluate((s) => {
      // Plot keeps a tip hidden until it has measured it, then shows it.
      const tip = [...s.querySelectorAll('g[aria-label="tip"]')].find((g) => g.childElementCount > 0 && g.getAttribute("visibility") !== "hidden");
      if (!tip) return null;
      const box = tip.firstElementChild!.getBoundingClientRect();
      const frame = s.getBoundingClientRect();
      const chart = s.closest("figure:has(> figcaption)")?.querySelector("figcaption span")?.textContent ?? "";
      return { chart, text: tip.textContent ?? "", left: box.left, right: box.right, svgLeft: frame.left, svgRight: frame.right };
    });
  await expect.poll(shownTip).not.toBeNull();
  return shownTip();
}

async function firstPoolPath(): Promise<string> {
  await page.goto(`${BROWSER_TEST_URL}/pools`);
  const href = await page.getByRole("table", { name: "Pools" }).locator("tbody a").first().getAttribute("href");
  if (!href?.startsWith("/pools/")) throw new Error("the pool list shows no pool");
  return href;
}

const PAGES: Array<{ name: string; path: () => Promise<string>; openDetails?: boolean }> = [
  { name: "overview", path: async () => "/overview" },
  { name: "risk", path: async () => "/risk?grouping=fill-source&metal=iron" },
  { name: "recurring", path: async () => "/recurring" },
  { name: "outcomes", path: async () => "/outcomes?metal=iron" },
  { name: "source health", path: async () => "/sources/health", openDetails: true },
  { name: "pool page", path: firstPoolPath },
];

describe(`charts on a ${WIDTH} px touch screen`, () => {
  it.each(PAGES)("$name: each chart asks its question, labels its axes, says its result and fits; a tap shows a tip", async ({ path, openDetails }) => {
    await page.goto(`${BROWSER_TEST_URL}${await path()}`);
    await figures().first().waitFor({ state: "attached" });
    if (openDetails) {
      // Each source's details, charts included, are on demand: open them all.
      await page.locator("details").evaluateAll((all) => all.forEach((d) => ((d as HTMLDetailsElement).open = true)));
    }
    await chartsDrawn();

    const reports = await chartReports();
    const drawn = reports.filter((r) => !r.empty);
    expect(drawn.length).toBeGreaterThan(0);
    for (const chart of reports) {
      expect(chart.title, "a title phrased as a question").toMatch(/\?/);
    }
    for (const chart of drawn) {
      expect({ title: chart.title, reading: chart.reading.length > 0 }).toEqual({ title: chart.title, reading: true });
      expect(chart.axisLabels.length, `axis labels of "${chart.title}"`).toBeGreaterThan(0);
      expect({ title: chart.title, outside: chart.outside, overlapping: chart.overlapping }).toEqual({ title: chart.title, outside: [], overlapping: [] });
    }

    // Every drawn chart: a tap on a mark shows its tip, whole, on screen and inside the drawing.
    const tips: Tip[] = [];
    const count = await figures().count();
    for (let i = 0; i < count; i++) {
      if (reports[i]!.empty) continue;
      const tip = await tapFirstMark(i);
      if (tip) tips.push(tip);
    }
    expect(tips.length).toBeGreaterThan(0);
    for (const tip of tips) {
      expect(tip.text.trim().length, `tip text of "${tip.chart}"`).toBeGreaterThan(0);
      const within = { left: Math.max(0, tip.svgLeft) - 0.5, right: Math.min(WIDTH, tip.svgRight) + 0.5 };
      expect({ chart: tip.chart, inside: tip.left >= within.left && tip.right <= within.right }).toEqual({ chart: tip.chart, inside: true });
    }
  });
});
