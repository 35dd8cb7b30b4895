import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { closeDatabase, db } from "~/.server/db/client";
import { routes } from "~/.server/db/schema";
import * as apiPool from "~/routes/api.pools.$poolId";
import * as apiSummary from "~/routes/api.summary";
import * as home from "~/routes/_index";
import * as poolPage from "~/routes/pools.$poolId";
import * as settings from "~/routes/settings";
import * as signIn from "~/routes/sign-in";
import * as team from "~/routes/team";
import { addTest, createCompany, createMember, createRouteWithPool, type FixtureMember, requestAs } from "../fixtures/company";
import { routeBookPerFile } from "../fixtures/route-book";
import { callRoute } from "../fixtures/route-call";

const book = routeBookPerFile({
  routes: { monday: "Monday loop", tuesday: { name: "Tuesday loop", weekdays: "2" } },
  pools: { onOwnRoute: { route: "monday", accountCode: "G-1" }, onOtherRoute: { route: "tuesday", accountCode: "G-2" } },
  members: { owner: "owner", manager: "manager", technician: { role: "technician", routes: ["monday"] }, analyst: "analyst" },
});
const { owner, manager, technician, analyst } = book.member;
let otherOwner: FixtureMember;
let poolOfOtherCompany: number;

beforeAll(async () => {
  const { companyId, pool } = book;
  // Pool G-1: copper 0.40 opens a case (>= 0.3), 0.20 is not below 0.1, so it stays open.
  await addTest(companyId, pool.onOwnRoute, "2026-01-05T09:00:00Z", { copper: 0.4, ph: 7.4 });
  await addTest(companyId, pool.onOwnRoute, "2026-01-12T09:00:00Z", { copper: 0.2, ph: 7.5 });
  // Pool G-2: iron 0.30 opens (>= 0.2), 0.05 is below 0.1 and closes it.
  await addTest(companyId, pool.onOtherRoute, "2026-01-06T09:00:00Z", { iron: 0.3 });
  await addTest(companyId, pool.onOtherRoute, "2026-01-13T09:00:00Z", { iron: 0.05 });

  const otherCompany = await createCompany();
  poolOfOtherCompany = (await createRouteWithPool(otherCompany, "Elsewhere", "X-1")).poolId;
  await addTest(otherCompany, poolOfOtherCompany, "2026-01-05T09:00:00Z", { copper: 0.9 });
  otherOwner = await createMember(otherCompany, "owner");
});

afterAll(closeDatabase);

describe("signed-out visitors", () => {
  it("are sent to sign-in from pages, keeping where they were going", async () => {
    const outcome = await callRoute(poolPage.loader, requestAs(null, "/pools/1"), { poolId: "1" });
    expect(outcome.status).toBe(302);
    expect(outcome.location).toBe("/sign-in?next=%2Fpools%2F1");
  });

  it("get a 401 in the API's error shape", async () => {
    const outcome = await callRoute(apiSummary.loader, requestAs(null, "/api/summary"));
    expect(outcome.status).toBe(401);
    expect(outcome.body).toEqual({ error: { code: "unauthenticated", message: "Sign in to continue." } });
  });
});

describe("sign-in form", () => {
  it("names the field when the e-mail is not an address", async () => {
    const body = new URLSearchParams({ email: "not-an-address", password: "x" });
    const outcome = await callRoute(signIn.action, requestAs(null, "/sign-in", { method: "POST", body }));
    expect(outcome.status).toBe(400);
    expect(outcome.body).toMatchObject({ fieldErrors: { email: expect.stringContaining("e-mail") } });
  });

  it("refuses a wrong password without saying which part was wrong", async () => {
    const body = new URLSearchParams({ email: owner.email, password: "wrong-password-123" });
    const outcome = await callRoute(signIn.action, requestAs(null, "/sign-in", { method: "POST", body }));
    expect(outcome.status).toBe(401);
    expect(outcome.body).toMatchObject({ formError: "That e-mail and password do not match an account." });
  });

  it("signs in with the right password and redirects to the page asked for", async () => {
    const body = new URLSearchParams({ email: owner.email, password: "fixture-password-0001", next: "/team" });
    const outcome = await callRoute(signIn.action, requestAs(null, "/sign-in", { method: "POST", body }));
    expect(outcome.status).toBe(302);
    expect(outcome.location).toBe("/team");
  });
});

