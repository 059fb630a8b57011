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

describe("missing-bill", () => {
  const data = series("2024-01-01", "2024-07-01", () => 1, 60); // hourly, 1 kWh an hour
  it("planted: March bill missing while the meter recorded use → warning over 2024-03-01..04-01, 744 kWh", () => {
    const bills = year(Array(6).fill(700)).slice(0, 6).filter((b) => b.periodStart !== "2024-03-01");
    const f = checkMissingBill(ctx(bills, {}, [data]));
    expect(f).toHaveLength(1);
    // March 2024 in New York: 31 days × 24 h − 1 h (spring forward, 15 U.S.C. 260a) = 743 h
    expect(f[0]).toMatchObject({ check: "missing-bill", severity: "warning", periodStart: "2024-03-01", periodEnd: "2024-04-01" });
    expect(f[0].evidence.rows[0].expected).toBe(743);
  });
  it("planted: the last bill (June) is missing, as_of 2024-06-30 → warning over 2024-06-01..07-01 (30 days > 75 % of 31)", () => {
    const bills = year(Array(12).fill(700)).slice(0, 5); // through 2024-06-01
    const f = checkMissingBill(ctx(bills, {}, [data], "2024-06-30"));
    expect(f).toHaveLength(1);
    expect(f[0]).toMatchObject({ periodStart: "2024-06-01", periodEnd: "2024-07-01", severity: "warning" });
  });
  it("without as_of, data after the portfolio's last bill end is not a missing bill", () => {
    expect(checkMissingBill(ctx(year(Array(12).fill(700)).slice(0, 5), {}, [data]))).toEqual([]);
  });
  it("a few days of data past the last bill (before as_of) are not a missing bill", () => {
    expect(checkMissingBill(ctx(year(Array(12).fill(700)).slice(0, 5), {}, [series("2024-01-01", "2024-06-10", () => 1, 60)], "2024-06-30"))).toEqual([]);
  });
  it("clean twin: every month billed → nothing", () => {
    expect(checkMissingBill(ctx(year(Array(12).fill(700)).slice(0, 6), {}, [data]))).toEqual([]);
  });
  it("a gap with no interval data is left to period-gap", () => {
    const sparse = series("2024-01-01", "2024-02-01", () => 1, 60);
    const bills = [bill("2024-01-01", "2024-02-01"), bill("2024-03-01", "2024-04-01")];
    expect(checkMissingBill(ctx(bills, {}, [sparse]))).toEqual([]);
  });
});
