import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDatabase, db } from "~/.server/db/client";
import { products } from "~/.server/db/schema";
import * as productNew from "~/routes/products.new";
import * as visitPool from "~/routes/visit.$poolId";
import { createCompany, createMember, createRouteWithPool, requestAs, type FixtureMember } from "../fixtures/company";
import { fieldErrors, postForm } from "../fixtures/forms";
import { callRoute } from "../fixtures/route-call";

let companyId: number;
let owner: FixtureMember;
let technician: FixtureMember;
let poolId: number;

beforeAll(async () => {
  companyId = await createCompany();
  owner = await createMember(companyId, "owner");
  const onRoute = await createRouteWithPool(companyId, "Label run", "LD-1");
  poolId = onRoute.poolId;
  technician = await createMember(companyId, "technician", [onRoute.routeId]);
});

afterAll(closeDatabase);

const labelled = { name: "Hold-fast", category: "sequestrant", labelDose: "32", maintenanceDose: "8", doseUnit: "fl oz", doseBasis: "per_10k_gal", unitCost: "", active: "on" };

async function named(name: string) {
  return db().select().from(products).where(and(eq(products.companyId, companyId), eq(products.name, name)));
}

describe("a product's label doses", () => {
  it("keeps the starting and the maintenance dose", async () => {
    expect(await postForm(productNew.action, owner, "/products/new", labelled)).toMatchObject({ status: 302 });
    expect(await named("Hold-fast")).toMatchObject([{ labelDose: 32, maintenanceDose: 8, doseUnit: "fl oz", doseBasis: "per_10k_gal" }]);
  });

  it("refuses a maintenance dose without its unit, or below zero, naming the field", async () => {
    const noUnit = await postForm(productNew.action, owner, "/products/new", { ...labelled, name: "Unitless", labelDose: "", doseUnit: "" });
    expect(noUnit.status).toBe(400);
    expect(fieldErrors(noUnit).doseUnit).toMatch(/^Dose unit: name the unit/);
    const negative = await postForm(productNew.action, owner, "/products/new", { ...labelled, name: "Unitless", maintenanceDose: "-2" });
    expect(fieldErrors(negative).maintenanceDose).toMatch(/^Maintenance dose: -2 is below/);
    expect(await named("Unitless")).toHaveLength(0);
  });

  it("reach the technician's visit form with the pool's volume and the company's units", async () => {
    const outcome = await callRoute(visitPool.loader, requestAs(technician, `/visit/${poolId}`), { poolId: String(poolId) });
    expect(outcome.status).toBe(200);
    const body = outcome.body as { pool: { volumeLitres: number }; units: string; products: Array<Record<string, unknown>> };
    expect(body.pool.volumeLitres).toBe(60_000);
    expect(body.units).toBe("us");
    expect(body.products.find((p) => p.name === "Hold-fast")).toMatchObject({ labelDose: 32, maintenanceDose: 8, doseUnit: "fl oz", doseBasis: "per_10k_gal" });
  });
});
