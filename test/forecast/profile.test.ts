import { describe, expect, it } from "vitest";
import { loadShapeByHourOfWeek, monthShapeFromIntervals, scaleShape } from "../../src/forecast/profile.ts";
import type { IntervalSeries } from "../../src/domain/types.ts";
import { calendarMonth } from "../../src/core/time/index.ts";

/** Invented 15-minute meter in UTC through 2025: 1 kWh per interval on weekdays, 2 at weekends. */
function series(fromMs: number, toMs: number): IntervalSeries {
  const n = (toMs - fromMs) / 900_000;
  const startMs = new Float64Array(n);
  const values = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    startMs[i] = fromMs + i * 900_000;
    const day = new Date(startMs[i]!).getUTCDay();
    values[i] = day === 0 || day === 6 ? 2 : 1;
  }
  return { meterId: "M1", intervalMinutes: 15, startMs, values };
}

describe("interval month shape", () => {
  const s = series(Date.UTC(2025, 0, 1), Date.UTC(2026, 0, 1));

  it("copies the month 52 weeks earlier, so weekdays stay weekdays", () => {
    const shape = monthShapeFromIntervals(s, "UTC", calendarMonth("2026-01"), Date.UTC(2026, 0, 1))!;
    expect(shape.weeksBack).toBe(52);
    expect(shape.startMs.length).toBe(31 * 96);
    // 2026-01-03 is a Saturday, 2026-01-05 a Monday: weekend intervals weigh twice as much.
    const sat = shape.values[2 * 96]!;
    const mon = shape.values[4 * 96]!;
    expect(sat / mon).toBeCloseTo(2, 12);
    expect(shape.values.reduce((a, b) => a + b, 0)).toBeCloseTo(1, 12);
  });

  it("scales to the scenario's usage: energy sums to it and the peak scales with it", () => {
    const shape = monthShapeFromIntervals(s, "UTC", calendarMonth("2026-01"), Date.UTC(2026, 0, 1))!;
    const a = scaleShape(shape, 1000);
    const b = scaleShape(shape, 2000);
    expect(a.values.reduce((x, y) => x + y, 0)).toBeCloseTo(1000, 8);
    expect(Math.max(...b.values) / Math.max(...a.values)).toBeCloseTo(2, 12);
  });

  it("does not use readings after the as-of cut, and gives null when no copy covers 90 %", () => {
    // Cut mid-January 2025: the copy one year back runs past the cut, two years back has no data.
    expect(monthShapeFromIntervals(s, "UTC", calendarMonth("2026-01"), Date.UTC(2025, 0, 15))).toBeNull();
    // The copy 364 days back spans 2025-01-02 … 2025-02-01 (inclusive): usable from a cut at 2025-02-02, not 02-01.
    expect(monthShapeFromIntervals(s, "UTC", calendarMonth("2026-01"), Date.UTC(2025, 1, 1))).toBeNull();
    expect(monthShapeFromIntervals(s, "UTC", calendarMonth("2026-01"), Date.UTC(2025, 1, 2))).not.toBeNull();
  });
});

describe("load shape by hour of week", () => {
  it("weekend hours weigh twice weekday hours and the shape sums to 1 (hand-computed: 2/(120 + 96))", () => {
    const shape = loadShapeByHourOfWeek(series(Date.UTC(2025, 0, 6), Date.UTC(2025, 1, 3)), "UTC")!;
    expect(shape).toHaveLength(168);
    expect(shape.reduce((a, b) => a + b, 0)).toBeCloseTo(1, 12);
    // Monday 00:00 is index 0; Saturday 00:00 is 5 × 24 = 120. 120 weekday hours of 1, 48 weekend hours of 2.
    expect(shape[0]).toBeCloseTo(1 / 216, 12);
    expect(shape[120]).toBeCloseTo(2 / 216, 12);
  });
});
