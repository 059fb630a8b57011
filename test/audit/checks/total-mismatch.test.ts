// total-mismatch, line-mismatch, unexplained-line, rate-suspect: planted problem + clean twin each.
// All amounts hand-computed from the fixture numbers.
import { describe, expect, it } from "vitest";
import { buildContext } from "../../../src/audit/context.ts";
import { checkLineMismatch } from "../../../src/audit/checks/line-mismatch.ts";
import { checkRateSuspect } from "../../../src/audit/checks/rate-suspect.ts";
import { checkTotalMismatch } from "../../../src/audit/checks/total-mismatch.ts";
import { checkUnexplainedLine } from "../../../src/audit/checks/unexplained-line.ts";
import type { RepriceFn } from "../../../src/audit/types.ts";
import { bill, computed, input, portfolio, printed } from "../fixtures.ts";

const own = computed([["Customer charge", 24.5], ["Energy", 120], ["Sales tax", 5.5]]); // 150.00

describe("total-mismatch", () => {
  const run = (total: number, c = own) => {
    const b = bill("2024-01-01", "2024-02-01", { total });
    return checkTotalMismatch(buildContext(input(portfolio({ bills: [b] }), { priced: new Map([[b.billId, c]]) })));
  };
  it("planted: billed 162.40 vs computed 150.00 → error, +12.40", () => {
    const [f, ...rest] = run(162.4);
    expect(rest).toEqual([]);
    expect(f).toMatchObject({ check: "total-mismatch", severity: "error", amountAtStake: 12.4, billId: "E1:2024-01-01" });
    expect(f.evidence.rows.at(-1)).toEqual({ label: "Total", billed: 162.4, expected: 150, difference: 12.4 });
  });
  it("planted undercharge is negative", () => {
    expect(run(140)[0].amountAtStake).toBe(-10);
  });
  it("clean twin: billed 150.00 → nothing", () => {
    expect(run(150)).toEqual([]);
  });
  // Regression (issue 11): a bill that was not compared must not read as a difference; its state
  // is shown with the bill and counted in the build summary instead.
  it("non-exact lines: not compared, so no finding even when the totals differ", () => {
    expect(run(999, computed([["Customer charge", 24.5], ["Energy", 120, "needs-interval-data"]]))).toEqual([]);
  });
  it("unpriced bill: not compared, no finding", () => {
    const b = bill("2024-01-01", "2024-02-01");
    expect(checkTotalMismatch(buildContext(input(portfolio({ bills: [b] }), { priced: new Map([[b.billId, null]]) })))).toEqual([]);
  });
  it("a mismatch carries the corrected bill: amount = billed − corrected total", () => {
    const [f] = run(180); // 30.00 above the tariff's 150.00
    expect(f.corrections).toHaveLength(1);
    expect(f.amountAtStake).toBeCloseTo(f.corrections![0].billedTotal - f.corrections![0].correctedTotal, 10);
  });
});
