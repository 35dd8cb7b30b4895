/**
 * Takes the chart screens under tests/screens/ at 1280 and 390 px from a
 * running Patina with the demo company:
 *   PATINA_SCREENS_URL=http://localhost:3000 npx tsx tests/screens/take-screens.ts
 * Each screen is the named charts of one page, drawn and with their readings.
 */
import { fileURLToPath } from "node:url";
import { chromium, type Page } from "playwright-core";
import { demoEmail, demoMember, submitSignIn } from "../fixtures/sign-in";

const BASE = process.env.PATINA_SCREENS_URL ?? "http://localhost:3000";
const OUT = fileURLToPath(new URL(".", import.meta.url));
const WIDTHS = [1280, 390] as const;

type Screen = { name: string; path: string | ((page: Page) => Promise<string>); charts: string[] };

/** The first pool the recurring page lists: a pool with metal episodes to show. */
async function recurringPoolPath(page: Page): Promise<string> {
  await page.goto(`${BASE}/recurring`);
  const href = await page.getByRole("link", { name: /^Open / }).first().getAttribute("href");
  if (!href) throw new Error("the recurring page lists no pool");
  return href;
}

const SCREENS: Screen[] = [
  { name: "overview-readings", path: "/overview", charts: ["Open metal episodes, by metal", "Share of pools by saturation index"] },
  { name: "overview-trend", path: "/overview", charts: ["Share of metal tests at or above the elevated level, per month"] },
  { name: "risk-groups", path: "/risk?grouping=fill-source&metal=iron", charts: ["Metal episodes per pool-year"] },
  { name: "recurring-chart", path: "/recurring", charts: ["Did the metal come back at"] },
  { name: "outcomes-charts", path: "/outcomes?metal=iron", charts: ["Time to clear", "Median fall at the first follow-up"] },
  { name: "source-fill-water", path: "/sources/health", charts: ["Metals in the fill water of Quarry Heights shared well"] },
  { name: "pool-episodes", path: recurringPoolPath, charts: ["Metal episodes from opening to close"] },
  { name: "pool-metals", path: recurringPoolPath, charts: ["Dissolved metals at each test"] },
  { name: "pool-balance", path: recurringPoolPath, charts: ["pH at each test", "Saturation index at each test"] },
];

async function signIn(page: Page) {
  const owner = demoMember("owner");
  await page.goto(`${BASE}/sign-in`);
  await submitSignIn(page, demoEmail(owner), owner.password);
  await page.waitForURL((url) => url.pathname !== "/sign-in");
}

const browser = await chromium.launch({
  executablePath: process.env.PATINA_CHROMIUM ?? "/usr/bin/chromium",
  headless: true,
  args: ["--no-sandbox", "--disable-gpu", "--no-first-run", "--disable-background-networking"],
});
try {
  for (const width of WIDTHS) {
    const context = await browser.newContext({ viewport: { width, height: 900 }, hasTouch: width < 600 });
    const page = await context.newPage();
    await signIn(page);
    for (const screen of SCREENS) {
      await page.goto(`${BASE}${typeof screen.path === "string" ? screen.path : await screen.path(page)}`);
      const figures = screen.charts.map((title) => page.locator("figure", { has: page.locator("figcaption", { hasText: title }) }).first());
      // The page's data query settles first (it may redraw a chart), then every chart is drawn.
      await page.waitForLoadState("networkidle");
      for (const figure of figures) await figure.locator("[data-chart-drawing] svg").first().waitFor();
      await figures[0]!.scrollIntoViewIfNeeded();
      await page.waitForTimeout(500);
      for (const figure of figures) await figure.locator("[data-chart-drawing] svg").first().waitFor();
      // One picture around the named charts, in page coordinates.
      const boxes = await Promise.all(
        figures.map((f) =>
          f.evaluate((e) => {
            const r = e.getBoundingClientRect();
            return { left: r.left + window.scrollX, top: r.top + window.scrollY, right: r.right + window.scrollX, bottom: r.bottom + window.scrollY };
          }),
        ),
      );
      const clip = boxes.reduce((a, b) => ({
        left: Math.min(a.left, b.left),
        top: Math.min(a.top, b.top),
        right: Math.max(a.right, b.right),
        bottom: Math.max(a.bottom, b.bottom),
      }));
      const file = `${OUT}${screen.name}-${width}.png`;
      await page.screenshot({ path: file, fullPage: true, clip: { x: clip.left, y: clip.top, width: clip.right - clip.left, height: clip.bottom - clip.top } });
      console.log(`[screens] ${file}`);
    }
    await context.close();
  }
} finally {
  await browser.close();
}
