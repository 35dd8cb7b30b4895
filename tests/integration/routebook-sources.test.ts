import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDatabase, db } from "~/.server/db/client";
import { fillSources, sourceTests } from "~/.server/db/schema";
import * as sourceEdit from "~/routes/sources.$sourceId.edit";
import * as sourceNew from "~/routes/sources.new";
import * as sourcePage from "~/routes/sources.$sourceId";
import { createCompany, createFillSource, requestAs } from "../fixtures/company";
import { fieldErrors, postForm } from "../fixtures/forms";
import { routeBookPerFile } from "../fixtures/route-book";
import { callRoute } from "../fixtures/route-call";

const book = routeBookPerFile({
  routes: { source: "Source loop", otherSource: { name: "Other source loop", weekdays: "2" } },
  sources: { well: { name: "Ridge well", kind: "shared_well" } },
  pools: { "S-1": { route: "source", source: "well" }, "S-2": { route: "otherSource", source: "well" } },
  members: { manager: "manager", technician: { role: "technician", routes: ["source"] } },
});
const { manager, technician } = book.member;
let otherCompanySource: number;

beforeAll(async () => {
  otherCompanySource = await createFillSource(await createCompany(), "Their well");
});

afterAll(closeDatabase);

const testPost = (sourceId: number, fields: Record<string, string>, member = manager) =>
  postForm(sourcePage.action, member, `/sources/${sourceId}`, fields, { sourceId: String(sourceId) });

describe("fill sources", () => {
  it("creates a source and refuses an unknown kind, naming the value", async () => {
    const made = await postForm(sourceNew.action, manager, "/sources/new", { name: "Town main", kind: "municipal" });
    const [stored] = await db().select().from(fillSources).where(and(eq(fillSources.companyId, book.companyId), eq(fillSources.name, "Town main")));
    expect(made).toMatchObject({ status: 302, location: `/sources/${stored?.id}` });
    const wrong = await postForm(sourceNew.action, manager, "/sources/new", { name: "River", kind: "river" });
    expect(fieldErrors(wrong).kind).toBe('Kind: "river" is not one of municipal, private_well, shared_well, trucked, other.');
  });

  it("names the field on a repeated name, and refuses technicians", async () => {
    const again = await postForm(sourceNew.action, manager, "/sources/new", { name: "Town main", kind: "municipal" });
    expect(again.status).toBe(409);
    expect(fieldErrors(again).name).toContain('"Town main" is already used');
    expect((await postForm(sourceNew.action, technician, "/sources/new", { name: "Tech well", kind: "private_well" })).status).toBe(403);
  });

  it("answers 404 when editing another company's source", async () => {
    const outcome = await postForm(sourceEdit.action, manager, `/sources/${otherCompanySource}/edit`, { name: "Mine now", kind: "other" }, { sourceId: String(otherCompanySource) });
    expect(outcome.status).toBe(404);
  });
});

describe("source tests", () => {
  it("stores metals with a detection limit, and a repeated submit once", async () => {
    const form = { sampledOn: "2026-02-03", copper: "0.35", iron: "<0.05", manganese: "" };
    expect((await testPost(book.source.well, form)).body).toMatchObject({ ok: true, repeated: false });
    expect((await testPost(book.source.well, form)).body).toMatchObject({ ok: true, repeated: true });
    const stored = await db().select().from(sourceTests).where(eq(sourceTests.fillSourceId, book.source.well));
    expect(stored).toMatchObject([{ copper: 0.35, copperBelowDetection: false, iron: 0.05, ironBelowDetection: true, manganese: null }]);
  });

  it("refuses a missing date, a bad number and no metal at all, naming the fields", async () => {
    const outcome = await testPost(book.source.well, { sampledOn: "", copper: "lots" });
    expect(fieldErrors(outcome).sampledOn).toBe("Sampled on: enter a date.");
    expect(fieldErrors(outcome).copper).toContain('Copper: "lots" is not a number');
    const empty = await testPost(book.source.well, { sampledOn: "2026-02-04" });
    expect(fieldErrors(empty).copper).toBe("Copper: enter at least one metal result.");
  });

  it("is refused to technicians and answers 404 for another company's source", async () => {
    expect((await testPost(book.source.well, { sampledOn: "2026-02-05", copper: "0.1" }, technician)).status).toBe(403);
    expect((await testPost(otherCompanySource, { sampledOn: "2026-02-05", copper: "0.1" })).status).toBe(404);
  });

  it("shows a technician only their own pools on the source page", async () => {
    const body = (await callRoute(sourcePage.loader, requestAs(technician, `/sources/${book.source.well}`), { sourceId: String(book.source.well) })).body as {
      detail: { pools: Array<{ accountCode: string }>; tests: unknown[] };
    };
    expect(body.detail.pools.map((p) => p.accountCode)).toEqual(["S-1"]);
    expect(body.detail.tests).toHaveLength(1);
  });
});
