import { afterAll, describe, expect, it } from "vitest";
import { closeDatabase } from "~/.server/db/client";
import * as apiPool from "~/routes/api.pools.$poolId";
import * as apiTrend from "~/routes/api.analytics.trend";
import * as poolPage from "~/routes/pools.$poolId";
import * as sourcePage from "~/routes/sources.$sourceId";
import * as sourcesPage from "~/routes/sources";
import { type FixtureMember, requestAs } from "../fixtures/company";
import { routeBookPerFile } from "../fixtures/route-book";
import { callRoute } from "../fixtures/route-call";

const book = routeBookPerFile({
  routes: { own: "Own loop", other: { name: "Other loop", weekdays: "2" } },
  sources: {
    ownWell: { name: "Well at 4 Own Lane", kind: "shared_well" },
    neighbourWell: { name: "Well at 9 Private Road", kind: "shared_well" },
  },
  pools: {
    own: { route: "own", accountCode: "SC-1", source: "ownWell" },
    other: { route: "other", accountCode: "SC-2", source: "neighbourWell" },
  },
  members: { technician: { role: "technician", routes: ["own"] }, manager: "manager" },
});
const { technician, manager } = book.member;

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
      requestAs(technician, `/sources/${book.source.ownWell}`),
      { sourceId: String(book.source.ownWell) },
    );
    expect(own.status).toBe(200);
    const other = await callRoute(
      sourcePage.loader,
      requestAs(technician, `/sources/${book.source.neighbourWell}`),
      { sourceId: String(book.source.neighbourWell) },
    );
    expect(other.status).toBe(404);
    expect(JSON.stringify(other.body)).not.toContain("Private Road");
    const asManager = await callRoute(
      sourcePage.loader,
      requestAs(manager, `/sources/${book.source.neighbourWell}`),
      { sourceId: String(book.source.neighbourWell) },
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
      requestAs(manager, `/api/pools/${book.pool.own}`),
      { poolId: String(book.pool.own) },
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
