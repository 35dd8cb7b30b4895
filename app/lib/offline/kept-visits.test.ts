import { describe, expect, it } from "vitest";
import { TREATMENT_FIELDS } from "~/lib/forms/visit";
import { KEPT_FIELDS, keptVisitFrom, resendForm, typedValuesOf } from "./kept-visits";
import { isKeepVisitPagesMessage, isVisitPage, visitPagesFor, withoutRouteFilter } from "./visit-pages";

const now = new Date("2026-12-02T09:45:00.000Z");

function visitForm(extra: Array<[string, string]> = []): FormData {
  const form = new FormData();
  for (const [name, value] of [
    ["submissionKey", "2f0c9a4e-5b7d-4c1e-9f3a-8d6b2e1c0a95"],
    [KEPT_FIELDS.poolLabel, "11 Slate Terrace · S. Yarwood"],
    [KEPT_FIELDS.memberId, "member-7"],
    ["ph", "7.5"],
    ["treatmentProduct", "3"],
    ["treatmentAmount", "2"],
    ["treatmentUnit", "L"],
    ["treatmentProduct", "5"],
    ["treatmentAmount", "0.5"],
    ["treatmentUnit", "kg"],
    ...extra,
  ] as Array<[string, string]>)
    form.append(name, value);
  return form;
}

describe("a visit kept on the phone", () => {
  it("keeps every field as typed, in order, with the moment it was saved", () => {
    const visit = keptVisitFrom(visitForm(), 42, now)!;
    expect(visit).toMatchObject({ key: "2f0c9a4e-5b7d-4c1e-9f3a-8d6b2e1c0a95", poolId: 42, memberId: "member-7", state: "waiting", answer: null });
    expect(visit.poolLabel).toBe("11 Slate Terrace · S. Yarwood");
    expect(visit.fields.filter(([name]) => name === "treatmentAmount")).toEqual([["treatmentAmount", "2"], ["treatmentAmount", "0.5"]]);
    expect(visit.fields.at(-1)).toEqual([KEPT_FIELDS.takenAt, "2026-12-02T09:45:00.000Z"]);
  });

  it("keeps the first saved moment when a fixed visit is saved again", () => {
    const visit = keptVisitFrom(visitForm([[KEPT_FIELDS.takenAt, "2026-12-02T08:00:00.000Z"]]), 42, now)!;
    expect(visit.fields.filter(([name]) => name === KEPT_FIELDS.takenAt)).toEqual([[KEPT_FIELDS.takenAt, "2026-12-02T08:00:00.000Z"]]);
  });

  it("is not kept without a well-formed submission key (the server answers such a form itself)", () => {
    const form = visitForm();
    form.set("submissionKey", "");
    expect(keptVisitFrom(form, 42, now)).toBeNull();
  });

  it("is sent again as the same fields, marked as a resend, and read back into the form's typed values", () => {
    const visit = keptVisitFrom(visitForm(), 42, now)!;
    const again = resendForm(visit);
    expect(again.get(KEPT_FIELDS.resend)).toBe("1");
    expect(again.getAll("treatmentProduct")).toEqual(["3", "5"]);
    expect(again.get("submissionKey")).toBe(visit.key);
    const typed = typedValuesOf(visit, TREATMENT_FIELDS);
    expect(typed).toMatchObject({ ph: "7.5", treatmentProduct: ["3", "5"], treatmentAmount: ["2", "0.5"], treatmentUnit: ["L", "kg"] });
    // A form without a resend mark is kept without it.
    expect(keptVisitFrom(again, 42, now)!.fields.some(([name]) => name === KEPT_FIELDS.resend)).toBe(false);
  });
});

describe("the visit pages the service worker keeps", () => {
  it("are the list and each pool's form, as pages and as React Router's data requests", () => {
    expect(visitPagesFor([7, 9], true)).toEqual(["/visit", "/visit.data", "/visit/7", "/visit/7.data", "/visit/9", "/visit/9.data"]);
    for (const path of ["/visit", "/visit.data", "/visit/12", "/visit/12.data"]) expect(isVisitPage(new URL(path, "http://x.test")), path).toBe(true);
    for (const path of ["/visits", "/visit/12/edit", "/pools/12.data", "/visit/abc"]) expect(isVisitPage(new URL(path, "http://x.test")), path).toBe(false);
  });

  it("answer a data request for some routes from the copy with every route's data", () => {
    expect(withoutRouteFilter("http://x.test/visit/12.data?_routes=routes%2Fvisit.%24poolId")).toBe("http://x.test/visit/12.data");
    expect(withoutRouteFilter("http://x.test/visit.data?q=slate&_routes=routes%2Fvisit")).toBe("http://x.test/visit.data?q=slate");
  });

  it("are only visit pages when a page asks the worker to keep them", () => {
    expect(isKeepVisitPagesMessage({ type: "keep-visit-pages", paths: ["/visit", "/visit/3.data"] })).toBe(true);
    expect(isKeepVisitPagesMessage({ type: "keep-visit-pages", paths: ["/visit", "/team"] })).toBe(false);
    expect(isKeepVisitPagesMessage({ type: "keep-visit-pages", paths: "/visit" })).toBe(false);
    expect(isKeepVisitPagesMessage(null)).toBe(false);
  });
});
