import { describe, expect, it } from "vitest";
import { proposeMapping, readHeader } from "./propose-mapping";

// Abbreviations as route sheets write them (common practice of the trade's paperwork, no published source).
describe("headers written in short forms", () => {
  it.each([
    ["Svc Dt", "sampledAt"],
    ["Srv. Date", "sampledAt"],
    ["Vst Dt", "sampledAt"],
    ["Chem Added", "product"],
    ["Chem", "product"],
    ["Qty", "amount"],
    ["Amt", "amount"],
    ["Acct #", "accountCode"],
    ["Cust Name", "customerName"],
    ["Tot Alk", "totalAlkalinity"],
    ["Stab", "cyanuricAcid"],
    ["Calc Hardness", "calciumHardness"],
    ["Addr", "address"],
  ])("%s is read as %s", (header, field) => {
    expect(readHeader(header).field).toBe(field);
  });

  it("keeps a unit stated after an abbreviation", () => {
    expect(readHeader("Tmp F")).toEqual({ field: "temperatureC", unit: "degF", confidence: "abbreviation" });
    expect(readHeader("Cop ppb")).toEqual({ field: "copper", unit: "ugL", confidence: "abbreviation" });
  });

  it("says how each reading was reached", () => {
    expect(readHeader("Service Date").confidence).toBe("exact");
    expect(readHeader("Svc Dt").confidence).toBe("abbreviation");
    expect(readHeader("Last visit date")).toEqual({ field: "sampledAt", confidence: "partial" });
    expect(readHeader("Favourite colour")).toEqual({ field: "ignore" });
  });

  it("does not read a header from one general word", () => {
    expect(readHeader("Customer phone").field).toBe("ignore");
    expect(readHeader("Water level").field).toBe("ignore");
    expect(readHeader("Service tech").field).toBe("ignore");
  });

  it("proposes a whole abbreviated log, each field once, and stores no confidence in the mapping", () => {
    const proposal = proposeMapping(["Acct #", "Svc Dt", "Chem Added", "Qty", "Unit", "pH", "Tot Alk", "Cu", "Last visit date"]);
    expect(proposal.map((c) => c.field)).toEqual([
      "accountCode", "sampledAt", "product", "amount", "amountUnit", "ph", "totalAlkalinity", "copper", "ignore",
    ]);
    expect(proposal.every((c) => !("confidence" in c))).toBe(true);
  });
});
