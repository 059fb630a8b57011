import { describe, expect, it } from "vitest";
import { MonthlyTotalsSink, monthlyTotals } from "../../src/ingest/monthlyTotals.ts";
import type { IntervalSeries } from "../../src/domain/types.ts";

const Q = 15 * 60000;

function series(startMs: number, values: number[]): IntervalSeries {
  return { meterId: "M1", intervalMinutes: 15, startMs: Float64Array.from(values, (_, k) => startMs + k * Q), values: Float64Array.from(values) };
}

describe("monthlyTotals (local calendar months; expected counts hand-computed from 15 U.S.C. 260a DST dates)", () => {
  // 2024-03-31 23:00 EDT = 2024-04-01 03:00Z: four intervals in March, four in April.
  const s = series(Date.UTC(2024, 3, 1, 3), [1, 2, 3, 4, 5, 6, 7, 8]);

  it("splits at local midnight, applies the multiplier, and counts DST-aware expected intervals", () => {
    expect(monthlyTotals(s, "America/New_York", 2)).toEqual([
      // March 2024 in New York: 31 days minus the skipped hour = 743 h → 2972 quarter hours.
      { month: "2024-03", total: 20, intervals: 4, expectedIntervals: 2972 },
      { month: "2024-04", total: 52, intervals: 4, expectedIntervals: 2880 },
    ]);
  });

  it("the same instants are all April in UTC", () => {
    expect(monthlyTotals(s, "UTC", 1)).toEqual([{ month: "2024-04", total: 36, intervals: 8, expectedIntervals: 2880 }]);
  });

  it("lists empty months between data and counts November 2024 as 721 h (fall-back)", () => {
    const a = { meterId: "M1", intervalMinutes: 60, startMs: Float64Array.of(Date.UTC(2024, 9, 15), Date.UTC(2024, 11, 15)), values: Float64Array.of(1, 1) };
    expect(monthlyTotals(a, "America/New_York", 1).map((m) => [m.month, m.intervals, m.expectedIntervals])).toEqual([
      ["2024-10", 1, 744],
      ["2024-11", 0, 721],
      ["2024-12", 1, 744],
    ]);
  });

  it("sums with compensation: 0.1 added 35,040 times is 3504 to 1e-10 (a plain loop is off by 2.1e-9)", () => {
    const many = series(Date.UTC(2023, 0, 1, 5), new Array(35040).fill(0.1));
    const total = monthlyTotals(many, "America/New_York", 1).reduce((a, m) => a + m.total, 0);
    expect(Math.abs(total - 3504)).toBeLessThan(1e-10);
  });

  it("the streaming sink agrees with the function", () => {
    const sink = new MonthlyTotalsSink(() => "America/New_York");
    const i = sink.meter("M1");
    s.startMs.forEach((t, k) => sink.row(i, t, s.values[k]));
    expect(sink.result(() => 2).get("M1")).toEqual(monthlyTotals(s, "America/New_York", 2));
  });
});
