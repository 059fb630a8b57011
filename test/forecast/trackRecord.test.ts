import { describe, expect, it } from "vitest";
import { annualErrorPct, coverageShare, forecastCvRmsePct } from "../../src/forecast/accuracy.ts";
import { spreadBillsByMonth } from "../../src/forecast/months.ts";
import { compareWithActuals, naiveSameMonthLastYear, pooledAccuracy, backtestAsOf } from "../../src/forecast/trackRecord.ts";
import type { MeterForecast } from "../../src/forecast/forecastMeter.ts";
import { fromRows } from "../../src/forecast/scenarioMatrix.ts";
import { bill, calendarBills } from "./helpers.ts";

describe("accuracy arithmetic (hand-computed)", () => {
  it("annual error: (110 − 100)/100 = +10 %", () => {
    expect(annualErrorPct(110, 100)).toBeCloseTo(10, 12);
    expect(annualErrorPct(90, 120)).toBeCloseTo(-25, 12);
    expect(() => annualErrorPct(1, 0)).toThrow(/positive/);
  });

  it("CV(RMSE) divides by n: actual [100, 200], forecast [110, 190] → 100·√(200/2)/150 = 6.6667 %", () => {
    expect(forecastCvRmsePct([100, 200], [110, 190])).toBeCloseTo(100 * 10 / 150, 10);
  });

  it("coverage counts bounds as inside: 2 of 3", () => {
    expect(coverageShare([5, 8, 20], [{ p10: 4, p90: 6 }, { p10: 1, p90: 8 }, { p10: 10, p90: 19 }])).toBeCloseTo(2 / 3, 12);
  });
});

describe("bills spread over calendar months by days", () => {
  it("a 21-day bill of 210 with 12 days in January puts 120 in January and 90 in February", () => {
    const s = spreadBillsByMonth([bill("2025-01-20", "2025-02-10", 210, 210)], (b) => b.total);
    expect(s.get("2025-01")!.amount).toBeCloseTo(120, 10);
    expect(s.get("2025-02")!.amount).toBeCloseTo(90, 10);
    expect(s.get("2025-01")!.coveredDays).toBe(12);
  });

  it("counts a re-issued statement for the same period once", () => {
    const b = bill("2025-03-01", "2025-04-01", 31, 31);
    const s = spreadBillsByMonth([b, { ...b, billId: "again" }], (x) => x.total);
    expect(s.get("2025-03")!.amount).toBe(31);
  });

  it("naive same month last year: per day × days, from bills known at the backtest date", () => {
    const bills = [bill("2024-01-20", "2024-02-10", 210, 210), bill("2024-02-10", "2024-03-01", 190, 190)];
    // February 2024 (29 days): 9 days × 10/day from the first bill + 190 = 280 → 280/29 per day; Feb 2025 has 28 days.
    expect(naiveSameMonthLastYear(bills, "2024-12-31", "2025-02", 28)).toBeCloseTo((280 / 29) * 28, 10);
    // Under half of January 2024 covered (12 of 31 days): no naive value.
    expect(naiveSameMonthLastYear(bills, "2024-12-31", "2025-01", 31)).toBeNull();
  });

  it("the backtest as-of is one year before", () => {
    expect(backtestAsOf("2025-12-31")).toBe("2024-12-31");
    expect(backtestAsOf("2024-02-29")).toBe("2023-02-28");
  });
});

/** A forecast of 2025 with two scenarios per month: costs 90 and 110 (P10 92, P50 100, P90 108). */
function tinyForecast(): MeterForecast {
  const months = Array.from({ length: 12 }, (_, k) => `2025-${String(k + 1).padStart(2, "0")}`);
  const lo = new Float64Array(12).fill(90);
  const hi = new Float64Array(12).fill(110);
  return {
    meterId: "M1",
    buildingId: "B1",
    commodity: "electricity",
    unit: "kWh",
    method: "same-month-average",
    months: months.map((month) => ({ month, usage: { p10: 1, p50: 1, p90: 1 }, cost: { p10: 92, p50: 100, p90: 108 }, escalationFactor: 1, pricedFrom: "bill", estimated: false })),
    total: null,
    scenarioCosts: fromRows([lo, hi]),
    weatherIndex: new Int32Array(2).fill(-1),
    escalationFrom: null,
    notes: [],
    error: null,
  };
}

describe("compareWithActuals (hand-computed)", () => {
  // 2024: every month cost 95 (the naive forecast for 2025); 2025: 100 except March 120 and July 80.
  // Bills after 2025-11-30 are not known at as-of 2025-11-30, so December 2025 is not compared.
  const bills = [
    ...calendarBills(2024, () => 1, () => 95),
    ...calendarBills(2025, () => 1, (m) => (m === 3 ? 120 : m === 7 ? 80 : 100)),
  ].map((b, i) => ({ ...b, billId: `b${i}` }));
  const r = compareWithActuals(tinyForecast(), bills, "2025-11-30", "2024-12-31");

  it("compares only the months the bills cover completely", () => {
    expect(r.comparisons.map((c) => c.month)).toEqual(["2025-01", "2025-02", "2025-03", "2025-04", "2025-05", "2025-06", "2025-07", "2025-08", "2025-09", "2025-10", "2025-11"]);
  });

  it("model: annual from the median of scenario sums, CV(RMSE) over monthly P50, coverage of P10–P90", () => {
    // actual total = 9 × 100 + 120 + 80 = 1100; scenario sums over 11 months 990 and 1210 → median 1100.
    expect(r.model!.actualTotal).toBeCloseTo(1100, 10);
    expect(r.model!.forecastTotal).toBeCloseTo(1100, 10);
    expect(r.model!.annualErrorPct).toBeCloseTo(0, 10);
    // errors 0 except ±20 → √(800/11)/100 = 8.528 %
    expect(r.model!.cvRmsePct).toBeCloseTo(100 * Math.sqrt(800 / 11) / 100, 10);
    // March (120) and July (80) fall outside 92–108: 9 of 11 inside.
    expect(r.model!.coverage).toBeCloseTo(9 / 11, 12);
  });

  it("naive: last year's cost per day × this year's days (February 2024 had 29 days, 2025 has 28)", () => {
    const feb = (95 / 29) * 28;
    const total = 10 * 95 + feb;
    expect(r.naive!.forecastTotal).toBeCloseTo(total, 10);
    expect(r.naive!.annualErrorPct).toBeCloseTo((100 * (total - 1100)) / 1100, 10);
    // errors: 8 months of 5 (100 − 95), February 100 − feb, March 25, July −15
    const ss = 8 * 25 + (100 - feb) ** 2 + 625 + 225;
    expect(r.naive!.cvRmsePct).toBeCloseTo((100 * Math.sqrt(ss / 11)) / 100, 10);
    expect(r.naive!.coverage).toBeNull();
  });

  it("pools meters: totals add, coverage over all meter-months", () => {
    const p = pooledAccuracy([r, { ...r, meterId: "M2" }], "model")!;
    expect(p.actualTotal).toBeCloseTo(2200, 10);
    expect(p.coverage).toBeCloseTo(9 / 11, 12);
    expect(p.cvRmsePct).toBeCloseTo(r.model!.cvRmsePct, 10);
  });
});
