/**
 * The bills table and each bill's re-pricing on its two bases. Expected values are hand-computed
 * from the fixture (test/report/fixture.ts) and the bills planted below.
 */
import { describe, expect, it } from "vitest";
import type { Bill } from "../../src/domain/types.ts";
import type { ComputedBill } from "../../src/tariff/types.ts";
import type { PricedBill } from "../../src/tariff/index.ts";
import type { Dispute, DisputeBill } from "../../src/disputes/types.ts";
import type { ReportInput } from "../../src/report/input.ts";
import type { TableModel } from "../../src/report/siteModel.ts";
import { billDetail, billsTable, checkStateText, claimsByBill, shortPeriod } from "../../src/report/billTables.ts";
import { fixtureInput } from "./fixture.ts";

/** A two-line bill: customer charge $25 and energy, every line exact unless `status` says otherwise. */
function computedBill(total: number, status: "exact" | "estimated" = "exact"): ComputedBill {
  const energy = Math.round((total - 25) * 100) / 100;
  return {
    lines: [
      { label: "Customer charge", kind: "fixed", quantity: 1, unit: "bill", rate: 25, amount: 25, note: null, status: "exact" },
      { label: "Energy", kind: "energy", quantity: 1000, unit: "kWh", rate: energy / 1000, amount: energy, note: null, status },
    ],
    total,
    billingDemandKw: null,
    versions: [{ from: "2023-01-01", days: 31, weight: 1 }],
    exact: status === "exact",
    notes: [],
  };
}

function disputeBill(bill: Bill, claimAmount: number): DisputeBill {
  return {
    billId: bill.billId,
    periodStart: bill.periodStart,
    periodEnd: bill.periodEnd,
    billedTotal: bill.total,
    correctedTotal: Math.round((bill.total - claimAmount) * 100) / 100,
    claimAmount,
    readType: bill.readType,
    usageUnit: "kWh",
    billedUsage: bill.usage,
    meteredUsage: null,
    correctedUsage: null,
    billedDemandKw: null,
    meteredDemandKw: null,
    correctedDemandKw: null,
    tariffId: "T-electricity",
    versions: [],
    lines: [],
    notes: [],
    correctedOn: "billed usage",
  };
}

function dispute(id: string, bills: DisputeBill[], claimAmount: number, kind: Dispute["kind"] = "claim"): Dispute {
  return {
    disputeId: id,
    buildingId: "B1",
    meterId: "E1",
    account: null,
    billIds: bills.map((b) => b.billId),
    periodStart: bills[0]?.periodStart ?? "2024-01-05",
    periodEnd: bills[bills.length - 1]?.periodEnd ?? "2024-02-05",
    checks: ["usage-vs-meter"],
    basis: "meter",
    kind,
    severity: "error",
    billedTotal: 0,
    correctedTotal: 0,
    claimAmount,
    correctedRange: null,
    title: "Billed usage is higher than the meter recorded",
    explanation: "",
    bills,
    relatedBillIds: [],
    notes: [],
  };
}

/** The fixture with E1-06 exact on both bases, E1-07 estimated, and a claim over E1-06 and E1-08. */
function plantedInput(): { input: ReportInput; e1: Bill[] } {
  const input = fixtureInput();
  const e1 = input.portfolio.bills.filter((b) => b.meterId === "E1");
  const [b6, b7, b8] = [e1[5], e1[6], e1[7]];
  const priced = input.priced as Map<string, PricedBill>;
  // E1-06: billed total − $100.00 on billed quantities, − $1,381.20 on metered quantities.
  priced.set(b6.billId, {
    computed: computedBill(Math.round((b6.total - 100) * 100) / 100),
    error: null,
    metered: computedBill(Math.round((b6.total - 1381.2) * 100) / 100),
    meteredUsage: 12_345.5,
    meteredDemandKw: 42.25,
  });
  // E1-07: a time-of-use split by the building's load shape: $250 below the bill, but an estimate.
  priced.set(b7.billId, { computed: computedBill(Math.round((b7.total - 250) * 100) / 100, "estimated"), error: null });
  priced.set(b8.billId, { computed: computedBill(b8.total), error: null });
  // Per-bill claims whose sum is not a "round" float (0.1 + 0.2 style): each shown as stated.
  input.disputes = [dispute("D-meter-1", [disputeBill(b6, 1381.2), disputeBill(b8, 0.3)], 1381.5)];
  return { input, e1 };
}

