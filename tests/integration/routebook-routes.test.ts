import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { db, closeDatabase } from "~/.server/db/client";
import { routes, routeTechnicians } from "~/.server/db/schema";
import * as routeEdit from "~/routes/routes.$routeId.edit";
import * as routeList from "~/routes/routes";
import * as routeNew from "~/routes/routes.new";
import { createCompany, createRoute, requestAs } from "../fixtures/company";
import { fieldErrors, postForm } from "../fixtures/forms";
import { routeBookPerFile } from "../fixtures/route-book";
import { callRoute } from "../fixtures/route-call";

const book = routeBookPerFile({
  routes: { alpha: "Alpha loop", beta: { name: "Beta loop", weekdays: "2" } },
  members: {
    owner: "owner",
    manager: "manager",
    technician: { role: "technician", routes: ["alpha"] },
    otherTechnician: "technician",
    analyst: "analyst",
  },
});
const { owner, manager, technician, otherTechnician, analyst } = book.member;
let otherCompanyRoute: number;

beforeAll(async () => {
  otherCompanyRoute = await createRoute(await createCompany(), "Elsewhere loop", "1");
});

afterAll(closeDatabase);

async function routeNamed(name: string) {
  return db().select().from(routes).where(and(eq(routes.companyId, book.companyId), eq(routes.name, name)));
}

describe("creating a route", () => {
  it("stores the route with its days and technicians", async () => {
    const outcome = await postForm(routeNew.action, manager, "/routes/new", {
      name: "Gamma loop",
      serviceWeekdays: ["5", "2"],
      technicianIds: [technician.userId, otherTechnician.userId],
    });
    expect(outcome).toMatchObject({ status: 302, location: "/routes" });
    const [stored] = await routeNamed("Gamma loop");
    // Days are stored sorted: 2 (Tuesday), 5 (Friday).
    expect(stored?.serviceWeekdays).toBe("2,5");
    const assigned = await db().select().from(routeTechnicians).where(eq(routeTechnicians.routeId, stored!.id));
    expect(assigned.map((a) => a.userId).sort()).toEqual([technician.userId, otherTechnician.userId].sort());
  });

  it("refuses a route without a service day, naming the field", async () => {
    const outcome = await postForm(routeNew.action, manager, "/routes/new", { name: "Delta loop" });
    expect(outcome.status).toBe(400);
    expect(fieldErrors(outcome).serviceWeekdays).toMatch(/Service days: choose at least one weekday/);
    expect(await routeNamed("Delta loop")).toHaveLength(0);
  });

  it("refuses a weekday that does not exist, naming the value", async () => {
    const outcome = await postForm(routeNew.action, manager, "/routes/new", { name: "Delta loop", serviceWeekdays: "8" });
    expect(fieldErrors(outcome).serviceWeekdays).toContain('"8" is not a weekday');
  });

  it("refuses a technician of another company", async () => {
    const outcome = await postForm(routeNew.action, owner, "/routes/new", {
      name: "Epsilon loop",
      serviceWeekdays: "3",
      technicianIds: "not-a-member",
    });
    expect(outcome.status).toBe(400);
    expect(fieldErrors(outcome).technicianIds).toContain('"not-a-member" is not a technician of this company');
    expect(await routeNamed("Epsilon loop")).toHaveLength(0);
  });

  it("stores a double submit once and names the field on the second", async () => {
    const form = { name: "Zeta loop", serviceWeekdays: "4" };
    const first = await postForm(routeNew.action, manager, "/routes/new", form);
    const second = await postForm(routeNew.action, manager, "/routes/new", form);
    expect(first.status).toBe(302);
    expect(second.status).toBe(409);
    expect(fieldErrors(second).name).toContain('"Zeta loop" is already used');
    expect(await routeNamed("Zeta loop")).toHaveLength(1);
  });

  it("is refused to technicians and analysts", async () => {
    for (const member of [technician, analyst]) {
      const outcome = await postForm(routeNew.action, member, "/routes/new", { name: "Eta loop", serviceWeekdays: "1" });
      expect(outcome.status).toBe(403);
    }
    expect(await routeNamed("Eta loop")).toHaveLength(0);
  });
});

describe("changing a route", () => {
  it("renames it and replaces its technicians", async () => {
    const outcome = await postForm(
      routeEdit.action,
      owner,
      `/routes/${book.route.alpha}/edit`,
      { name: "Alpha loop renamed", serviceWeekdays: ["1", "4"], technicianIds: otherTechnician.userId, active: "on" },
      { routeId: String(book.route.alpha) },
    );
    expect(outcome.status).toBe(302);
    const [stored] = await routeNamed("Alpha loop renamed");
    expect(stored?.serviceWeekdays).toBe("1,4");
    const assigned = await db().select().from(routeTechnicians).where(eq(routeTechnicians.routeId, book.route.alpha));
    expect(assigned.map((a) => a.userId)).toEqual([otherTechnician.userId]);
    // Put the first technician back for the listing test below.
    await db().insert(routeTechnicians).values({ routeId: book.route.alpha, userId: technician.userId });
  });

  it("answers 404 for another company's route, and changes nothing there", async () => {
    const params = { routeId: String(otherCompanyRoute) };
    const page = await callRoute(routeEdit.loader, requestAs(owner, `/routes/${otherCompanyRoute}/edit`), params);
    expect(page.status).toBe(404);
    const outcome = await postForm(routeEdit.action, owner, `/routes/${otherCompanyRoute}/edit`, { name: "Taken over", serviceWeekdays: "1" }, params);
    expect(outcome.status).toBe(404);
    const [untouched] = await db().select().from(routes).where(eq(routes.id, otherCompanyRoute));
    expect(untouched?.name).toBe("Elsewhere loop");
  });
});

describe("the route list", () => {
  it("shows a technician only their own routes", async () => {
    const outcome = await callRoute(routeList.loader, requestAs(technician, "/routes"));
    const body = outcome.body as { rows: Array<{ id: number }>; total: number };
    // Their routes: Alpha (given at the start, put back above) and Gamma (assigned on creation); not Beta or Zeta.
    const [gamma] = await routeNamed("Gamma loop");
    expect(body.rows.map((r) => r.id)).toEqual([book.route.alpha, gamma!.id]);
  });

  it("sorts by name both ways and searches", async () => {
    const ascending = (await callRoute(routeList.loader, requestAs(manager, "/routes?sort=name&dir=asc"))).body as { rows: Array<{ name: string }> };
    const descending = (await callRoute(routeList.loader, requestAs(manager, "/routes?sort=name&dir=desc"))).body as { rows: Array<{ name: string }> };
    expect(ascending.rows.map((r) => r.name)).toEqual(descending.rows.map((r) => r.name).reverse());
    const found = (await callRoute(routeList.loader, requestAs(manager, "/routes?q=zeta"))).body as { rows: Array<{ name: string }>; total: number };
    expect(found.rows.map((r) => r.name)).toEqual(["Zeta loop"]);
  });
});
