import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDatabase, db } from "~/.server/db/client";
import { products, treatments, waterTests } from "~/.server/db/schema";
import * as poolPage from "~/routes/pools.$poolId";
import * as visitPool from "~/routes/visit.$poolId";
import { createOtherCompanyPool, type FixtureMember, requestAs } from "../fixtures/company";
import { fieldErrors, postForm } from "../fixtures/forms";
import { EVERY_DAY, routeBookPerFile } from "../fixtures/route-book";
import { callRoute } from "../fixtures/route-call";

const book = routeBookPerFile({
  routes: { visit: { name: "Visit loop", weekdays: EVERY_DAY }, notMine: "Not mine" },
  pools: { onRoute: { route: "visit", accountCode: "V-1" }, offRoute: { route: "notMine", accountCode: "V-2" } },
  members: { technician: { role: "technician", routes: ["visit"] }, analyst: "analyst" },
});
const { technician, analyst } = book.member;
let otherCompanyPool: number;
let sequestrant: number;

beforeAll(async () => {
  const [product] = await db()
    .insert(products)
    .values({ companyId: book.companyId, name: "Test sequestrant", category: "sequestrant", labelDose: 16, doseUnit: "fl oz", unitCost: 0.75 })
    .$returningId();
  sequestrant = product!.id;
  otherCompanyPool = await createOtherCompanyPool("X-9");
});

afterAll(closeDatabase);

const key = (suffix: string) => `visit-key-${suffix}-${Date.now()}`;
const post = (member: FixtureMember, poolId: number, fields: Record<string, string | string[]>) =>
  postForm(visitPool.action, member, `/visit/${poolId}`, fields, { poolId: String(poolId) });

async function testsWithKey(submissionKey: string) {
  return db().select().from(waterTests).where(and(eq(waterTests.companyId, book.companyId), eq(waterTests.submissionKey, submissionKey)));
}