describe("roles", () => {
  const pages = { home, team, settings } as const;
  const expected: Record<string, Record<keyof typeof pages, number>> = {
    owner: { home: 200, team: 200, settings: 200 },
    manager: { home: 200, team: 403, settings: 403 },
    technician: { home: 200, team: 403, settings: 403 },
    analyst: { home: 200, team: 403, settings: 403 },
  };

  for (const role of Object.keys(expected)) {
    it(`${role} opens exactly the pages of the role`, async () => {
      const member = { owner, manager, technician, analyst }[role]!;
      for (const [name, module] of Object.entries(pages)) {
        const outcome = await callRoute(module.loader, requestAs(member, `/${name}`));
        expect({ page: name, status: outcome.status }).toEqual({
          page: name,
          status: expected[role]![name as keyof typeof pages],
        });
      }
    });
  }

  it("explains a refusal in words", async () => {
    const outcome = await callRoute(settings.loader, requestAs(analyst, "/settings"));
    expect(outcome.body).toBe("This part of Patina is for owner; you are signed in as analyst.");
  });
});

describe("technicians see only their routes' pools", () => {
  it("opens a pool on their own route, by page and by API", async () => {
    const page = await callRoute(poolPage.loader, requestAs(technician, `/pools/${book.pool.onOwnRoute}`), {
      poolId: String(book.pool.onOwnRoute),
    });
    expect(page.status).toBe(200);
    const api = await callRoute(apiPool.loader, requestAs(technician, `/api/pools/${book.pool.onOwnRoute}`), {
      poolId: String(book.pool.onOwnRoute),
    });
    expect(api.status).toBe(200);
    expect(api.body).toMatchObject({ pool: { accountCode: "G-1" } });
  });

  it("cannot read a pool on another route, by page or by API", async () => {
    const params = { poolId: String(book.pool.onOtherRoute) };
    const page = await callRoute(poolPage.loader, requestAs(technician, `/pools/${book.pool.onOtherRoute}`), params);
    expect(page.status).toBe(404);
    const api = await callRoute(apiPool.loader, requestAs(technician, `/api/pools/${book.pool.onOtherRoute}`), params);
    expect(api.status).toBe(404);
    expect(api.body).toMatchObject({ error: { code: "not_found" } });
  });

  it("counts only their routes' pools on the home page", async () => {
    const outcome = await callRoute(home.loader, requestAs(technician, "/"));
    const summary = (outcome.body as Awaited<ReturnType<typeof home.loader>>).summary;
    // One pool (G-1) with 2 tests; its copper case is open.
    expect(summary.pools).toBe(1);
    expect(summary.tests).toBe(2);
    expect(summary.openCasesByMetal).toEqual({ copper: 1, iron: 0, manganese: 0 });
  });
});

describe("companies never see each other", () => {
  it("an owner cannot open another company's pool", async () => {
    const params = { poolId: String(poolOfOtherCompany) };
    expect((await callRoute(poolPage.loader, requestAs(owner, "/pools/x"), params)).status).toBe(404);
    expect((await callRoute(apiPool.loader, requestAs(owner, "/api/pools/x"), params)).status).toBe(404);
  });

  it("the company summary counts only its own pools and cases", async () => {
    const outcome = await callRoute(apiSummary.loader, requestAs(owner, "/api/summary"));
    // Two pools, four tests; G-1 copper open (0.20 is not below 0.1), G-2 iron closed by 0.05.
    expect(outcome.body).toMatchObject({
      pools: 2,
      tests: 4,
      openCasesByMetal: { copper: 1, iron: 0, manganese: 0 },
      openCases: [{ poolId: book.pool.onOwnRoute, metal: "copper", lastElevatedValue: 0.4 }],
    });
    const other = await callRoute(apiSummary.loader, requestAs(otherOwner, "/api/summary"));
    expect(other.body).toMatchObject({ pools: 1, tests: 1, openCasesByMetal: { copper: 1 } });
  });
});

describe("API parameters", () => {
  it("names the parameter that is wrong", async () => {
    const outcome = await callRoute(apiPool.loader, requestAs(owner, "/api/pools/abc"), { poolId: "abc" });
    expect(outcome.status).toBe(400);
    expect(outcome.body).toMatchObject({ error: { code: "invalid_parameter", field: "poolId" } });
  });
});

describe("the home page's route count", () => {
  it("counts routes in use only: archiving the Tuesday loop leaves the owner one route", async () => {
    const before = await callRoute(apiSummary.loader, requestAs(owner, "/api/summary"));
    expect(before.body).toMatchObject({ routes: 2 });
    await db().update(routes).set({ active: false }).where(eq(routes.id, book.route.tuesday));
    const after = await callRoute(apiSummary.loader, requestAs(owner, "/api/summary"));
    expect(after.body).toMatchObject({ routes: 1 });
    // The technician works the Monday loop only.
    const technicians = await callRoute(apiSummary.loader, requestAs(technician, "/api/summary"));
    expect(technicians.body).toMatchObject({ routes: 1 });
  });
});
