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
