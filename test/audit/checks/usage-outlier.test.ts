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
