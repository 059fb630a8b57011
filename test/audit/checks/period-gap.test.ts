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

describe("period-gap", () => {
  it("planted: Jan bill then Mar bill → 29-day gap 2024-02-01..2024-03-01 (2024 is a leap year)", () => {
    const f = checkPeriodGap(ctx([bill("2024-01-01", "2024-02-01"), bill("2024-03-01", "2024-04-01")]));
    expect(f).toHaveLength(1);
    expect(f[0]).toMatchObject({ check: "period-gap", severity: "warning", periodStart: "2024-02-01", periodEnd: "2024-03-01", amountAtStake: null });
    expect(f[0].message).toContain("29 days");
  });
  it("clean twin: abutting half-open periods (end = next start) → nothing", () => {
    expect(checkPeriodGap(ctx(year(Array(12).fill(1000))))).toEqual([]);
  });
});
