import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDatabase, db } from "~/.server/db/client";
import { equipment, pools } from "~/.server/db/schema";
import * as poolEdit from "~/routes/pools.$poolId.edit";
import * as poolNew from "~/routes/pools.new";
import * as poolList from "~/routes/pools";
import { createOtherCompanyPool, createRoute, requestAs } from "../fixtures/company";
import { fieldErrors, postForm } from "../fixtures/forms";
import { routeBookPerFile } from "../fixtures/route-book";
import { callRoute } from "../fixtures/route-call";

const book = routeBookPerFile({
  routes: { pool: "Pool loop", other: { name: "Other loop", weekdays: "2" } },
  pools: { existing: { route: "pool", accountCode: "P-1" }, other: { route: "other", accountCode: "P-2" } },
  members: { manager: "manager", technician: { role: "technician", routes: ["pool"] }, analyst: "analyst" },
});
const { manager, technician, analyst } = book.member;
let otherCompanyPool: number;

beforeAll(async () => {
  otherCompanyPool = await createOtherCompanyPool("X-1");
});

afterAll(closeDatabase);

const base = {
  accountCode: "P-10",
  customerName: "Wren Farrowby",
  street: "12 Heron Walk",
  neighbourhood: "Lakeside",
  surface: "plaster",
  sanitiser: "salt_generator",
  active: "on",
};

async function poolByAccount(accountCode: string) {
  const [row] = await db().select().from(pools).where(and(eq(pools.companyId, book.companyId), eq(pools.accountCode, accountCode)));
  return row;
}

describe("creating a pool", () => {
  it("stores a volume typed in gallons as litres (company units: US)", async () => {
    const outcome = await postForm(poolNew.action, manager, "/pools/new", { ...base, routeId: String(book.route.pool), volumeMode: "direct", volume: "10000" });
    const stored = await poolByAccount("P-10");
    expect(outcome).toMatchObject({ status: 302, location: `/pools/${stored?.id}` });
    // 10,000 US gal x 3.785411784 L/gal (NIST Handbook 44) = 37,854.1 L, stored whole: 37,854.
    expect(stored).toMatchObject({ volumeLitres: 37_854, routeId: book.route.pool, surface: "plaster", sanitiser: "salt_generator", active: true });
  });

  it("works the volume out from shape and dimensions", async () => {
    await postForm(poolNew.action, manager, "/pools/new", {
      ...base,
      accountCode: "P-11",
      volumeMode: "shape",
      shape: "rectangle",
      lengthUnit: "ft",
      length: "32",
      width: "16",
      shallowDepth: "3.5",
      deepDepth: "8.5",
    });
    // 32 x 16 ft x mean depth (3.5 + 8.5) / 2 = 6 ft -> 3,072 ft3; x 1728/231 gal/ft3 = 22,980.16 gal;
    // x 3.785411784 L/gal = 86,989.35 L (= 3,072 x 28.316846592 L/ft3), stored whole: 86,989.
    expect((await poolByAccount("P-11"))?.volumeLitres).toBe(86_989);
  });

  it("refuses a volume beyond the accepted range and a missing dimension, naming the fields", async () => {
    const tooBig = await postForm(poolNew.action, manager, "/pools/new", { ...base, accountCode: "P-12", volumeMode: "direct", volume: "5000000" });
    expect(tooBig.status).toBe(400);
    expect(fieldErrors(tooBig).volume).toBe("Volume: 5000000 gal is above the highest accepted value, 2000000 gal.");
    const noWidth = await postForm(poolNew.action, manager, "/pools/new", {
      ...base,
      accountCode: "P-12",
      volumeMode: "shape",
      shape: "rectangle",
      length: "30",
      shallowDepth: "3",
      deepDepth: "6",
    });
    expect(fieldErrors(noWidth).width).toBe("Width: enter the measurement in ft.");
    const noStreet = await postForm(poolNew.action, manager, "/pools/new", { ...base, accountCode: "P-12", street: " " });
    expect(fieldErrors(noStreet).street).toBe("Street address: enter a value.");
    expect(await poolByAccount("P-12")).toBeUndefined();
  });

  it("refuses a route of another company", async () => {
    const [owner] = await db().select({ companyId: pools.companyId }).from(pools).where(eq(pools.id, otherCompanyPool));
    const foreign = await createRoute(owner!.companyId, "Foreign loop");
    const outcome = await postForm(poolNew.action, manager, "/pools/new", { ...base, accountCode: "P-13", routeId: String(foreign) });
    expect(outcome.status).toBe(400);
    expect(fieldErrors(outcome).routeId).toContain("is not one of this company's routes");
  });

  it("stores a double submit once", async () => {
    const form = { ...base, accountCode: "P-14" };
    const first = await postForm(poolNew.action, manager, "/pools/new", form);
    const second = await postForm(poolNew.action, manager, "/pools/new", form);
    expect(first.status).toBe(302);
    expect(second.status).toBe(409);
    expect(fieldErrors(second).accountCode).toBe('Account code: "P-14" is already used by another pool.');
  });

  it("is refused to technicians and analysts", async () => {
    for (const member of [technician, analyst]) {
      expect((await postForm(poolNew.action, member, "/pools/new", { ...base, accountCode: "P-15" })).status).toBe(403);
    }
    expect(await poolByAccount("P-15")).toBeUndefined();
  });
});