function column(t: TableModel, label: string): number {
  const i = t.columns.findIndex((c) => c.label === label);
  expect(i, label).toBeGreaterThanOrEqual(0);
  return i;
}

function rowOf(t: TableModel, billId: string) {
  const row = t.rows.find((r) => r[0].text === billId);
  expect(row, billId).toBeDefined();
  return row!;
}

describe("bills table", () => {
  const { input, e1 } = plantedInput();
  const meter = input.portfolio.meters.find((m) => m.meterId === "E1")!;
  const table = billsTable([meter], e1, input, "USD");

  it("a bill with state estimated shows its state in words and no difference", () => {
    const row = rowOf(table, "E1-07");
    const diff = row[column(table, "Difference (billed quantities)")];
    expect(diff).toEqual({ text: "estimated from the building's load shape", sort: "", tone: "muted" });
    expect(row[column(table, "Re-priced on billed quantities")]).toMatchObject({ tone: "muted" });
    expect(row[column(table, "Re-priced on billed quantities")].text).toMatch(/\(estimate\)$/);
    // Neither a signed amount nor a red/green tone anywhere on the row.
    expect(row.some((c) => /^[+−]\$/u.test(c.text))).toBe(false);
    expect(row.some((c) => c.tone === "pos" || c.tone === "neg")).toBe(false);
    const detail = billDetail(e1[6], meter, input, [], claimsByBill(input.disputes, "USD"), "USD");
    expect(detail.stateText).toBe("estimated from the building's load shape");
    expect(detail.bases[0]).toMatchObject({ basis: "billed", difference: null });
    expect(detail.bases[0].stateText).toMatch(/load shape/);
  });

  it("a bill that needs interval data says so (the fixture's bills), never the raw code", () => {
    const row = rowOf(table, "E1-05");
    expect(row[column(table, "Difference (billed quantities)")].text).toBe("needs interval data");
    expect(JSON.stringify(table)).not.toContain("needs-interval-data");
    expect(checkStateText("not-priced", { computed: null, error: "tariff T9 not found" })).toBe("not re-priced: tariff T9 not found");
  });

  it("a bill with both bases shows both, each labelled, each with its own difference (hand-computed)", () => {
    const row = rowOf(table, "E1-06");
    const b6 = e1[5];
    expect(row[column(table, "Re-priced on billed quantities")].text).toBe(new Intl.NumberFormat("en-US", { style: "currency", currency: "USD" }).format(b6.total - 100));
    expect(row[column(table, "Difference (billed quantities)")]).toEqual({ text: "+\u2060$100.00", sort: "100", tone: "pos" });
    expect(row[column(table, "Re-priced on metered quantities")].text).toBe(new Intl.NumberFormat("en-US", { style: "currency", currency: "USD" }).format(b6.total - 1381.2));
    expect(row[column(table, "Difference (metered quantities)")]).toEqual({ text: "+\u2060$1,381.20", sort: "1381.2", tone: "pos" });
    // A bill without interval data for its period: no metered figure, no metered difference.
    const other = rowOf(table, "E1-08");
    expect(other[column(table, "Re-priced on metered quantities")].text).toBe("no interval data");
    expect(other[column(table, "Difference (metered quantities)")].text).toBe("—");

    const detail = billDetail(b6, meter, input, [], claimsByBill(input.disputes, "USD"), "USD");
    expect(detail.bases.map((b) => [b.basis, b.heading, b.difference])).toEqual([
      ["billed", "Re-priced on the billed quantities", "+\u2060$100.00"],
      ["metered", "Re-priced on the metered quantities", "+\u2060$1,381.20"],
    ]);
    expect(detail.bases[1].facts).toEqual(
      expect.arrayContaining([
        { label: "Usage priced (metered)", value: "12,346 kWh" },
        { label: "Demand priced (metered peak)", value: "42.25 kW" },
      ]),
    );
  });

  it("without any metered basis the metered columns are left out", () => {
    const plain = fixtureInput();
    const t = billsTable([meter], plain.portfolio.bills.filter((b) => b.meterId === "E1"), plain, "USD");
    expect(t.columns.map((c) => c.label)).not.toContain("Re-priced on metered quantities");
    expect(t.columns.map((c) => c.label)).not.toContain("Claim");
  });

  it("the claim cell is the dispute's own per-bill claim to the cent, linked to its claim sheet", () => {
    const i = column(table, "Claim");
    const [d] = input.disputes!;
    for (const db of d.bills) {
      const cell = rowOf(table, db.billId)[i];
      expect(cell.href).toBe("claims/D-meter-1.html");
      expect(cell.text).toBe(new Intl.NumberFormat("en-US", { style: "currency", currency: "USD" }).format(db.claimAmount));
      expect(Number(cell.sort)).toBe(db.claimAmount);
    }
    expect(rowOf(table, "E1-06")[i].text).toBe("$1,381.20");
    expect(rowOf(table, "E1-08")[i].text).toBe("$0.30");
    expect(rowOf(table, "E1-07")[i].text).toBe("—");
  });

  it("a back-billing risk is named as such, with the dispute's figure", () => {
    const { input: risky, e1: bills } = plantedInput();
    risky.disputes = [dispute("D-low-1", [disputeBill(bills[8], -512.34)], -512.34, "back-bill-risk")];
    const t = billsTable([meter], bills, risky, "USD");
    expect(rowOf(t, "E1-09")[column(t, "Claim")]).toMatchObject({ text: "back-billing risk −\u2060$512.34", href: "claims/D-low-1.html" });
  });

  it("links each bill to its anchor on the meter's bills page and shortens periods within a year", () => {
    expect(rowOf(table, "E1-06")[0].href).toBe("bills/B1/E1.html#bill-E1-06");
    expect(shortPeriod("2025-04-08", "2025-05-08")).toBe("Apr 8 – May 7, 2025");
    expect(shortPeriod("2024-12-05", "2025-01-05")).toBe("Dec 5, 2024 – Jan 4, 2025");
  });
});