describe("logging a visit", () => {
  it("stores readings, observations and treatments in one go", async () => {
    const submissionKey = key("full");
    const outcome = await post(technician, book.pool.onRoute, {
      submissionKey,
      ph: "7.6",
      freeChlorine: "3",
      totalAlkalinity: "90",
      calciumHardness: "250",
      cyanuricAcid: "40",
      temperature: "82",
      temperatureUnit: "F",
      copper: "0.42",
      iron: "<0.05",
      hardnessEndpoint: "clean",
      stain: "new",
      stainColour: "blue_green",
      padTint: "tinted",
      note: "Blue-green ring at the step",
      treatmentProduct: [String(sequestrant)],
      treatmentAmount: ["24"],
      treatmentUnit: ["fl oz"],
    });
    const [stored] = await testsWithKey(submissionKey);
    expect(outcome).toMatchObject({ status: 302, location: `/pools/${book.pool.onRoute}?saved=${stored?.id}` });
    // 82 degF = (82 - 32) x 5/9 = 27.78 degC, stored to one decimal: 27.8.
    expect(stored).toMatchObject({ ph: 7.6, temperatureC: 27.8, copper: 0.42, copperBelowDetection: false, iron: 0.05, ironBelowDetection: true });
    expect(stored).toMatchObject({ stain: "new", stainColour: "blue_green", padTint: "tinted", technicianId: technician.userId });
    const given = await db().select().from(treatments).where(eq(treatments.waterTestId, stored!.id));
    // 24 fl oz x 0.75 per fl oz = 18.00.
    expect(given).toMatchObject([{ productId: sequestrant, amount: 24, unit: "fl oz", cost: 18 }]);
  });

  it("shows the visit on the pool page at once", async () => {
    const outcome = await callRoute(poolPage.loader, requestAs(technician, `/pools/${book.pool.onRoute}`), { poolId: String(book.pool.onRoute) });
    const body = outcome.body as { detail: { tests: Array<{ copper: number | null }>; treatments: Array<{ productName: string }> } };
    expect(body.detail.tests[0]?.copper).toBe(0.42);
    expect(body.detail.treatments[0]?.productName).toBe("Test sequestrant");
  });

  it("refuses a value outside the hard bounds with the field, the value and the bound, storing nothing", async () => {
    const submissionKey = key("bounds");
    const outcome = await post(technician, book.pool.onRoute, { submissionKey, ph: "15", freeChlorine: "3" });
    expect(outcome.status).toBe(400);
    expect(fieldErrors(outcome).ph).toBe("pH: 15 is above the highest accepted value, 14.");
    expect(await testsWithKey(submissionKey)).toHaveLength(0);
  });

  it("hands back every typed value with the refusal, so a form posted without script is drawn again as typed", async () => {
    const submissionKey = key("typed");
    const typed = {
      ph: "7.4",
      totalAlkalinity: "900",
      copper: "<0.05",
      note: "Leaves in the skimmer",
      treatmentProduct: [String(sequestrant), ""],
      treatmentAmount: ["abc", ""],
      treatmentUnit: ["fl oz", ""],
    };
    const outcome = await post(technician, book.pool.onRoute, { submissionKey, ...typed });
    expect(outcome.status).toBe(400);
    expect(fieldErrors(outcome)).toEqual({
      totalAlkalinity: "Total alkalinity: 900 mg/L is above the highest accepted value, 500 mg/L.",
      "treatments.0.amount": 'Treatment 1 amount: "abc" is not a number.',
    });
    expect((outcome.body as { values: Record<string, unknown> }).values).toEqual({ submissionKey, ...typed });
    expect(await testsWithKey(submissionKey)).toHaveLength(0);
  });

  it("refuses a temperature above 45 degC given in degF, converted in the message", async () => {
    // 120 degF = (120 - 32) x 5/9 = 48.9 degC > 45 degC.
    const outcome = await post(technician, book.pool.onRoute, { submissionKey: key("hot"), temperature: "120F" });
    expect(fieldErrors(outcome).temperature).toBe("Temperature: 120 °F (48.9 °C) is above the highest accepted value, 45 °C (113 °F).");
  });

  it("refuses a metal above 10 mg/L and a treatment without an amount, naming each field", async () => {
    const outcome = await post(technician, book.pool.onRoute, {
      submissionKey: key("metal"),
      copper: "12",
      treatmentProduct: [String(sequestrant)],
      treatmentAmount: [""],
      treatmentUnit: [""],
    });
    expect(fieldErrors(outcome).copper).toContain("Copper: 12 mg/L is above the accepted maximum of 10 mg/L");
    expect(fieldErrors(outcome)["treatments.0.amount"]).toBe("Treatment 1 amount: enter how much was given.");
  });

  it("refuses an empty visit", async () => {
    const outcome = await post(technician, book.pool.onRoute, { submissionKey: key("empty") });
    expect(outcome.status).toBe(400);
    expect((outcome.body as { formError: string }).formError).toMatch(/at least one reading/);
  });

  it("stores a double submit once and answers the second with the first visit", async () => {
    const submissionKey = key("double");
    const form = { submissionKey, ph: "7.4", treatmentProduct: [String(sequestrant)], treatmentAmount: ["8"], treatmentUnit: ["fl oz"] };
    const [first, second] = await Promise.all([post(technician, book.pool.onRoute, form), post(technician, book.pool.onRoute, form)]);
    const stored = await testsWithKey(submissionKey);
    expect(stored).toHaveLength(1);
    expect(first.location).toBe(`/pools/${book.pool.onRoute}?saved=${stored[0]!.id}`);
    expect(second.location).toBe(first.location);
    expect(await db().select().from(treatments).where(eq(treatments.waterTestId, stored[0]!.id))).toHaveLength(1);
  });

  it("is refused to analysts", async () => {
    const submissionKey = key("analyst");
    const outcome = await post(analyst, book.pool.onRoute, { submissionKey, ph: "7.4" });
    expect(outcome.status).toBe(403);
    expect(await testsWithKey(submissionKey)).toHaveLength(0);
  });

  it("answers 404 for a pool on another technician's route or of another company", async () => {
    for (const poolId of [book.pool.offRoute, otherCompanyPool]) {
      const outcome = await post(technician, poolId, { submissionKey: key(`scope-${poolId}`), ph: "7.4" });
      expect(outcome.status).toBe(404);
      const page = await callRoute(visitPool.loader, requestAs(technician, `/visit/${poolId}`), { poolId: String(poolId) });
      expect(page.status).toBe(404);
    }
  });
});

describe("metal suspicion from a blurred endpoint", () => {
  const suspected = async () => {
    const outcome = await callRoute(poolPage.loader, requestAs(technician, `/pools/${book.pool.onRoute}`), { poolId: String(book.pool.onRoute) });
    return (outcome.body as { detail: { metalSuspectedSince: Date | null } }).detail.metalSuspectedSince;
  };

  it("marks the pool until a metal reading is logged", async () => {
    await post(technician, book.pool.onRoute, { submissionKey: key("blurred"), calciumHardness: "300", hardnessEndpoint: "blurred" });
    expect(await suspected()).toBeInstanceOf(Date);
    // A later visit without metals keeps the mark.
    await new Promise((resolve) => setTimeout(resolve, 5));
    await post(technician, book.pool.onRoute, { submissionKey: key("no-metal"), ph: "7.5" });
    expect(await suspected()).toBeInstanceOf(Date);
    await new Promise((resolve) => setTimeout(resolve, 5));
    await post(technician, book.pool.onRoute, { submissionKey: key("metal-read"), iron: "0.1" });
    expect(await suspected()).toBeNull();
  });
});
