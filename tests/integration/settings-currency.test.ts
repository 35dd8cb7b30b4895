import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDatabase, db } from "~/.server/db/client";
import { companies, products } from "~/.server/db/schema";
import * as productList from "~/routes/products";
import * as settings from "~/routes/settings";
import { createCompany, createMember, requestAs, type FixtureMember } from "../fixtures/company";
import { fieldErrors, postForm } from "../fixtures/forms";
import { callRoute } from "../fixtures/route-call";

let companyId: number;
let owner: FixtureMember;

beforeAll(async () => {
  companyId = await createCompany();
  owner = await createMember(companyId, "owner");
  await db().insert(products).values({ companyId, name: "Priced", category: "sequestrant", doseUnit: "fl oz", unitCost: 0.62 });
});

afterAll(closeDatabase);

const valid = {
  copperElevated: "0.3",
  copperClear: "0.1",
  ironElevated: "0.3",
  ironClear: "0.1",
  manganeseElevated: "0.05",
  manganeseClear: "0.02",
  balanceLow: "-0.3",
  balanceHigh: "0.3",
  unitSystem: "us",
  timeZone: "UTC",
};

const storedCurrency = async () => (await db().select().from(companies).where(eq(companies.id, companyId)))[0]!.settings.currency;
const productsCurrency = async () =>
  ((await callRoute(productList.loader, requestAs(owner, "/products"))).body as { currency: string }).currency;

describe("the company's currency", () => {
  it("is US dollars until the company chooses one", async () => {
    expect(await storedCurrency()).toBeUndefined();
    expect(await productsCurrency()).toBe("USD");
  });

  it("is saved with the settings, and every cost page reads it", async () => {
    const outcome = await postForm(settings.action, owner, "/settings", { ...valid, currency: "eur" });
    expect(outcome.body).toMatchObject({ ok: true });
    expect(await storedCurrency()).toBe("EUR");
    expect(await productsCurrency()).toBe("EUR");
  });

  it("stays as it is when a post leaves it out", async () => {
    expect((await postForm(settings.action, owner, "/settings", valid)).body).toMatchObject({ ok: true });
    expect(await storedCurrency()).toBe("EUR");
  });

  it("refuses a code that is not a currency, naming the field, and saves nothing", async () => {
    const outcome = await postForm(settings.action, owner, "/settings", { ...valid, timeZone: "Europe/Oslo", currency: "EUROS" });
    expect(outcome.status).toBe(400);
    expect(fieldErrors(outcome).currency).toBe('Currency: "EUROS" is not a known currency code (e.g. USD, EUR, GBP).');
    expect(await storedCurrency()).toBe("EUR");
    expect((await db().select().from(companies).where(eq(companies.id, companyId)))[0]!.timeZone).toBe("UTC");
  });
});
