// period-gap, period-overlap, duplicate-bill, estimated-read, usage-outlier, missing-bill:
// planted problem + clean twin each. Day counts and amounts hand-computed.
import { describe, expect, it } from "vitest";
import { buildContext } from "../../../src/audit/context.ts";
import { checkDuplicateBill } from "../../../src/audit/checks/duplicate-bill.ts";
import { checkEstimatedRead } from "../../../src/audit/checks/estimated-read.ts";
import { checkMissingBill } from "../../../src/audit/checks/missing-bill.ts";
import { checkPeriodGap } from "../../../src/audit/checks/period-gap.ts";
import { checkPeriodOverlap } from "../../../src/audit/checks/period-overlap.ts";
import { checkUsageOutlier } from "../../../src/audit/checks/usage-outlier.ts";
import type { Bill, IntervalSeries } from "../../../src/domain/types.ts";
import type { AuditInput } from "../../../src/audit/types.ts";
import { bill, input, portfolio, series, year } from "../fixtures.ts";

const ctx = (bills: Bill[], over: Partial<AuditInput> = {}, intervals: IntervalSeries[] = [], asOf: string | null = null) =>
  buildContext(input(portfolio({ bills, intervals, asOf }), over));

describe("duplicate-bill", () => {
  it("planted: the same period billed twice → error on the second, amount = its total 151.20", () => {
    const first = bill("2024-02-01", "2024-03-01", { total: 151.2 });
    const again = bill("2024-02-01", "2024-03-01", { total: 151.2, billId: "E1:2024-02-01#2" });
    const c = ctx([bill("2024-01-01", "2024-02-01"), first, again]);
    const f = checkDuplicateBill(c);
    expect(f).toHaveLength(1);
    expect(f[0]).toMatchObject({ check: "duplicate-bill", severity: "error", billId: "E1:2024-02-01#2", amountAtStake: 151.2 });
    // the duplicate is left out of the sequence checks: no overlap, no gap
    expect(checkPeriodOverlap(c)).toEqual([]);
    expect(checkPeriodGap(c)).toEqual([]);
  });
  it("a re-sent bill with shifted dates but the same usage and total is a duplicate too", () => {
    const f = checkDuplicateBill(ctx([bill("2024-02-01", "2024-03-01", { usage: 987, total: 140 }), bill("2024-02-03", "2024-03-02", { usage: 987, total: 140 })]));
    expect(f).toHaveLength(1);
    expect(f[0].billId).toBe("E1:2024-02-03");
  });
  it("the later statement date is the duplicate even when listed first", () => {
    const a = bill("2024-02-01", "2024-03-01", { billId: "A", statementDate: "2024-03-20" });
    const b = bill("2024-02-01", "2024-03-01", { billId: "B", statementDate: "2024-03-05" });
    expect(checkDuplicateBill(ctx([a, b]))[0].billId).toBe("A");
  });
  it("clean twin: twelve distinct periods → nothing", () => {
    expect(checkDuplicateBill(ctx(year(Array(12).fill(1000))))).toEqual([]);
  });
});
