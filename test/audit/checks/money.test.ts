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

describe("rate-suspect", () => {
  // Alternative tariff T-OLD prices the same bill at 171.20; own tariff T1 at 150.00.
  const reprice: RepriceFn = (_b, alt) => (alt.kind === "rate" && alt.tariffId === "T-OLD" ? computed([["Energy", 171.2]]) : alt.kind === "rate" ? computed([["Energy", 90]]) : null);
  const run = (total: number) => {
    const b = bill("2024-01-01", "2024-02-01", { total });
    return checkRateSuspect(buildContext(input(portfolio({ bills: [b], tariffs: ["T1", "T-OLD", "T-GAS"] }), { priced: new Map([[b.billId, own]]), reprice })));
  };
  it("planted: billed 171.20 matches T-OLD exactly, own tariff gives 150.00 → error, +21.20", () => {
    const f = run(171.2);
    expect(f).toHaveLength(1);
    expect(f[0]).toMatchObject({ check: "rate-suspect", severity: "error", amountAtStake: 21.2 });
    expect(f[0].message).toContain("tariff T-OLD");
  });
  it("clean twin: billed 150.00 → nothing", () => {
    expect(run(150)).toEqual([]);
  });
  it("a mismatch no alternative explains is not a rate-suspect", () => {
    expect(run(200)).toEqual([]);
  });
});
