import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/.server/db/client";
import { products } from "~/.server/db/schema";
import * as exportApi from "~/routes/api.exports.$dataset";
import { addTest, createCompany, createMember, createPool, createRoute, type FixtureMember, requestAs } from "../fixtures/company";
import { callRoute } from "../fixtures/route-call";

let analyst: FixtureMember;
let technician: FixtureMember;

beforeAll(async () => {
  const companyId = await createCompany();
  const routeId = await createRoute(companyId, "East");
  const poolId = await createPool(companyId, { routeId, accountCode: "EX-1", street: "=HYPERLINK(\"http://example.invalid\")" });
  await addTest(companyId, poolId, "2024-05-03T13:15:00Z", { ph: 7.4, copper: 0.05, copperBelowDetection: true, note: "@risk -check" });
  await db().insert(products).values({ companyId, name: "+Clarifier", category: "other" });
  analyst = await createMember(companyId, "analyst");
  technician = await createMember(companyId, "technician", [routeId]);
  // Another company's pool must never appear.
  const elsewhere = await createCompany();
  const otherPool = await createPool(elsewhere, { routeId: null, accountCode: "OTHER-1" });
  await addTest(elsewhere, otherPool, "2024-05-03T13:15:00Z", { ph: 7.0 });
});

async function download(member: FixtureMember, dataset: string) {
  return callRoute(exportApi.loader, requestAs(member, `/api/exports/${dataset}`), { dataset });
}

describe("CSV exports", () => {
  it("streams the company's water tests with formulas neutralised", async () => {
    const outcome = await download(analyst, "water-tests.csv");
    expect(outcome.status).toBe(200);
    const lines = String(outcome.body).replace(/^\uFEFF/, "").trimEnd().split("\r\n");
    expect(lines).toHaveLength(2);
    expect(lines[0]!.startsWith("test_id,account_code,street,sampled_at_utc")).toBe(true);
    expect(lines[1]).toContain(`EX-1,"'=HYPERLINK(""http://example.invalid"")",2024-05-03T13:15:00.000Z,,,7.4,`);
    expect(lines[1]).toContain(",0.05,true,");
    expect(lines[1]).toContain(",'@risk -check,");
    expect(lines[1]).not.toContain("OTHER-1");
  });

  it("products, pools and fill sources too", async () => {
    expect(String((await download(analyst, "products.csv")).body)).toContain("'+Clarifier,other");
    expect(String((await download(analyst, "pools.csv")).body)).toContain("EX-1");
    expect((await download(analyst, "fill-sources.csv")).status).toBe(200);
    expect((await download(analyst, "treatments.csv")).status).toBe(200);
  });

  it("unknown data sets are 404 and technicians may not export", async () => {
    expect(await download(analyst, "users.csv")).toMatchObject({ status: 404, body: { error: { code: "not_found", field: "dataset" } } });
    expect((await download(technician, "water-tests.csv")).status).toBe(403);
  });
});
