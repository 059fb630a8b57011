/** The page of one meter's bills, and the building page's summary that links to it (fixture: test/report/fixture.ts). */
import { describe, expect, it } from "vitest";
import { buildSiteModel } from "../../src/report/buildSiteModel.ts";
import { billAnchor } from "../../src/report/nav.ts";
import { exclusionText } from "../../src/report/baselineSection.ts";
import { fixtureInput } from "./fixture.ts";
import type { Dispute } from "../../src/disputes/types.ts";

/** A period nobody billed on E1: a back-billing risk that covers no bill. */
function gapRisk(): Dispute {
  return {
    disputeId: "D-gap-1",
    buildingId: "B1",
    meterId: "E1",
    account: null,
    billIds: [],
    periodStart: "2025-03-05",
    periodEnd: "2025-04-05",
    checks: ["period-gap"],
    basis: "gap",
    kind: "back-bill-risk",
    severity: "warning",
    billedTotal: 0,
    correctedTotal: 5715.45,
    claimAmount: -5715.45,
    correctedRange: { low: 5200, high: 6100 },
    title: "A month nobody billed",
    explanation: "",
    bills: [],
    relatedBillIds: ["E1-14"],
    notes: [],
  };
}

describe("meter bills pages", () => {
  const input = fixtureInput();
  input.disputes = [gapRisk()];
  const model = buildSiteModel(input);
  const e1 = model.meterBills.find((m) => m.meterId === "E1")!;
  const b1 = model.buildings.find((b) => b.buildingId === "B1")!;

  it("one page per meter, linking back to its building, every bill with a unique anchor", () => {
    expect(model.meterBills).toHaveLength(input.portfolio.meters.length);
    expect(e1.buildingHref).toBe("buildings/B1.html");
    const anchors = e1.bills.map((b) => b.anchor);
    expect(new Set(anchors).size).toBe(14);
    expect(anchors[0]).toBe(billAnchor("E1-01"));
  });

  it("every bill row links to an anchor that exists on the page", () => {
    const anchors = new Set(model.meterBills.flatMap((p) => p.bills.map((b) => `${p.path}#${b.anchor}`)));
    const hrefs = model.meterBills.flatMap((p) => p.billsTable.rows.map((r) => r[0].href!));
    expect(hrefs.length).toBe(input.portfolio.bills.length);
    for (const href of hrefs) expect(anchors.has(href), href).toBe(true);
  });

  it("lists a claim or risk that covers no bill on its own, with the dispute's figure", () => {
    expect(e1.otherClaims).toEqual([{ label: "Back-billing risk", amount: "−\u2060$5,715.45", title: "A month nobody billed", href: "claims/D-gap-1.html" }]);
  });

  it("the building page keeps one row per meter and no per-bill math", () => {
    expect(b1.metersTable.rows).toHaveLength(2);
    expect(b1.metersTable.columns.map((c) => c.label)).toContain("Claims");
    const json = JSON.stringify(b1);
    expect(json).not.toContain('"bases"');
    expect(json).not.toContain("quantity × rate");
  });

  it("no raw check-state code in any page model", () => {
    expect(JSON.stringify(model.meterBills)).not.toContain("needs-interval-data");
    expect(JSON.stringify(model.buildings)).not.toContain("needs-interval-data");
  });
});

describe("bills left out of a baseline", () => {
  it("name the audit check in words, not by its code", () => {
    expect(exclusionText("audit finding: duplicate-bill")).toBe("audit finding: the same period billed twice");
    expect(exclusionText("audit finding: usage-vs-meter")).toBe("audit finding: billed use and the meter disagree");
    expect(exclusionText("estimated read")).toBe("estimated read");
  });
});
