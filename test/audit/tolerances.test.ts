import { describe, expect, it } from "vitest";
import { exceedsMoneyTolerance, exceedsPct, resolveTolerances } from "../../src/audit/tolerances.ts";
import { runAudit } from "../../src/audit/index.ts";
import { bill, computed, input, portfolio } from "./fixtures.ts";
import { toCents } from "../../src/core/money.ts";

// Rule from the input contract (portfolio.yaml tolerances): a money difference is a finding only
// when it exceeds BOTH cost_abs and cost_pct. Values below hand-computed with cost_abs 1.00, cost_pct 0.5.
const tol = { costAbs: 1, costPct: 0.5 };

describe("exceedsMoneyTolerance (hand-computed at the boundary)", () => {
  it("is false exactly at cost_abs and true one cent above", () => {
    expect(exceedsMoneyTolerance(1.0, 100, tol)).toBe(false);
    expect(exceedsMoneyTolerance(1.01, 100, tol)).toBe(true);
    expect(exceedsMoneyTolerance(-1.01, 100, tol)).toBe(true);
  });
  it("needs the percent limit too: 0.5 % of 300 = 1.50", () => {
    expect(exceedsMoneyTolerance(1.01, 300, tol)).toBe(false); // beyond cost_abs only
    expect(exceedsMoneyTolerance(1.5, 300, tol)).toBe(false); // exactly at cost_pct
    expect(exceedsMoneyTolerance(1.51, 300, tol)).toBe(true);
  });
  it("needs cost_abs too: 0.80 on 10.00 is 8 % but under 1.00", () => {
    expect(exceedsMoneyTolerance(0.8, 10, tol)).toBe(false);
  });
  it("is not fooled by binary floating point (2.14 − 1.14 is 1.00)", () => {
    expect(2.14 - 1.14).toBeGreaterThan(1); // the float difference is a hair above 1
    expect(exceedsMoneyTolerance(2.14 - 1.14, 100, tol)).toBe(false);
  });
  it("rounds half away from zero to the cent", () => {
    expect(toCents(1.005)).toBe(101);
    expect(toCents(-1.005)).toBe(-101);
  });
});

describe("exceedsPct", () => {
  it("is strict at the limit (hand-computed)", () => {
    expect(exceedsPct(102, 100, 2)).toBe(false);
    expect(exceedsPct(102.01, 100, 2)).toBe(true);
    expect(exceedsPct(97.99, 100, 2)).toBe(true);
  });
});

describe("tolerances in a full audit (total-mismatch at the boundary)", () => {
  const run = (billed: number) => {
    const b = bill("2024-01-01", "2024-02-01", { total: billed });
    return runAudit(input(portfolio({ bills: [b] }), { priced: new Map([[b.billId, computed([["Energy", 300]])]]) }));
  };
  it("300.00 computed: 301.50 billed is within 0.5 %, 301.51 is a finding of 1.51", () => {
    expect(run(301.5)).toEqual([]);
    const f = run(301.51);
    expect(f).toHaveLength(1);
    expect(f[0].amountAtStake).toBe(1.51);
  });
  it("portfolio tolerances win over defaults; overrides win over both", () => {
    const t = resolveTolerances({ usagePct: 2, demandPct: 3, costAbs: 5, costPct: 1 }, { minCoverage: 0.8 });
    expect(t).toMatchObject({ costAbs: 5, costPct: 1, minCoverage: 0.8, estimateStreakMin: 2 });
  });
});
