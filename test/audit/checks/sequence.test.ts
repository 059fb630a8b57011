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

describe("usage-outlier", () => {
  // Two years of monthly bills; same-month-last-year rule with the default ×2 limit.
  const twoYears = (jul2025: number) => {
    const y1 = year([900, 800, 700, 600, 700, 900, 1000, 1000, 800, 700, 800, 900]);
    const y2 = year([920, 790, 710, 610, 690, 880, jul2025, 990, 810, 700, 790, 910]).map((b) => {
      const s = b.periodStart.replace("2024", "2025");
      const e = b.periodEnd.replace("2025", "2026").replace("2024", "2025");
      return { ...b, billId: `E1:${s}`, periodStart: s, periodEnd: e };
    });
    return [...y1, ...y2];
  };
  it("planted: July 2025 uses 3,100 vs 1,000 kWh (×3.1 per day) → one warning on that bill only, labelled interim", () => {
    const f = checkUsageOutlier(ctx(twoYears(3100)));
    expect(f).toHaveLength(1);
    expect(f[0]).toMatchObject({ check: "usage-outlier", severity: "warning", billId: "E1:2025-07-01" });
    expect(f[0].message).toMatch(/^Interim rule/);
  });
  it("planted in the FIRST year (compared forward): the abnormal bill is flagged, not its normal twin", () => {
    const bills = twoYears(1000).map((b) => (b.billId === "E1:2024-07-01" ? { ...b, usage: 350 } : b));
    const f = checkUsageOutlier(ctx(bills));
    expect(f.map((x) => x.billId)).toEqual(["E1:2024-07-01"]);
  });
  it("two consecutive abnormal bills (a leak) make ONE finding covering both", () => {
    const bills = twoYears(2500).map((b) => (b.billId === "E1:2025-08-01" ? { ...b, usage: 2600 } : b));
    const f = checkUsageOutlier(ctx(bills));
    expect(f).toHaveLength(1);
    expect(f[0]).toMatchObject({ billId: "E1:2025-07-01", periodStart: "2025-07-01", periodEnd: "2025-09-01" });
    expect(f[0].relatedBillIds).toContain("E1:2025-08-01");
  });
  it("on a meter whose use swings with the seasons (P90/P10 > 1.5) the limit is 2^1.5 ≈ 2.83", () => {
    // heating-gas-like year: winter 3,000, summer 300 kWh-equivalent (invented)
    const gas = [3000, 2600, 1800, 900, 400, 300, 300, 300, 400, 1000, 2000, 2800];
    const mk = (may2025: number) => {
      const y1 = year(gas);
      const y2 = year(gas.map((u, i) => (i === 4 ? may2025 : u))).map((b) => {
        const st = b.periodStart.replace("2024", "2025");
        const en = b.periodEnd.replace("2025", "2026").replace("2024", "2025");
        return { ...b, billId: `E1:${st}`, periodStart: st, periodEnd: en };
      });
      return [...y1, ...y2];
    };
    expect(checkUsageOutlier(ctx(mk(1000)))).toEqual([]); // ×2.5: a cold May can do that
    const f = checkUsageOutlier(ctx(mk(1200))); // ×3.0
    expect(f.map((x) => x.billId)).toEqual(["E1:2025-05-01"]);
    expect(f[0].message).toContain("swings with the seasons");
  });
  it("clean twin: July 2025 at 1,200 (×1.2) → nothing", () => {
    expect(checkUsageOutlier(ctx(twoYears(1200)))).toEqual([]);
  });
  it("with a baseline model's interval: outside [low, high] → warning naming the prediction interval", () => {
    const b = bill("2024-01-01", "2024-02-01", { usage: 1500 });
    const f = checkUsageOutlier(ctx([b], { expectedUsage: new Map([[b.billId, { p50: 1000, low: 850, high: 1150 }]]) }));
    expect(f).toHaveLength(1);
    expect(f[0].message).toContain("prediction interval");
    expect(checkUsageOutlier(ctx([b], { expectedUsage: new Map([[b.billId, { p50: 1400, low: 1250, high: 1550 }]]) }))).toEqual([]);
  });
});

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