describe("editing and archiving a pool", () => {
  const edit = (poolId: number, fields: Record<string, string>, member = manager) =>
    postForm(poolEdit.action, member, `/pools/${poolId}/edit`, fields, { poolId: String(poolId) });

  it("archives a pool (active unticked) and keeps it", async () => {
    const outcome = await edit(book.pool.existing, { intent: "save-pool", ...base, accountCode: "P-1", routeId: String(book.route.pool) });
    expect(outcome.status).toBe(302);
    const archived = await edit(book.pool.existing, { intent: "save-pool", ...base, accountCode: "P-1", routeId: String(book.route.pool), active: "" });
    expect(archived.status).toBe(302);
    expect((await poolByAccount("P-1"))?.active).toBe(false);
    await db().update(pools).set({ active: true }).where(eq(pools.id, book.pool.existing));
  });

  it("answers 404 for another company's pool", async () => {
    expect((await edit(otherCompanyPool, { intent: "save-pool", ...base, accountCode: "X-1" })).status).toBe(404);
    const page = await callRoute(poolEdit.loader, requestAs(manager, `/pools/${otherCompanyPool}/edit`), { poolId: String(otherCompanyPool) });
    expect(page.status).toBe(404);
  });

  it("fits equipment, replaces it keeping the old one's history, and stores a repeated replace once", async () => {
    const added = await edit(book.pool.existing, { intent: "add-equipment", kind: "heater", exchangerMetal: "copper", installedOn: "2012-04-01" });
    expect(added.body).toMatchObject({ ok: true, repeated: false });
    const repeat = await edit(book.pool.existing, { intent: "add-equipment", kind: "heater", exchangerMetal: "copper", installedOn: "2012-04-01" });
    expect(repeat.body).toMatchObject({ ok: true, repeated: true });
    const [old] = await db().select().from(equipment).where(eq(equipment.poolId, book.pool.existing));
    const replace = { intent: "replace-equipment", equipmentId: String(old!.id), kind: "heater", exchangerMetal: "titanium", installedOn: "2025-06-15" };
    expect((await edit(book.pool.existing, replace)).body).toMatchObject({ ok: true, repeated: false });
    expect((await edit(book.pool.existing, replace)).body).toMatchObject({ ok: true, repeated: true });
    const items = await db().select().from(equipment).where(eq(equipment.poolId, book.pool.existing)).orderBy(equipment.id);
    expect(items.map((i) => [i.exchangerMetal, i.installedOn, i.removedOn])).toEqual([
      ["copper", "2012-04-01", "2025-06-15"],
      ["titanium", "2025-06-15", null],
    ]);
  });

  it("refuses equipment without a kind, or installed in the future", async () => {
    const noKind = await edit(book.pool.existing, { intent: "add-equipment", installedOn: "2020-01-01" });
    expect(fieldErrors(noKind).kind).toBe("Kind: choose one.");
    const future = await edit(book.pool.existing, { intent: "add-equipment", kind: "pump", installedOn: "2999-01-01" });
    expect(fieldErrors(future).installedOn).toMatch(/^Installed on: 2999-01-01 is later than today/);
  });

  it("refuses equipment changes to technicians", async () => {
    expect((await edit(book.pool.existing, { intent: "add-equipment", kind: "pump" }, technician)).status).toBe(403);
  });
});

describe("the pool list", () => {
  it("shows a technician only their routes' pools", async () => {
    const body = (await callRoute(poolList.loader, requestAs(technician, "/pools"))).body as { rows: Array<{ accountCode: string }> };
    // P-1 and P-10 are on the technician's route; P-2 is on another route, P-11 and P-14 on none.
    expect(body.rows.map((r) => r.accountCode)).toEqual(["P-1", "P-10"]);
  });

  it("filters by route and sorts by account both ways", async () => {
    const byRoute = (await callRoute(poolList.loader, requestAs(manager, `/pools?route=${book.route.other}`))).body as { rows: Array<{ accountCode: string }> };
    expect(byRoute.rows.map((r) => r.accountCode)).toEqual(["P-2"]);
    const asc = (await callRoute(poolList.loader, requestAs(manager, "/pools?sort=account&dir=asc"))).body as { rows: Array<{ accountCode: string }> };
    const desc = (await callRoute(poolList.loader, requestAs(manager, "/pools?sort=account&dir=desc"))).body as { rows: Array<{ accountCode: string }> };
    expect(asc.rows.map((r) => r.accountCode)).toEqual(desc.rows.map((r) => r.accountCode).reverse());
  });
});
