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
import { createCompany, createFillSource, createRoute, type FixtureMember, requestAs } from "../fixtures/company";
import { fieldErrors, postForm } from "../fixtures/forms";
import { EVERY_DAY, routeBookPerFile } from "../fixtures/route-book";
import { callRoute, type RouteFunction } from "../fixtures/route-call";

// Both routes are served every weekday, so "today" always lists their pools while they are in use.
const book = routeBookPerFile({
  routes: { everyDay: { name: "Daily loop", weekdays: EVERY_DAY }, spare: { name: "Spare loop", weekdays: EVERY_DAY } },
  sources: { well: { name: "Hollow well", kind: "shared_well" } },
  pools: { onEveryDay: { route: "everyDay", accountCode: "A-1", source: "well" }, onSpare: { route: "spare", accountCode: "A-2" } },
  members: { manager: "manager", technician: { role: "technician", routes: ["everyDay", "spare"] }, analyst: "analyst" },
});
const { manager, technician, analyst } = book.member;
let otherCompanyRoute: number;
let otherCompanySource: number;

beforeAll(async () => {
  const other = await createCompany();
  otherCompanyRoute = await createRoute(other, "Their loop", "1");
  otherCompanySource = await createFillSource(other, "Their well");
});

afterAll(closeDatabase);

// The route form sends the whole route: its days and technicians stay as they were.
const routeForm = (name: string, active: boolean) => ({
  name,
  serviceWeekdays: EVERY_DAY.split(","),
  technicianIds: technician.userId,
  ...(active ? { active: "on" } : {}),
});
const sourceForm = (name: string, active: boolean) => ({ name, kind: "shared_well", ...(active ? { active: "on" } : {}) });

const editRoute = (member: FixtureMember, routeId: number, fields: Record<string, string | string[]>) =>
  postForm(routeEdit.action, member, `/routes/${routeId}/edit`, fields, { routeId: String(routeId) });
const editSource = (member: FixtureMember, sourceId: number, fields: Record<string, string>) =>
  postForm(sourceEdit.action, member, `/sources/${sourceId}/edit`, fields, { sourceId: String(sourceId) });

/** The pool form as the pool's page sends it for pool `accountCode` as created, with these changes. */
const poolForm = (accountCode: string, changes: Record<string, string>) => ({
  intent: "save-pool",
  accountCode,
  customerName: `Customer ${accountCode}`,
  street: `${accountCode} Test Lane`,
  active: "on",
  ...changes,
});
const editPool = (poolId: number, fields: Record<string, string>) =>
  postForm(poolEdit.action, manager, `/pools/${poolId}/edit`, fields, { poolId: String(poolId) });

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
    expect((await dayList(technician)).stops.map((s) => s.poolId).sort()).toEqual([book.pool.onEveryDay, book.pool.onSpare].sort());

    const outcome = await editRoute(manager, book.route.spare, routeForm("Spare loop", false));
    expect(outcome).toMatchObject({ status: 302, location: "/routes" });
    expect(await routeRow(book.route.spare)).toMatchObject({ name: "Spare loop", active: false });
    // Nothing is deleted: the pool still points at the route.
    expect((await db().select().from(pools).where(eq(pools.id, book.pool.onSpare)))[0]?.routeId).toBe(book.route.spare);

    expect((await dayList(technician)).stops.map((s) => s.poolId)).toEqual([book.pool.onEveryDay]);

    // The pool form of a pool on the daily route offers only routes in use.
    const form = (await callRoute(poolEdit.loader, requestAs(manager, `/pools/${book.pool.onEveryDay}/edit`), { poolId: String(book.pool.onEveryDay) }))
      .body as { routes: Array<{ id: number; active: boolean }> };
    expect(form.routes.find((r) => r.id === book.route.spare)).toMatchObject({ active: false });
  });

  it("lists archived routes only under their filter, marked archived", async () => {
    type Row = { id: number; active: boolean };
    expect((await listed<Row>(routeList.loader, manager, "/routes")).map((r) => r.id)).toEqual([book.route.everyDay]);
    expect(await listed<Row>(routeList.loader, manager, "/routes?status=archived")).toMatchObject([{ id: book.route.spare, active: false }]);
    expect((await listed<Row>(routeList.loader, manager, "/routes?status=all")).map((r) => r.id).sort()).toEqual([book.route.everyDay, book.route.spare].sort());
  });

  it("refuses to put a pool on an archived route, naming the field and the route", async () => {
    const outcome = await editPool(book.pool.onEveryDay, poolForm("A-1", { routeId: String(book.route.spare) }));
    expect(outcome.status).toBe(400);
    expect(fieldErrors(outcome).routeId).toBe('Route: "Spare loop" is archived; restore it on its page or choose another route.');
    expect((await db().select().from(pools).where(eq(pools.id, book.pool.onEveryDay)))[0]?.routeId).toBe(book.route.everyDay);
  });

  it("leaves the archived route out of the pool form's route picker, except on the pool already on it", async () => {
    const pickerOf = async (poolId: number) => {
      const page = (await callRoute(poolEdit.loader, requestAs(manager, `/pools/${poolId}/edit`), { poolId: String(poolId) })).body as {
        routes: ArchivableOption[];
      };
      return pickerOptions(page.routes, poolId === book.pool.onSpare ? book.route.spare : book.route.everyDay).map((o) => o.label);
    };
    expect(await pickerOf(book.pool.onEveryDay)).toEqual(["Daily loop"]);
    expect(await pickerOf(book.pool.onSpare)).toEqual(["Daily loop", "Spare loop (archived)"]);
  });

  it("lets a pool already on an archived route be saved as it is", async () => {
    const outcome = await editPool(book.pool.onSpare, poolForm("A-2", { customerName: "Customer A-2 renamed", routeId: String(book.route.spare) }));
    expect(outcome.status).toBe(302);
    expect((await db().select().from(pools).where(eq(pools.id, book.pool.onSpare)))[0]).toMatchObject({ customerName: "Customer A-2 renamed", routeId: book.route.spare });
  });

  it("restores the route, and its pools come back to the day's list", async () => {
    const outcome = await editRoute(manager, book.route.spare, routeForm("Spare loop", true));
    expect(outcome.status).toBe(302);
    expect((await routeRow(book.route.spare))?.active).toBe(true);
    expect((await dayList(technician)).stops.map((s) => s.poolId).sort()).toEqual([book.pool.onEveryDay, book.pool.onSpare].sort());
  });

  it("is refused to technicians and analysts, and changes nothing", async () => {
    for (const member of [technician, analyst]) {
      expect((await editRoute(member, book.route.spare, routeForm("Spare loop", false))).status).toBe(403);
    }
    expect((await routeRow(book.route.spare))?.active).toBe(true);
  });

  it("answers 404 for another company's route and leaves it in use", async () => {
    expect((await editRoute(manager, otherCompanyRoute, routeForm("Their loop", false))).status).toBe(404);
    expect((await routeRow(otherCompanyRoute))?.active).toBe(true);
  });
});

