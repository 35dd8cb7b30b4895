import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDatabase, db } from "~/.server/db/client";
import { waterTests } from "~/.server/db/schema";
import * as poolPage from "~/routes/pools.$poolId";
import { createCompany, createMember, createRouteWithPool, requestAs, type FixtureMember } from "../fixtures/company";
import { callRoute } from "../fixtures/route-call";

let companyId: number;
let poolId: number;
let owner: FixtureMember;
let otherTechnician: FixtureMember;

type History = { total: number; page: number; pages: number; years: number[]; tests: Array<{ sampledAt: string | Date; copper: number | null }> };

beforeAll(async () => {
  companyId = await createCompany();
  ({ poolId } = await createRouteWithPool(companyId, "History run", "H-1"));
  const elsewhere = await createRouteWithPool(companyId, "Other run", "H-2");
  owner = await createMember(companyId, "owner");
  otherTechnician = await createMember(companyId, "technician", [elsewhere.routeId]);
  // 60 weekly tests from 2024-11-04 (UTC company): 9 in 2024, 51 in 2025; every third carries copper.
  const start = Date.UTC(2024, 10, 4, 15);
  await db()
    .insert(waterTests)
    .values(
      Array.from({ length: 60 }, (_, i) => ({
        companyId,
        poolId,
        sampledAt: new Date(start + i * 7 * 86_400_000),
        ph: 7.4,
        copper: i % 3 === 0 ? 0.1 : null,
      })),
    );
});

afterAll(closeDatabase);

async function historyAt(member: FixtureMember, search: string) {
  return callRoute(poolPage.loader, requestAs(member, `/pools/${poolId}${search}`), { poolId: String(poolId) });
}
const historyOf = (body: unknown) => (body as { history: History }).history;

describe("the pool page's test history", () => {
  it("pages 25 tests at a time, newest first, with the years on record", async () => {
    const first = historyOf((await historyAt(owner, "")).body);
    expect(first).toMatchObject({ total: 60, page: 1, pages: 3, years: [2025, 2024] });
    expect(first.tests).toHaveLength(25);
    const times = first.tests.map((t) => new Date(t.sampledAt).getTime());
    expect(times).toEqual([...times].sort((a, b) => b - a));
    // Page 3 holds the last 60 - 50 = 10, ending with the first test.
    const third = historyOf((await historyAt(owner, "?page=3")).body);
    expect(third.tests).toHaveLength(10);
    expect(new Date(third.tests.at(-1)!.sampledAt).toISOString()).toBe("2024-11-04T15:00:00.000Z");
  });

  it("narrows to a year and to metal tests", async () => {
    // 2024-11-04 to 2024-12-30: 9 weekly tests.
    expect(historyOf((await historyAt(owner, "?year=2024")).body)).toMatchObject({ total: 9, pages: 1 });
    // Every third of 60: 20 tests with copper.
    const metals = historyOf((await historyAt(owner, "?metal=only")).body);
    expect(metals).toMatchObject({ total: 20, pages: 1 });
    expect(metals.tests.every((t) => t.copper !== null)).toBe(true);
    // 2024's metal tests: weeks 0, 3, 6 -> 3.
    expect(historyOf((await historyAt(owner, "?year=2024&metal=only")).body).total).toBe(3);
  });

  it("answers a bad filter with 400 naming the parameter, and shows nothing of a pool off the member's routes", async () => {
    for (const [search, message] of [
      ["?page=abc", /^page: /],
      ["?page=0", /^page: /],
      ["?year=20x5", /^year: /],
      ["?metal=all", /^metal: /],
    ] as const) {
      const outcome = await historyAt(owner, search);
      expect(outcome.status).toBe(400);
      expect(String(outcome.body)).toMatch(message);
    }
    expect((await historyAt(otherTechnician, "")).status).toBe(404);
  });
});
