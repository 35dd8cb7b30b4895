import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDatabase, db } from "~/.server/db/client";
import { companies } from "~/.server/db/schema";
import * as settings from "~/routes/settings";
import { createCompany } from "../fixtures/company";
import { fieldErrors, postForm } from "../fixtures/forms";
import { routeBookPerFile } from "../fixtures/route-book";

const book = routeBookPerFile({ members: { owner: "owner", manager: "manager" } });
const { owner, manager } = book.member;
let otherCompanyId: number;

beforeAll(async () => {
  otherCompanyId = await createCompany();
  await db().update(companies).set({ settings: { alertOwners: true } }).where(eq(companies.id, book.companyId));
});

afterAll(closeDatabase);

const valid = {
  copperElevated: "0.4",
  copperClear: "0.1",
  ironElevated: "0.2",
  ironClear: "0.1",
  manganeseElevated: "0.05",
  manganeseClear: "0.02",
  balanceLow: "-0.5",
  balanceHigh: "0.5",
  unitSystem: "metric",
  timeZone: "Europe/Lisbon",
};

const company = async (id: number) => (await db().select().from(companies).where(eq(companies.id, id)))[0]!;

describe("company settings", () => {
  it("saves thresholds, balance band, units and time zone, keeping other settings", async () => {
    const outcome = await postForm(settings.action, owner, "/settings", valid);
    expect(outcome.body).toMatchObject({ ok: true });
    const saved = await company(book.companyId);
    expect(saved).toMatchObject({ unitSystem: "metric", timeZone: "Europe/Lisbon" });
    expect(saved.settings).toMatchObject({
      alertOwners: true,
      metalThresholds: { copper: { elevated: 0.4, clear: 0.1 } },
      balanceBand: { low: -0.5, high: 0.5 },
    });
    // Another company is untouched.
    expect(await company(otherCompanyId)).toMatchObject({ unitSystem: "us", timeZone: "UTC", settings: {} });
  });

  it("saving the same form twice leaves the same settings", async () => {
    await postForm(settings.action, owner, "/settings", valid);
    expect((await company(book.companyId)).settings).toMatchObject({ metalThresholds: { copper: { elevated: 0.4 } } });
  });

  it("refuses elevated below clear, a zero clear level and an unknown time zone, naming the fields", async () => {
    const levels = await postForm(settings.action, owner, "/settings", { ...valid, copperElevated: "0.05", ironClear: "0" });
    expect(levels.status).toBe(400);
    expect(fieldErrors(levels).copperElevated).toBe("Copper elevated: 0.05 mg/L must not be below the clear level, 0.1 mg/L.");
    expect(fieldErrors(levels).ironClear).toBe("Iron clear: 0 mg/L must be above 0.");
    const outcome = await postForm(settings.action, owner, "/settings", { ...valid, timeZone: "Mars/Olympus", unitSystem: "imperial" });
    expect(outcome.status).toBe(400);
    const errors = fieldErrors(outcome);
    expect(errors.timeZone).toBe('Time zone: "Mars/Olympus" is not a known time zone (e.g. America/New_York).');
    expect(errors.unitSystem).toBe('Units: "imperial" is not one of us, metric.');
    expect((await company(book.companyId)).timeZone).toBe("Europe/Lisbon");
  });

  it("reports every field's own problem and every cross-field problem in one answer", async () => {
    const outcome = await postForm(settings.action, owner, "/settings", {
      ...valid,
      copperElevated: "lots", // not a number
      ironElevated: "0.05", // below iron clear 0.1
      manganeseClear: "12", // above the highest accepted 10
      balanceLow: "0", // with balanceHigh 0: the band is empty
      balanceHigh: "0",
      timeZone: "Mars/Olympus",
    });
    expect(outcome.status).toBe(400);
    expect(fieldErrors(outcome)).toEqual({
      copperElevated: 'Copper elevated: "lots" is not a number.',
      ironElevated: "Iron elevated: 0.05 mg/L must not be below the clear level, 0.1 mg/L.",
      manganeseClear: "Manganese clear: 12 mg/L is above the highest accepted value, 10 mg/L.",
      balanceHigh: "Balanced up to: 0 must be above 0.",
      timeZone: 'Time zone: "Mars/Olympus" is not a known time zone (e.g. America/New_York).',
    });
    expect((await company(book.companyId)).timeZone).toBe("Europe/Lisbon");
  });

  it("is refused to managers", async () => {
    const outcome = await postForm(settings.action, manager, "/settings", { ...valid, timeZone: "UTC" });
    expect(outcome.status).toBe(403);
    expect((await company(book.companyId)).timeZone).toBe("Europe/Lisbon");
  });
});
