// usage-vs-meter, demand-vs-meter, multiplier-suspect: planted problem + clean twin each.
// Re-pricing stub: 0.15 per kWh + 10.00 per kW (hand-computed amounts below).
import { describe, expect, it } from "vitest";
import { buildContext } from "../../../src/audit/context.ts";
import { checkDemandVsMeter } from "../../../src/audit/checks/demand-vs-meter.ts";
import { checkMultiplierSuspect, matchCommonRatio } from "../../../src/audit/checks/multiplier-suspect.ts";
import { checkUsageVsMeter } from "../../../src/audit/checks/usage-vs-meter.ts";
import type { Bill } from "../../../src/domain/types.ts";
import type { MeteredPeriod, RepriceFn } from "../../../src/audit/types.ts";
import { bill, computed, input, metered, portfolio, year } from "../fixtures.ts";

const reprice: RepriceFn = (_b, alt) =>
  alt.kind === "quantities" ? computed([["Energy", alt.usage * 0.15], ["Demand", (alt.demandKw ?? 0) * 10]]) : null;
const price = (usage: number, kw: number | null) => Math.round((usage * 0.15 + (kw ?? 0) * 10) * 100) / 100;

function ctxFor(bills: Bill[], m: (b: Bill, i: number) => MeteredPeriod | null, withReprice = true) {
  return buildContext(input(portfolio({ bills }), {
    metered: new Map(bills.map((b, i) => [b.billId, m(b, i)])),
    reprice: withReprice ? reprice : undefined,
  }));
}

describe("multiplier-suspect", () => {
  it("common-ratio matching (CT ratios; common practice)", () => {
    expect(matchCommonRatio(40.3, 0.02)).toBe(40);
    expect(matchCommonRatio(1 / 40.3, 0.02)).toBe(1 / 40);
    expect(matchCommonRatio(1.5, 0.02)).toBeNull();
  });
  it("planted: bills 5–7 billed × 2 of the meter → ONE error over 3 bills, Σ(300 − 150) = +450.00", () => {
    const bills = year(Array(12).fill(1000), (i) => (i >= 4 && i <= 6 ? { usage: 2000, total: price(2000, null) } : { total: price(1000, null) }));
    const f = checkMultiplierSuspect(ctxFor(bills, () => metered(1000)));
    expect(f).toHaveLength(1);
    expect(f[0]).toMatchObject({ check: "multiplier-suspect", severity: "error", amountAtStake: 450, billId: "E1:2024-05-01", periodStart: "2024-05-01", periodEnd: "2024-08-01" });
    expect(f[0].relatedBillIds).toEqual(["E1:2024-05-01", "E1:2024-06-01", "E1:2024-07-01"]);
  });
  it("planted ÷ 10: billed 100 vs metered 1,000 → ÷ 10 named, amount 15 − 150 = −135.00", () => {
    const bills = year(Array(12).fill(1000), (i) => (i === 8 ? { usage: 100, total: price(100, null) } : {}));
    const f = checkMultiplierSuspect(ctxFor(bills, () => metered(1000)));
    expect(f).toHaveLength(1);
    expect(f[0].amountAtStake).toBe(-135);
    expect(f[0].message).toContain("÷ 10");
  });
  it("every bill 40 × the interval data → one meter-level warning", () => {
    const bills = year(Array(12).fill(40_000));
    const f = checkMultiplierSuspect(ctxFor(bills, () => metered(1000)));
    expect(f).toHaveLength(1);
    expect(f[0]).toMatchObject({ severity: "warning", billId: null, amountAtStake: null });
    expect(f[0].message).toContain("× 40");
  });
  it("a jump against the meter's own history (40 → 80 on two bills) → one error", () => {
    const bills = year(Array(12).fill(40_000), (i) => (i === 2 || i === 3 ? { usage: 80_000 } : {}));
    const f = checkMultiplierSuspect(ctxFor(bills, () => metered(1000), false));
    expect(f.map((x) => x.severity).sort()).toEqual(["error", "warning"]);
    expect(f.find((x) => x.severity === "error")?.relatedBillIds).toEqual(["E1:2024-03-01", "E1:2024-04-01"]);
    expect(f.find((x) => x.severity === "warning")?.message).toContain("On 10 of 12 bills");
  });
  it("clean twin: billed within 2 % of metered on every bill → nothing", () => {
    const bills = year([1000, 1010, 990, 1005, 1000, 995, 1000, 1000, 1012, 1000, 988, 1000]);
    expect(checkMultiplierSuspect(ctxFor(bills, () => metered(1000)))).toEqual([]);
  });
});