describe("printed lines beside the tariff's", () => {
  it("matches labels ignoring case and spaces, shows printed − tariff only for exact charges, lists printed charges the tariff lacks", () => {
    const { input, e1 } = plantedInput();
    const meter = input.portfolio.meters.find((m) => m.meterId === "E1")!;
    const b6 = e1[5];
    const energy = Math.round((b6.total - 100 - 25) * 100) / 100;
    const source = { file: "bill_lines.csv", line: 2 };
    const printed = [
      { billId: b6.billId, label: "  customer   CHARGE ", amount: 25, source },
      { billId: b6.billId, label: "ENERGY", amount: Math.round((energy + 60) * 100) / 100, source },
      { billId: b6.billId, label: "Late fee", amount: 40, source },
    ];
    const d = billDetail(b6, meter, input, printed, new Map(), "USD");
    const billed = d.bases[0];
    expect(billed.showPrinted).toBe(true);
    expect(billed.lines.map((l) => [l.label, l.printed, l.printedDifference])).toEqual([
      ["Customer charge", "$25.00", "$0.00"],
      ["Energy", new Intl.NumberFormat("en-US", { style: "currency", currency: "USD" }).format(energy + 60), "+\u2060$60.00"],
    ]);
    expect(billed.unmatchedPrinted).toEqual([{ label: "Late fee", amount: "$40.00" }]);
    // The metered basis is never set beside the printed (billed-quantity) lines.
    expect(d.bases[1]).toMatchObject({ basis: "metered", showPrinted: false, unmatchedPrinted: [] });
    expect(d.bases[1].lines.every((l) => l.printed === "")).toBe(true);
  });
});
