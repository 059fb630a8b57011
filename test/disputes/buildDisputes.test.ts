// buildDisputes and the disputes.csv contract (outputs.md "disputes"), on hand-made findings.
import { describe, expect, it } from "vitest";
import { buildDisputes, disputesCsv, DISPUTES_CSV_COLUMNS } from "../../src/disputes/index.ts";
import type { CorrectedBill, Finding } from "../../src/audit/types.ts";
import { bill, meter } from "../audit/fixtures.ts";

const b1 = bill("2024-01-01", "2024-02-01", { billId: "E1-01", total: 150 });
const b2 = bill("2024-02-01", "2024-03-01", { billId: "E1-02", total: 90 });
const fix = (b: typeof b1, corrected: number): CorrectedBill => ({
  billId: b.billId, periodStart: b.periodStart, periodEnd: b.periodEnd, billedTotal: b.total, correctedTotal: corrected, corrected: null, usage: null, demandKw: null, correctedOn: "test",
});
const finding = (over: Partial<Finding>): Finding => ({
  buildingId: "B1", meterId: "E1", billId: "E1-01", periodStart: "2024-01-01", periodEnd: "2024-02-01", check: "total-mismatch", severity: "error",
  amountAtStake: 30, title: "Bill total higher than the tariff gives", message: "m", evidence: { rows: [], notes: [] }, ...over,
});
const run = (findings: Finding[]) => buildDisputes({ findings, bills: [b1, b2], meters: [meter({ account: "ACC-1" })], billLines: [] });

describe("buildDisputes", () => {
  it("a money finding is a claim: billed, corrected, claim = billed − corrected, the basis of its check", () => {
    const [d] = run([finding({ corrections: [fix(b1, 120)] })]);
    expect(d).toMatchObject({ kind: "claim", basis: "tariff", billedTotal: 150, correctedTotal: 120, claimAmount: 30, account: "ACC-1", billIds: ["E1-01"] });
  });
  it("a bill billed too low is a back-billing risk, not a claim", () => {
    const [d] = run([finding({ amountAtStake: -10, corrections: [fix(b1, 160)] })]);
    expect(d).toMatchObject({ kind: "back-bill-risk", claimAmount: -10 });
  });
  it("info findings, findings without corrections and zero claims are not disputes", () => {
    expect(run([
      finding({ severity: "info", corrections: [fix(b1, 120)] }),
      finding({ check: "usage-outlier", amountAtStake: null }),
      finding({ corrections: [fix(b1, 150)], amountAtStake: 0 }),
    ])).toEqual([]);
  });
  it("a bill is claimed once: the larger dispute keeps it, the other is a note on it", () => {
    const ds = run([
      finding({ corrections: [fix(b1, 140)], amountAtStake: 10 }),
      finding({ check: "period-overlap", corrections: [fix(b1, 100)], amountAtStake: 50, title: "Bill period overlaps an earlier bill" }),
    ]);
    expect(ds).toHaveLength(1);
    expect(ds[0]).toMatchObject({ basis: "overlap", claimAmount: 50, checks: ["period-overlap", "total-mismatch"] });
    expect(ds[0].notes.at(-1)).toContain("not claimed separately");
  });
  it("claims first, largest first; then back-billing risks; ids stable, file-safe and distinct", () => {
    const f = [
      finding({ corrections: [fix(b1, 140)], amountAtStake: 10 }),
      finding({ billId: "E1-02", check: "duplicate-bill", corrections: [fix(b2, 0)], amountAtStake: 90 }),
      finding({ billId: null, check: "period-gap", severity: "warning", periodStart: "2024-03-01", periodEnd: "2024-04-01", amountAtStake: -200,
        corrections: [{ billId: null, periodStart: "2024-03-01", periodEnd: "2024-04-01", billedTotal: 0, correctedTotal: 200, corrected: null, usage: 1, demandKw: null, correctedOn: "x", range: { low: 180, high: 220 } }] }),
    ];
    const ds = run(f);
    expect(ds.map((d) => [d.basis, d.claimAmount])).toEqual([["duplicate", 90], ["tariff", 10], ["gap", -200]]);
    expect(ds[2]).toMatchObject({ billIds: [], correctedRange: { low: 180, high: 220 }, kind: "back-bill-risk" });
    expect(run(f).map((d) => d.disputeId)).toEqual(ds.map((d) => d.disputeId));
    expect(new Set(ds.map((d) => d.disputeId)).size).toBe(3);
    for (const d of ds) expect(d.disputeId).toMatch(/^D-[0-9a-f]{8}$/);
  });
});

describe("disputes.csv", () => {
  it("has the contract's columns in order, money with two decimals, lists `;`-separated", () => {
    const multi = finding({ check: "multiplier-suspect", corrections: [fix(b1, 75), fix(b2, 45)], amountAtStake: 120 });
    const text = disputesCsv(run([multi]));
    const [header, row] = text.trim().split("\n");
    expect(header).toBe("dispute_id,building_id,meter_id,account,bill_ids,period_start,period_end,checks,basis,billed_total,corrected_total,claim_amount,kind,explanation");
    expect(DISPUTES_CSV_COLUMNS).toHaveLength(14);
    expect(row).toContain(",B1,E1,ACC-1,E1-01;E1-02,2024-01-01,2024-03-01,multiplier-suspect,multiplier,240.00,120.00,120.00,claim,m");
  });
});
