import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDatabase, db } from "~/.server/db/client";
import { fillSources, pools, routes } from "~/.server/db/schema";
import { type ArchivableOption, pickerOptions } from "~/lib/archived";
import * as poolEdit from "~/routes/pools.$poolId.edit";
import * as poolList from "~/routes/pools";
import * as routeEdit from "~/routes/routes.$routeId.edit";
import * as routeList from "~/routes/routes";
import * as sourceEdit from "~/routes/sources.$sourceId.edit";
import * as sourceList from "~/routes/sources";
import * as visitList from "~/routes/visit";
import { createCompany, createFillSource, createMember, createPool, createRoute, type FixtureMember, requestAs } from "../fixtures/company";
import { fieldErrors, postForm } from "../fixtures/forms";
import { callRoute, type RouteFunction } from "../fixtures/route-call";

let companyId: number;
let manager: FixtureMember;
let technician: FixtureMember;
let analyst: FixtureMember;
let everyDay: number;
let spareRoute: number;
let otherCompanyRoute: number;
let well: number;
let otherCompanySource: number;
let poolOnEveryDay: number;
let poolOnSpare: number;

const EVERY_WEEKDAY = "1,2,3,4,5,6,7";

beforeAll(async () => {
  companyId = await createCompany();
  // Both routes are served every weekday, so "today" always lists their pools while they are in use.
  everyDay = await createRoute(companyId, "Daily loop", EVERY_WEEKDAY);
  spareRoute = await createRoute(companyId, "Spare loop", EVERY_WEEKDAY);
  well = await createFillSource(companyId, "Hollow well", "shared_well");
  poolOnEveryDay = await createPool(companyId, { routeId: everyDay, accountCode: "A-1", fillSourceId: well });
  poolOnSpare = await createPool(companyId, { routeId: spareRoute, accountCode: "A-2" });
  manager = await createMember(companyId, "manager");
  technician = await createMember(companyId, "technician", [everyDay, spareRoute]);
  analyst = await createMember(companyId, "analyst");
  const other = await createCompany();
  otherCompanyRoute = await createRoute(other, "Their loop", "1");
  otherCompanySource = await createFillSource(other, "Their well");
});

afterAll(closeDatabase);

// The route form sends the whole route: its days and technicians stay as they were.
const routeForm = (name: string, active: boolean) => ({
  name,
  serviceWeekdays: EVERY_WEEKDAY.split(","),
  technicianIds: technician.userId,
  ...(active ? { active: "on" } : {}),
});
const sourceForm = (name: string, active: boolean) => ({ name, kind: "shared_well", ...(active ? { active: "on" } : {}) });

const editRoute = (member: FixtureMember, routeId: number, fields: Record<string, string | string[]>) =>
  postForm(routeEdit.action, member, `/routes/${routeId}/edit`, fields, { routeId: String(routeId) });
const editSource = (member: FixtureMember, sourceId: number, fields: Record<string, string>) =>
  postForm(sourceEdit.action, member, `/sources/${sourceId}/edit`, fields, { sourceId: String(sourceId) });

async function routeRow(id: number) {
  return (await db().select().from(routes).where(eq(routes.id, id)))[0];
}
async function sourceRow(id: number) {
  return (await db().select().from(fillSources).where(eq(fillSources.id, id)))[0];
}
async function dayList(member: FixtureMember) {
  return (await callRoute(visitList.loader, requestAs(member, "/visit"))).body as { stops: Array<{ poolId: number }> };
}
async function listed<T>(loader: RouteFunction, member: FixtureMember, path: string) {
  return ((await callRoute(loader, requestAs(member, path))).body as { rows: T[] }).rows;
}

