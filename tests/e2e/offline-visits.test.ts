import mysql from "mysql2/promise";
import type { BrowserContext, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { ROUTES } from "../../drizzle/seed/names";
import { browserPerFile, phoneContext } from "../fixtures/browser";
import { TEST_DATABASE_URL } from "../fixtures/database";
import { BROWSER_TEST_URL } from "../fixtures/server";
import { signInAs } from "../fixtures/sign-in";

const browser = browserPerFile();
let db: mysql.Connection;

// The demo technician's first route is served on two weekdays; for these tests it is served every
// day, so the visit list has pools whatever day the tests run. Put back afterwards.
const ROUTE_NAME = ROUTES.find((r) => r.key === "north")!.name;
let servedOn = "";

beforeAll(async () => {
  db = await mysql.createConnection({ uri: TEST_DATABASE_URL });
  const [rows] = (await db.query("SELECT service_weekdays AS days FROM routes WHERE name = ?", [ROUTE_NAME])) as unknown as [Array<{ days: string }>];
  servedOn = rows[0]!.days;
  await db.query("UPDATE routes SET service_weekdays = '1,2,3,4,5,6,7' WHERE name = ?", [ROUTE_NAME]);
});

afterAll(async () => {
  await db.query("UPDATE routes SET service_weekdays = ? WHERE name = ?", [servedOn, ROUTE_NAME]);
  await db.end();
});

type StoredTest = { poolId: number; ph: number | null; freeChlorine: number | null; sampledAt: Date };

/** Every water test stored under a submission key, straight from MariaDB. */
async function storedUnder(key: string): Promise<StoredTest[]> {
  const [rows] = (await db.query(
    "SELECT pool_id AS poolId, CAST(ph AS DOUBLE) AS ph, CAST(free_chlorine AS DOUBLE) AS freeChlorine, sampled_at AS sampledAt FROM water_tests WHERE submission_key = ?",
    [key],
  )) as unknown as [StoredTest[]];
  return rows;
}

/** Signs the technician in on the visit list and waits until the list and its pools' forms are kept on the phone. */
async function openRouteReadyForNoSignal(context: BrowserContext): Promise<Page> {
  const page = await context.newPage();
  await signInAs(page, "tech1", "/visit");
  await page.getByRole("heading", { level: 1, name: "Log a visit" }).waitFor();
  await page.locator('[data-kept-pages="all"]').waitFor({ timeout: 120_000 });
  await page.waitForFunction(() => navigator.serviceWorker.controller !== null);
  return page;
}

const stops = (page: Page) => page.locator('section[aria-labelledby="today"] li a');

/** Opens the n-th pool of today's list and returns its id and street. */
async function openStop(page: Page, n: number): Promise<{ poolId: number; street: string }> {
  const link = stops(page).nth(n);
  const href = (await link.getAttribute("href"))!;
  const street = await link.locator("span").first().innerText();
  await link.click();
  await page.getByRole("heading", { level: 1, name: street }).waitFor();
  await page.locator('form[data-live="on"]').waitFor();
  return { poolId: Number(href.split("/").at(-1)), street };
}

async function typeVisit(page: Page, readings: { ph: string; freeChlorine: string }) {
  await page.locator('input[name="ph"]').fill(readings.ph);
  await page.locator('input[name="freeChlorine"]').fill(readings.freeChlorine);
}

/** The kept visit shown for a street on the list: its submission key, once it shows the given state. */
async function keptVisitKey(page: Page, street: string, state: string): Promise<string> {
  const line = page.locator("li[data-kept-visit]").filter({ hasText: street }).filter({ hasText: state });
  await line.waitFor();
  return (await line.getAttribute("data-kept-visit"))!;
}

const keptSection = (page: Page) => page.getByRole("heading", { name: /^Kept on this phone/ });

describe("visits saved without signal", () => {
  it("are kept on the phone through a reload and stored once each, with their readings, when the signal returns", async () => {
    const context = await phoneContext(browser());
    const page = await openRouteReadyForNoSignal(context);
    expect(await stops(page).count()).toBeGreaterThanOrEqual(3);

    await context.setOffline(true);
    // The worker itself has no network now: a form that was never kept cannot be fetched.
    expect(await page.evaluate(() => fetch("/visit/999999.data").then((r) => `status ${r.status}`, () => "failed"))).toBe("failed");
    await page.getByRole("status").filter({ hasText: "No signal." }).waitFor();

    const first = await openStop(page, 0);
    await typeVisit(page, { ph: "7.1", freeChlorine: "1.6" });
    await page.getByRole("button", { name: "Save visit" }).click();
    await page.getByRole("heading", { level: 1, name: "Log a visit" }).waitFor();
    const firstKey = await keptVisitKey(page, first.street, "Waiting for signal");

    const second = await openStop(page, 1);
    await typeVisit(page, { ph: "7.6", freeChlorine: "2.4" });
    await page.getByRole("button", { name: "Save visit" }).click();
    const secondKey = await keptVisitKey(page, second.street, "Waiting for signal");
    expect(secondKey).not.toBe(firstKey);
    expect(await storedUnder(firstKey)).toEqual([]);
    expect(await storedUnder(secondKey)).toEqual([]);

    // Reloaded without signal: the list comes from the phone, and so do both visits.
    await page.reload();
    await page.getByRole("heading", { level: 1, name: "Log a visit" }).waitFor();
    await keptVisitKey(page, first.street, "Waiting for signal");
    await keptVisitKey(page, second.street, "Waiting for signal");
    const backOnline = new Date();

    await context.setOffline(false);
    await keptSection(page).waitFor({ state: "detached", timeout: 60_000 });
    const [storedFirst, storedSecond] = [await storedUnder(firstKey), await storedUnder(secondKey)];
    expect(storedFirst).toHaveLength(1);
    expect(storedSecond).toHaveLength(1);
    expect(storedFirst[0]).toMatchObject({ poolId: first.poolId, ph: 7.1, freeChlorine: 1.6 });
    expect(storedSecond[0]).toMatchObject({ poolId: second.poolId, ph: 7.6, freeChlorine: 2.4 });
    // Stored at the time each was saved on the phone, before the signal returned.
    expect(storedFirst[0]!.sampledAt.getTime()).toBeLessThan(backOnline.getTime());
    expect(storedSecond[0]!.sampledAt.getTime()).toBeLessThan(backOnline.getTime());
    await context.close();
  }, 240_000);

  it("stores a visit once when its first save reached the server but the answer was lost, and it was sent again", async () => {
    const context = await phoneContext(browser());
    const page = await openRouteReadyForNoSignal(context);
    const pool = await openStop(page, 2);
    await typeVisit(page, { ph: "7.3", freeChlorine: "3.1" });

    // The save reaches the server, then the signal drops before the answer arrives.
    await context.route(`**/visit/${pool.poolId}.data`, async (route) => {
      if (route.request().method() !== "POST") return route.fallback();
      await route.fetch();
      await context.setOffline(true);
      await route.abort("internetdisconnected");
    });
    await page.getByRole("button", { name: "Save visit" }).click();
    await page.getByRole("heading", { level: 1, name: "Log a visit" }).waitFor();
    const key = await keptVisitKey(page, pool.street, "Waiting for signal");
    await context.unrouteAll();
    expect(await storedUnder(key)).toHaveLength(1);

    // The signal flickers: each return sends the kept visit again.
    for (let i = 0; i < 3; i++) {
      await context.setOffline(false);
      await page.waitForTimeout(150);
      await context.setOffline(true);
    }
    await context.setOffline(false);
    await keptSection(page).waitFor({ state: "detached", timeout: 60_000 });
    const stored = await storedUnder(key);
    expect(stored).toHaveLength(1);
    expect(stored[0]).toMatchObject({ poolId: pool.poolId, ph: 7.3, freeChlorine: 3.1 });
    await context.close();
  }, 240_000);

  it("sends a kept visit when the app is opened again with signal", async () => {
    const context = await phoneContext(browser());
    const page = await openRouteReadyForNoSignal(context);
    await context.setOffline(true);
    const pool = await openStop(page, 4);
    await typeVisit(page, { ph: "7.7", freeChlorine: "1.2" });
    await page.getByRole("button", { name: "Save visit" }).click();
    const key = await keptVisitKey(page, pool.street, "Waiting for signal");
    await page.close();

    // Signal is back while the app is closed; opening it sends what waited.
    await context.setOffline(false);
    const reopened = await context.newPage();
    await reopened.goto(`${BROWSER_TEST_URL}/visit`);
    await reopened.getByRole("heading", { level: 1, name: "Log a visit" }).waitFor();
    await expect.poll(() => storedUnder(key), { timeout: 60_000 }).toHaveLength(1);
    expect((await storedUnder(key))[0]).toMatchObject({ poolId: pool.poolId, ph: 7.7, freeChlorine: 1.2 });
    await keptSection(reopened).waitFor({ state: "detached" });
    await context.close();
  }, 240_000);

  it("brings a visit the server refused back to its form with the server's message, and stores it once fixed", async () => {
    const context = await phoneContext(browser());
    const page = await openRouteReadyForNoSignal(context);
    await context.setOffline(true);
    const pool = await openStop(page, 3);
    await typeVisit(page, { ph: "15", freeChlorine: "2.0" });
    await page.getByRole("button", { name: "Save visit" }).click();
    const key = await keptVisitKey(page, pool.street, "Waiting for signal");

    await context.setOffline(false);
    const refused = page.locator("li[data-kept-visit]").filter({ hasText: "Not stored: needs a fix" });
    await refused.waitFor({ timeout: 60_000 });
    expect(await refused.innerText()).toContain("Some entries need a look; nothing was saved.");
    expect(await storedUnder(key)).toEqual([]);

    await refused.getByRole("link", { name: "Fix and save again" }).click();
    await page.getByRole("heading", { level: 1, name: pool.street }).waitFor();
    await page.locator("#ph-error").waitFor();
    expect(await page.locator("#ph-error").innerText()).toBe("pH: 15 is above the highest accepted value, 14.");
    expect(await page.locator('input[name="freeChlorine"]').inputValue()).toBe("2.0");
    await page.locator('input[name="ph"]').fill("7.4");
    await page.getByRole("button", { name: "Save visit" }).click();
    await page.getByRole("status").filter({ hasText: "Visit saved." }).waitFor();

    const stored = await storedUnder(key);
    expect(stored).toHaveLength(1);
    expect(stored[0]).toMatchObject({ poolId: pool.poolId, ph: 7.4, freeChlorine: 2 });

    // Signing out forgets the kept pages: the next person on this phone does not see this route.
    expect(await page.evaluate(() => caches.has("patina-visit-pages"))).toBe(true);
    await page.getByRole("button", { name: "Sign out" }).click();
    await page.waitForURL((url) => url.pathname === "/sign-in");
    await expect.poll(() => page.evaluate(() => caches.has("patina-visit-pages"))).toBe(false);
    await context.close();
  }, 240_000);
});

describe("the installable app", () => {
  it("names its icons, drawn from Patina's mark, and opens on the visit list", async () => {
    const context = await phoneContext(browser());
    const page = await context.newPage();
    await signInAs(page, "tech1", "/visit");
    const href = await page.locator('link[rel="manifest"]').getAttribute("href");
    const manifest = (await (await page.request.get(new URL(href!, page.url()).href)).json()) as { start_url: string; display: string; icons: Array<{ src: string; sizes: string }> };
    expect(manifest).toMatchObject({ start_url: "/visit", display: "standalone" });
    for (const icon of manifest.icons) {
      const response = await page.request.get(new URL(icon.src, page.url()).href);
      expect(response.status(), icon.src).toBe(200);
    }
    expect(manifest.icons.map((i) => i.sizes)).toEqual(expect.arrayContaining(["192x192", "512x512"]));
    await context.close();
  });
});
