import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDatabase, db } from "~/.server/db/client";
import { companies } from "~/.server/db/schema";
import * as home from "~/routes/_index";
import * as visitList from "~/routes/visit";
import { addTest, createCompany, createMember, createPool, createRoute, type FixtureMember, requestAs } from "../fixtures/company";
import { callRoute } from "../fixtures/route-call";

let technician: FixtureMember;
let blurredOnly: number;
let copperStillOpen: number;
let copperCleared: number;
let suspicionAnswered: number;
let neverTested: number;
let belowDefaultButAboveCompany: number;
let otherRoutePool: number;

type VisitPage = {
  stops: Array<{ poolId: number }>;
  found: Array<{ poolId: number }>;
  marks: Record<number, { suspected: boolean; openMetals: string[] }>;
};

beforeAll(async () => {
  const companyId = await createCompany();
  // The company's own copper levels: elevated at 0.2 mg/L (the common-practice default is 0.3), clear below 0.1.
  await db()
    .update(companies)
    .set({
      settings: {
        metalThresholds: {
          copper: { elevated: 0.2, clear: 0.1 },
          iron: { elevated: 0.2, clear: 0.1 },
          manganese: { elevated: 0.05, clear: 0.02 },
        },
      },
    })
    .where(eq(companies.id, companyId));
  // Served every weekday, so every pool on it is on today's list whatever the date.
  const route = await createRoute(companyId, "Marks loop", "1,2,3,4,5,6,7");
  const otherRoute = await createRoute(companyId, "Someone else's loop", "1,2,3,4,5,6,7");
  technician = await createMember(companyId, "technician", [route]);

  blurredOnly = await createPool(companyId, { routeId: route, accountCode: "M-1" });
  await addTest(companyId, blurredOnly, "2026-03-02T10:00:00Z", { hardnessEndpoint: "clean", ph: 7.4 });
  await addTest(companyId, blurredOnly, "2026-03-09T10:00:00Z", { hardnessEndpoint: "blurred", ph: 7.5 });

  // 0.40 >= 0.2 opens the case; 0.15 is between clear (0.1) and elevated: the case stays open.
  copperStillOpen = await createPool(companyId, { routeId: route, accountCode: "M-2" });
  await addTest(companyId, copperStillOpen, "2026-03-02T10:00:00Z", { copper: 0.4 });
  await addTest(companyId, copperStillOpen, "2026-03-09T10:00:00Z", { copper: 0.15 });
  await addTest(companyId, copperStillOpen, "2026-03-16T10:00:00Z", { ph: 7.4 });

  // 0.40 opens, 0.05 < 0.1 closes.
  copperCleared = await createPool(companyId, { routeId: route, accountCode: "M-3" });
  await addTest(companyId, copperCleared, "2026-03-02T10:00:00Z", { copper: 0.4 });
  await addTest(companyId, copperCleared, "2026-03-09T10:00:00Z", { copper: 0.05 });

  // A blurred endpoint answered a week later by an iron reading "<0.05" (below detection, clear).
  suspicionAnswered = await createPool(companyId, { routeId: route, accountCode: "M-4" });
  await addTest(companyId, suspicionAnswered, "2026-03-02T10:00:00Z", { hardnessEndpoint: "blurred" });
  await addTest(companyId, suspicionAnswered, "2026-03-09T10:00:00Z", { iron: 0.05, ironBelowDetection: true });

  neverTested = await createPool(companyId, { routeId: route, accountCode: "M-5" });

  // 0.25 is below the default elevated level (0.3) but at or above this company's 0.2: open.
  belowDefaultButAboveCompany = await createPool(companyId, { routeId: route, accountCode: "M-6", street: "6 Copperleaf Way" });
  await addTest(companyId, belowDefaultButAboveCompany, "2026-03-02T10:00:00Z", { copper: 0.25 });

  otherRoutePool = await createPool(companyId, { routeId: otherRoute, accountCode: "M-7" });
  await addTest(companyId, otherRoutePool, "2026-03-02T10:00:00Z", { hardnessEndpoint: "blurred", copper: 0.9 });
});

afterAll(closeDatabase);

describe("metal marks on the visit list", () => {
  it("marks today's pools with a suspected metal or an open case, and only those", async () => {
    const page = (await callRoute(visitList.loader, requestAs(technician, "/visit"))).body as VisitPage;
    expect(page.stops.map((s) => s.poolId).sort((a, b) => a - b)).toEqual(
      [blurredOnly, copperStillOpen, copperCleared, suspicionAnswered, neverTested, belowDefaultButAboveCompany].sort((a, b) => a - b),
    );
    expect(page.marks).toEqual({
      [blurredOnly]: { suspected: true, openMetals: [] },
      [copperStillOpen]: { suspected: false, openMetals: ["copper"] },
      [belowDefaultButAboveCompany]: { suspected: false, openMetals: ["copper"] },
    });
  });

  it("marks search results too, and never a pool outside the technician's routes", async () => {
    const page = (await callRoute(visitList.loader, requestAs(technician, "/visit?q=Copperleaf"))).body as VisitPage;
    expect(page.found.map((p) => p.poolId)).toEqual([belowDefaultButAboveCompany]);
    expect(page.marks[belowDefaultButAboveCompany]).toEqual({ suspected: false, openMetals: ["copper"] });
    expect(page.marks[otherRoutePool]).toBeUndefined();
  });
});

describe("metal marks on the home page", () => {
  it("marks the technician's pools of today as /visit does, with the company's own levels", async () => {
    const page = (await callRoute(home.loader, requestAs(technician, "/"))).body as VisitPage;
    expect(page.stops).toHaveLength(6);
    // The same three pools as on /visit: M-1 blurred, M-2 0.15 not yet below 0.1, M-6 0.25 >= the company's 0.2.
    expect(page.marks).toEqual({
      [blurredOnly]: { suspected: true, openMetals: [] },
      [copperStillOpen]: { suspected: false, openMetals: ["copper"] },
      [belowDefaultButAboveCompany]: { suspected: false, openMetals: ["copper"] },
    });
  });
});
