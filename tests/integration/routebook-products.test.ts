import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDatabase, db } from "~/.server/db/client";
import { products } from "~/.server/db/schema";
import * as productEdit from "~/routes/products.$productId.edit";
import * as productNew from "~/routes/products.new";
import { createCompany } from "../fixtures/company";
import { fieldErrors, postForm } from "../fixtures/forms";
import { routeBookPerFile } from "../fixtures/route-book";

const book = routeBookPerFile({ members: { owner: "owner", technician: "technician" } });
const { owner, technician } = book.member;
let otherCompanyProduct: number;

beforeAll(async () => {
  const [made] = await db().insert(products).values({ companyId: await createCompany(), name: "Theirs", category: "other" }).$returningId();
  otherCompanyProduct = made!.id;
});

afterAll(closeDatabase);

const valid = { name: "Clear-hold", category: "sequestrant", labelDose: "16", doseUnit: "fl oz", doseBasis: "per_10k_gal", unitCost: "0.85", active: "on" };

async function named(name: string) {
  return db().select().from(products).where(and(eq(products.companyId, book.companyId), eq(products.name, name)));
}

describe("products", () => {
  it("creates a product with its label dose and unit cost", async () => {
    expect(await postForm(productNew.action, owner, "/products/new", valid)).toMatchObject({ status: 302, location: "/products" });
    expect(await named("Clear-hold")).toMatchObject([{ category: "sequestrant", labelDose: 16, doseUnit: "fl oz", unitCost: 0.85, active: true }]);
  });

  it("refuses a dose without its unit and a negative cost, naming the fields", async () => {
    const outcome = await postForm(productNew.action, owner, "/products/new", { ...valid, name: "Half-told", doseUnit: "", unitCost: "-1" });
    expect(outcome.status).toBe(400);
    expect(fieldErrors(outcome).unitCost).toBe("Unit cost: -1 is below the lowest accepted value, 0.");
    const noUnit = await postForm(productNew.action, owner, "/products/new", { ...valid, name: "Half-told", doseUnit: "" });
    expect(fieldErrors(noUnit).doseUnit).toMatch(/^Dose unit: name the unit/);
    expect(await named("Half-told")).toHaveLength(0);
  });

  it("stores a double submit once", async () => {
    const again = await postForm(productNew.action, owner, "/products/new", valid);
    expect(again.status).toBe(409);
    expect(fieldErrors(again).name).toBe('Product name: "Clear-hold" is already used by another product.');
    expect(await named("Clear-hold")).toHaveLength(1);
  });

  it("archives a product by unticking it", async () => {
    const [product] = await named("Clear-hold");
    const { active: _active, ...rest } = valid;
    const outcome = await postForm(productEdit.action, owner, `/products/${product!.id}/edit`, rest, { productId: String(product!.id) });
    expect(outcome.status).toBe(302);
    expect((await named("Clear-hold"))[0]?.active).toBe(false);
  });

  it("is refused to technicians and answers 404 for another company's product", async () => {
    expect((await postForm(productNew.action, technician, "/products/new", { ...valid, name: "Tech pick" })).status).toBe(403);
    const foreign = await postForm(productEdit.action, owner, `/products/${otherCompanyProduct}/edit`, valid, { productId: String(otherCompanyProduct) });
    expect(foreign.status).toBe(404);
  });
});