describe("archiving a fill source", () => {
  it("keeps the source and the pools it feeds, and lists it only under the archived filter", async () => {
    const outcome = await editSource(manager, book.source.well, sourceForm("Hollow well", false));
    expect(outcome).toMatchObject({ status: 302, location: `/sources/${book.source.well}` });
    expect(await sourceRow(book.source.well)).toMatchObject({ name: "Hollow well", active: false });
    expect((await db().select().from(pools).where(eq(pools.id, book.pool.onEveryDay)))[0]?.fillSourceId).toBe(book.source.well);

    type Row = { id: number; active: boolean };
    expect(await listed<Row>(sourceList.loader, manager, "/sources")).toEqual([]);
    expect(await listed<Row>(sourceList.loader, manager, "/sources?status=archived")).toMatchObject([{ id: book.source.well, active: false }]);
    // The pools list still filters by it, with the mark.
    const poolPage = (await callRoute(poolList.loader, requestAs(manager, "/pools"))).body as { sources: Array<{ id: number; active: boolean }> };
    expect(poolPage.sources).toMatchObject([{ id: book.source.well, active: false }]);
  });

  it("refuses to give another pool an archived source, naming the field", async () => {
    const outcome = await editPool(book.pool.onSpare, poolForm("A-2", { routeId: String(book.route.spare), fillSourceId: String(book.source.well) }));
    expect(outcome.status).toBe(400);
    expect(fieldErrors(outcome).fillSourceId).toBe('Fill source: "Hollow well" is archived; restore it on its page or choose another source.');
  });

  it("restores the source", async () => {
    expect((await editSource(manager, book.source.well, sourceForm("Hollow well", true))).status).toBe(302);
    expect((await sourceRow(book.source.well))?.active).toBe(true);
    expect((await listed<{ id: number }>(sourceList.loader, manager, "/sources")).map((r) => r.id)).toEqual([book.source.well]);
  });

  it("is refused to technicians and analysts, and answers 404 for another company's source", async () => {
    for (const member of [technician, analyst]) {
      expect((await editSource(member, book.source.well, sourceForm("Hollow well", false))).status).toBe(403);
    }
    expect((await sourceRow(book.source.well))?.active).toBe(true);
    expect((await editSource(manager, otherCompanySource, sourceForm("Their well", false))).status).toBe(404);
    expect((await sourceRow(otherCompanySource))?.active).toBe(true);
  });
});
