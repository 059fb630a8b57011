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

describe("line-mismatch", () => {
  const run = (energyPrinted: number, c = own) => {
    const b = bill("2024-01-01", "2024-02-01", { total: 24.5 + energyPrinted + 5.5 });
    const lines = [printed(b.billId, "CUSTOMER  charge", 24.5), printed(b.billId, " energy", energyPrinted), printed(b.billId, "Sales Tax", 5.5)];
    return checkLineMismatch(buildContext(input(portfolio({ bills: [b], billLines: lines }), { priced: new Map([[b.billId, c]]) })));
  };
  it("planted: Energy printed 131.80 vs 120.00 → error, +11.80 (labels matched ignoring case and spaces)", () => {
    const f = run(131.8);
    expect(f).toHaveLength(1);
    expect(f[0]).toMatchObject({ check: "line-mismatch", severity: "error", amountAtStake: 11.8 });
    expect(f[0].message).toContain('"Energy"');
  });
  it("clean twin: every printed line equals its charge → nothing", () => {
    expect(run(120)).toEqual([]);
  });
  it("does not compare a line that is not exact", () => {
    expect(run(131.8, computed([["Customer charge", 24.5], ["Energy", 120, "estimated"], ["Sales tax", 5.5]]))).toEqual([]);
  });
});
