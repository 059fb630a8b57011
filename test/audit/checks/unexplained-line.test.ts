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

describe("unexplained-line", () => {
  const run = (label: string, amount: number) => {
    const b = bill("2024-01-01", "2024-02-01", { total: 150 + amount });
    const lines = [printed(b.billId, "Customer charge", 24.5), printed(b.billId, "Energy", 120), printed(b.billId, "Sales tax", 5.5), printed(b.billId, label, amount)];
    return checkUnexplainedLine(buildContext(input(portfolio({ bills: [b], billLines: lines }), { priced: new Map([[b.billId, own]]) })));
  };
  it("planted: 'Meter reading surcharge' 18.75 → warning, +18.75", () => {
    const f = run("Meter reading surcharge", 18.75);
    expect(f).toHaveLength(1);
    expect(f[0]).toMatchObject({ check: "unexplained-line", severity: "warning", amountAtStake: 18.75 });
  });
  it("clean twin: a printed line whose label matches a charge (case/space variant) → nothing", () => {
    const b = bill("2024-01-01", "2024-02-01");
    const lines = [printed(b.billId, "customer   CHARGE", 24.5), printed(b.billId, "Energy", 120), printed(b.billId, "Sales tax", 5.5)];
    expect(checkUnexplainedLine(buildContext(input(portfolio({ bills: [b], billLines: lines }), { priced: new Map([[b.billId, own]]) })))).toEqual([]);
  });
  it("a line within the money tolerance (0.40) is not a finding", () => {
    expect(run("Rounding", 0.4)).toEqual([]);
  });
});
