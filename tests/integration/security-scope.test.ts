import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDatabase } from "~/.server/db/client";
import * as apiPool from "~/routes/api.pools.$poolId";
import * as apiTrend from "~/routes/api.analytics.trend";
import * as poolPage from "~/routes/pools.$poolId";
import * as sourcePage from "~/routes/sources.$sourceId";
import * as sourcesPage from "~/routes/sources";
import {
  createCompany,
  createFillSource,
  createMember,
  createPool,
  createRoute,
  type FixtureMember,
  requestAs,
} from "../fixtures/company";
import { callRoute } from "../fixtures/route-call";

let technician: FixtureMember;
let manager: FixtureMember;
let ownWell: number;
let neighbourWell: number;
let poolId: number;

beforeAll(async () => {
  const companyId = await createCompany();
  const ownRoute = await createRoute(companyId, "Own loop", "1");
  const otherRoute = await createRoute(companyId, "Other loop", "2");
  ownWell = await createFillSource(
    companyId,
    "Well at 4 Own Lane",
    "shared_well",
  );
  neighbourWell = await createFillSource(
    companyId,
    "Well at 9 Private Road",
    "shared_well",
  );
  poolId = await createPool(companyId, {
    routeId: ownRoute,
    accountCode: "SC-1",
    fillSourceId: ownWell,
  });
  await createPool(companyId, {
    routeId: otherRoute,
    accountCode: "SC-2",
    fillSourceId: neighbourWell,
  });
  technician = await createMember(companyId, "technician", [ownRoute]);
  manager = await createMember(companyId, "manager");
});

afterAll(closeDatabase);

describe("technicians see only the fill sources of their routes' pools", () => {
  it("in the list", async () => {
    const names = async (member: FixtureMember) =>
      (
        (await callRoute(sourcesPage.loader, requestAs(member, "/sources")))
          .body as { rows: { name: string }[] }
      ).rows.map((r) => r.name);
    expect(await names(technician)).toEqual(["Well at 4 Own Lane"]);
    expect(await names(manager)).toEqual([
      "Well at 4 Own Lane",
      "Well at 9 Private Road",
    ]);
  });

  it("on the source page: another route's well is not found, with its tests", async () => {
    const own = await callRoute(
      sourcePage.loader,
      requestAs(technician, `/sources/${ownWell}`),
      { sourceId: String(ownWell) },
    );
    expect(own.status).toBe(200);
    const other = await callRoute(
      sourcePage.loader,
      requestAs(technician, `/sources/${neighbourWell}`),
      { sourceId: String(neighbourWell) },
    );
    expect(other.status).toBe(404);
    expect(JSON.stringify(other.body)).not.toContain("Private Road");
    const asManager = await callRoute(
      sourcePage.loader,
      requestAs(manager, `/sources/${neighbourWell}`),
      { sourceId: String(neighbourWell) },
    );
    expect(asManager.status).toBe(200);
  });
});

describe("ids are plain positive integers", () => {
  it.each(["1e2", "0x10", "1.0", "0012", "+1", " 1"])(
    "the pool page refuses %j",
    async (written) => {
      // Each of these is a number to Number(); none names a pool.
      const outcome = await callRoute(
        poolPage.loader,
        requestAs(manager, `/pools/${encodeURIComponent(written)}`),
        { poolId: written },
      );
      expect(outcome.status).toBe(404);
    },
  );

  it("the pool API answers 400 naming the parameter, and the digits still work", async () => {
    const hex = await callRoute(
      apiPool.loader,
      requestAs(manager, "/api/pools/0x10"),
      { poolId: "0x10" },
    );
    expect(hex.status).toBe(400);
    expect(hex.body).toEqual({
      error: {
        code: "invalid_parameter",
        message:
          "poolId must be a positive whole number written in digits (like 12)",
        field: "poolId",
      },
    });
    const plain = await callRoute(
      apiPool.loader,
      requestAs(manager, `/api/pools/${poolId}`),
      { poolId: String(poolId) },
    );
    expect(plain.status).toBe(200);
  });

  it("the analytics route filter refuses 1e2", async () => {
    const outcome = await callRoute(
      apiTrend.loader,
      requestAs(manager, "/api/analytics/trend?route=1e2"),
    );
    expect(outcome.status).toBe(400);
    expect(outcome.body).toMatchObject({
      error: { code: "invalid_parameter", field: "route" },
    });
  });
});

describe("impossible dates are refused, not rolled over", () => {
  it.each(["2024-02-30", "2023-02-29", "2024-04-31"])(
    "from=%s",
    async (day) => {
      const outcome = await callRoute(
        apiTrend.loader,
        requestAs(manager, `/api/analytics/trend?from=${day}`),
      );
      expect(outcome.status).toBe(400);
      expect(outcome.body).toMatchObject({
        error: {
          code: "invalid_parameter",
          field: "from",
          message: expect.stringContaining("is not a calendar date"),
        },
      });
    },
  );

  it("a leap day is a date", async () => {
    expect(
      (
        await callRoute(
          apiTrend.loader,
          requestAs(manager, "/api/analytics/trend?from=2024-02-29"),
        )
      ).status,
    ).toBe(200);
  });
});
