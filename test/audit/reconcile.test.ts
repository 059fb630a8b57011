import { describe, expect, it } from "vitest";
import { meteredForPeriod } from "../../src/audit/reconcile.ts";
import type { IntervalSeries } from "../../src/domain/types.ts";

// DST rules: 15 U.S.C. 260a — clocks go forward at 02:00 on the second Sunday of March and back
// at 02:00 on the first Sunday of November (2024: March 10 and November 3). New York is UTC−5
// in standard time and UTC−4 in daylight time. The series below is built from UTC instants with
// Date.UTC, independently of the zone library the code uses.
const Q = 15 * 60_000;

function utcSeries(fromUtc: number, toUtc: number, value: (ms: number) => number = () => 1): IntervalSeries {
  const n = (toUtc - fromUtc) / Q;
  const startMs = new Float64Array(n);
  const values = new Float64Array(n);
  for (let i = 0; i < n; i++) { startMs[i] = fromUtc + i * Q; values[i] = value(startMs[i]); }
  return { meterId: "E1", intervalMinutes: 15, startMs, values };
}

const NY = "America/New_York";

describe("meteredForPeriod: DST-correct half-open local periods", () => {
  const spring = utcSeries(Date.UTC(2024, 1, 1), Date.UTC(2024, 3, 1));
  const autumn = utcSeries(Date.UTC(2024, 9, 1), Date.UTC(2024, 11, 1));

  it("2024-03-10 in New York holds 92 fifteen-minute intervals (23 h; statute)", () => {
    const m = meteredForPeriod(spring, 1, "2024-03-10", "2024-03-11", NY);
    expect(m.expectedIntervals).toBe(92);
    expect(m.intervals).toBe(92);
    expect(m.coverage).toBe(1);
    expect(m.usage).toBe(92);
  });
  it("2024-11-03 in New York holds 100 fifteen-minute intervals (25 h; statute)", () => {
    const m = meteredForPeriod(autumn, 1, "2024-11-03", "2024-11-04", NY);
    expect(m.expectedIntervals).toBe(100);
    expect(m.intervals).toBe(100);
  });
  it("a bill whose last day is 2024-03-10: 30 days × 96 − 4 = 2876 intervals (hand-computed)", () => {
    const m = meteredForPeriod(spring, 40, "2024-02-10", "2024-03-11", NY);
    expect(m.expectedIntervals).toBe(2876);
    expect(m.intervals).toBe(2876);
    expect(m.usage).toBe(2876 * 40); // multiplier applied
  });
  it("a bill containing 2024-11-03: 31 days × 96 + 4 = 2980 intervals (hand-computed)", () => {
    const m = meteredForPeriod(autumn, 1, "2024-10-15", "2024-11-15", NY);
    expect(m.expectedIntervals).toBe(2980);
    expect(m.intervals).toBe(2980);
  });
  it("is half-open: the interval starting at local midnight of period_end belongs to the next bill", () => {
    const endInstant = Date.UTC(2024, 2, 11, 4); // 2024-03-11 00:00 EDT
    const s = utcSeries(Date.UTC(2024, 2, 10, 5), endInstant + Q, (ms) => (ms === endInstant ? 1000 : 1));
    const m = meteredForPeriod(s, 1, "2024-03-10", "2024-03-11", NY);
    expect(m.usage).toBe(92);
  });
  it("states coverage and counts missing (NaN) values as missing", () => {
    const s = utcSeries(Date.UTC(2024, 5, 1, 4), Date.UTC(2024, 5, 2, 4), (ms) => (ms < Date.UTC(2024, 5, 1, 4) + 19.2 * 3_600_000 ? 1 : NaN));
    const m = meteredForPeriod(s, 1, "2024-06-01", "2024-06-02", NY);
    expect(m.expectedIntervals).toBe(96);
    expect(m.intervals).toBe(77); // 19.2 h → 76.8, so 77 interval starts (hand-computed)
    expect(m.coverage).toBeCloseTo(77 / 96, 12);
  });
});

describe("meteredForPeriod: peak demand (kW = kWh × 60 / minutes; common practice)", () => {
  const base = Date.UTC(2024, 5, 1, 4); // 2024-06-01 00:00 EDT
  it("25 kWh in one 15-minute interval is 100 kW", () => {
    const s = utcSeries(base, base + 96 * Q, (ms) => (ms === base + 40 * Q ? 25 : 5));
    expect(meteredForPeriod(s, 1, "2024-06-01", "2024-06-02", NY).peakKw).toBe(100);
  });
  it("a 30-minute window averages two intervals: (25 + 15) kWh / 0.5 h = 80 kW", () => {
    const s = utcSeries(base, base + 96 * Q, (ms) => (ms === base + 40 * Q ? 25 : ms === base + 41 * Q ? 15 : 5));
    expect(meteredForPeriod(s, 1, "2024-06-01", "2024-06-02", NY, 30).peakKw).toBe(80);
  });
  it("applies the multiplier and the MWh factor; no demand for non-electric units", () => {
    const s = utcSeries(base, base + 96 * Q, () => 0.001);
    expect(meteredForPeriod(s, 10, "2024-06-01", "2024-06-02", NY, 15, 1000).peakKw).toBeCloseTo(40, 9);
    expect(meteredForPeriod(s, 10, "2024-06-01", "2024-06-02", NY, 15, null).peakKw).toBeNull();
  });
});