describe("archiving a route", () => {
  it("keeps the route and its pools, takes it off today's visit list and out of the pool form's picker", async () => {
    expect((await dayList(technician)).stops.map((s) => s.poolId).sort()).toEqual([poolOnEveryDay, poolOnSpare].sort());

    const outcome = await editRoute(manager, spareRoute, routeForm("Spare loop", false));
    expect(outcome).toMatchObject({ status: 302, location: "/routes" });
    expect(await routeRow(spareRoute)).toMatchObject({ name: "Spare loop", active: false });
    // Nothing is deleted: the pool still points at the route.
    expect((await db().select().from(pools).where(eq(pools.id, poolOnSpare)))[0]?.routeId).toBe(spareRoute);

    expect((await dayList(technician)).stops.map((s) => s.poolId)).toEqual([poolOnEveryDay]);

    // The pool form of a pool on the daily route offers only routes in use.
    const form = (await callRoute(poolEdit.loader, requestAs(manager, `/pools/${poolOnEveryDay}/edit`), { poolId: String(poolOnEveryDay) }))
      .body as { routes: Array<{ id: number; active: boolean }> };
    expect(form.routes.find((r) => r.id === spareRoute)).toMatchObject({ active: false });
  });

  it("lists archived routes only under their filter, marked archived", async () => {
    type Row = { id: number; active: boolean };
    expect((await listed<Row>(routeList.loader, manager, "/routes")).map((r) => r.id)).toEqual([everyDay]);
    expect(await listed<Row>(routeList.loader, manager, "/routes?status=archived")).toMatchObject([{ id: spareRoute, active: false }]);
    expect((await listed<Row>(routeList.loader, manager, "/routes?status=all")).map((r) => r.id).sort()).toEqual([everyDay, spareRoute].sort());
  });

  it("refuses to put a pool on an archived route, naming the field and the route", async () => {
    const outcome = await postForm(
      poolEdit.action,
      manager,
      `/pools/${poolOnEveryDay}/edit`,
      { intent: "save-pool", accountCode: "A-1", customerName: "Customer A-1", street: "A-1 Test Lane", routeId: String(spareRoute), active: "on" },
      { poolId: String(poolOnEveryDay) },
    );
    expect(outcome.status).toBe(400);
    expect(fieldErrors(outcome).routeId).toBe('Route: "Spare loop" is archived; restore it on its page or choose another route.');
    expect((await db().select().from(pools).where(eq(pools.id, poolOnEveryDay)))[0]?.routeId).toBe(everyDay);
  });

  it("leaves the archived route out of the pool form's route picker, except on the pool already on it", async () => {
    const pickerOf = async (poolId: number) => {
      const page = (await callRoute(poolEdit.loader, requestAs(manager, `/pools/${poolId}/edit`), { poolId: String(poolId) })).body as {
        routes: ArchivableOption[];
      };
      return pickerOptions(page.routes, poolId === poolOnSpare ? spareRoute : everyDay).map((o) => o.label);
    };
    expect(await pickerOf(poolOnEveryDay)).toEqual(["Daily loop"]);
    expect(await pickerOf(poolOnSpare)).toEqual(["Daily loop", "Spare loop (archived)"]);
  });

  it("lets a pool already on an archived route be saved as it is", async () => {
    const outcome = await postForm(
      poolEdit.action,
      manager,
      `/pools/${poolOnSpare}/edit`,
      { intent: "save-pool", accountCode: "A-2", customerName: "Customer A-2 renamed", street: "A-2 Test Lane", routeId: String(spareRoute), active: "on" },
      { poolId: String(poolOnSpare) },
    );
    expect(outcome.status).toBe(302);
    expect((await db().select().from(pools).where(eq(pools.id, poolOnSpare)))[0]).toMatchObject({ customerName: "Customer A-2 renamed", routeId: spareRoute });
  });

  it("restores the route, and its pools come back to the day's list", async () => {
    const outcome = await editRoute(manager, spareRoute, routeForm("Spare loop", true));
    expect(outcome.status).toBe(302);
    expect((await routeRow(spareRoute))?.active).toBe(true);
    expect((await dayList(technician)).stops.map((s) => s.poolId).sort()).toEqual([poolOnEveryDay, poolOnSpare].sort());
  });

  it("is refused to technicians and analysts, and changes nothing", async () => {
    for (const member of [technician, analyst]) {
      expect((await editRoute(member, spareRoute, routeForm("Spare loop", false))).status).toBe(403);
    }
    expect((await routeRow(spareRoute))?.active).toBe(true);
  });

  it("answers 404 for another company's route and leaves it in use", async () => {
    expect((await editRoute(manager, otherCompanyRoute, routeForm("Their loop", false))).status).toBe(404);
    expect((await routeRow(otherCompanyRoute))?.active).toBe(true);
  });
});

describe("archiving a fill source", () => {
  it("keeps the source and the pools it feeds, and lists it only under the archived filter", async () => {
    const outcome = await editSource(manager, well, sourceForm("Hollow well", false));
    expect(outcome).toMatchObject({ status: 302, location: `/sources/${well}` });
    expect(await sourceRow(well)).toMatchObject({ name: "Hollow well", active: false });
    expect((await db().select().from(pools).where(eq(pools.id, poolOnEveryDay)))[0]?.fillSourceId).toBe(well);

    type Row = { id: number; active: boolean };
    expect(await listed<Row>(sourceList.loader, manager, "/sources")).toEqual([]);
    expect(await listed<Row>(sourceList.loader, manager, "/sources?status=archived")).toMatchObject([{ id: well, active: false }]);
    // The pools list still filters by it, with the mark.
    const poolPage = (await callRoute(poolList.loader, requestAs(manager, "/pools"))).body as { sources: Array<{ id: number; active: boolean }> };
    expect(poolPage.sources).toMatchObject([{ id: well, active: false }]);
  });

  it("refuses to give another pool an archived source, naming the field", async () => {
    const outcome = await postForm(
      poolEdit.action,
      manager,
      `/pools/${poolOnSpare}/edit`,
      { intent: "save-pool", accountCode: "A-2", customerName: "Customer A-2", street: "A-2 Test Lane", routeId: String(spareRoute), fillSourceId: String(well), active: "on" },
      { poolId: String(poolOnSpare) },
    );
    expect(outcome.status).toBe(400);
    expect(fieldErrors(outcome).fillSourceId).toBe('Fill source: "Hollow well" is archived; restore it on its page or choose another source.');
  });

  it("restores the source", async () => {
    expect((await editSource(manager, well, sourceForm("Hollow well", true))).status).toBe(302);
    expect((await sourceRow(well))?.active).toBe(true);
    expect((await listed<{ id: number }>(sourceList.loader, manager, "/sources")).map((r) => r.id)).toEqual([well]);
  });

  it("is refused to technicians and analysts, and answers 404 for another company's source", async () => {
    for (const member of [technician, analyst]) {
      expect((await editSource(member, well, sourceForm("Hollow well", false))).status).toBe(403);
    }
    expect((await sourceRow(well))?.active).toBe(true);
    expect((await editSource(manager, otherCompanySource, sourceForm("Their well", false))).status).toBe(404);
    expect((await sourceRow(otherCompanySource))?.active).toBe(true);
  });
});
