/** Demand from interval data (common practice: kW = kWh × 60 / interval minutes; rolling window). */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { billingDemandKw, intervalsPerWindow, maxWindowDemandByPeriodKw, maxWindowDemandKw, maxWindowDemandsKw } from "../../src/tariff/demand.ts";

const starts = (n: number, minutes = 15, gapAt = -1) =>
  Float64Array.from({ length: n }, (_, i) => i * minutes * 60_000 + (gapAt >= 0 && i >= gapAt ? 3_600_000 : 0));

describe("maxWindowDemandKw", () => {
  it("25 kWh in 15 minutes is 100 kW (references: common practice)", () => {
    expect(maxWindowDemandKw(starts(3), Float64Array.of(5, 25, 5), 15, 15).kw).toBe(100);
  });
  it("a 30-minute window averages two 15-minute intervals: (25 + 5) kWh / 0.5 h = 60 kW", () => {
    expect(maxWindowDemandKw(starts(3), Float64Array.of(5, 25, 5), 15, 30).kw).toBe(60);
  });
  it("a window across a gap in the data is skipped", () => {
    // intervals 0,1 then a one-hour gap before 2,3; kWh 5,40,40,5:
    // (0,1) = 45 / 0.5 = 90 kW; (2,3) = 90 kW; (1,2) would be 160 kW but spans the gap
    expect(maxWindowDemandKw(starts(4, 15, 2), Float64Array.of(5, 40, 40, 5), 15, 30).kw).toBe(90);
    expect(maxWindowDemandKw(starts(4), Float64Array.of(5, 40, 40, 5), 15, 30).kw).toBe(160); // without the gap
  });
  it("a window longer than an interval but not a multiple of it is refused", () => {
    expect(() => intervalsPerWindow(45, 30)).toThrow(/not a whole number/);
    expect(intervalsPerWindow(15, 60)).toBe(1);
  });
});

describe("maxWindowDemandByPeriodKw", () => {
  it("only windows wholly inside a period count", () => {
    // periods 0,0,1,1 ; kWh 5,30,30,5 ; 30-minute window
    // period 0: (5+30)/0.5 = 70 kW; period 1: (30+5)/0.5 = 70 kW; the straddling (30+30) = 120 kW counts for neither
    expect(maxWindowDemandByPeriodKw(starts(4), Float64Array.of(5, 30, 30, 5), 15, 30, Int8Array.of(0, 0, 1, 1), 3)).toEqual([70, 70, null]);
  });
  it("agrees with the one-period scan for random data (property)", () => {
    fc.assert(
      fc.property(
        fc.array(fc.tuple(fc.double({ min: 0, max: 100, noNaN: true }), fc.integer({ min: 0, max: 2 })), { minLength: 1, maxLength: 200 }),
        fc.constantFrom(15, 30, 60),
        (rows, window) => {
          const kwh = Float64Array.from(rows, (r) => r[0]);
          const idx = Int8Array.from(rows, (r) => r[1]);
          const s = starts(rows.length);
          const all = maxWindowDemandByPeriodKw(s, kwh, 15, window, idx, 3);
          for (let p = 0; p < 3; p++) {
            const one = maxWindowDemandKw(s, kwh, 15, window, idx, p).kw;
            if (one === null) expect(all[p]).toBeNull();
            else expect(all[p]).toBeCloseTo(one, 9);
          }
        },
      ),
    );
  });
});

describe("billingDemandKw", () => {
  it("ratchet and minimum (hand-computed)", () => {
    expect(billingDemandKw(300, [500, 400], { percent: 80, months: 11 }, 10)).toEqual({ kw: 400, by: "ratchet", ratchetKw: 400 });
    expect(billingDemandKw(5, [], { percent: 80, months: 11 }, 10)).toEqual({ kw: 10, by: "minimum", ratchetKw: null });
    expect(billingDemandKw(450, [500], { percent: 80, months: 11 }, null).by).toBe("measured");
  });
});

/** The implementations before the window flags were kept per instants array: every window divided, then compared. */
function referenceMaxKw(startMs: Float64Array, kwh: Float64Array, intervalMinutes: number, windowMinutes: number): number | null {
  const k = intervalsPerWindow(windowMinutes, intervalMinutes);
  const spanMs = (k - 1) * intervalMinutes * 60_000;
  const hours = (k * intervalMinutes) / 60;
  let best = -Infinity;
  let sum = 0;
  for (let i = 0; i < kwh.length; i++) {
    sum += kwh[i]!;
    if (i >= k) sum -= kwh[i - k]!;
    if (i < k - 1 || startMs[i]! - startMs[i - k + 1]! !== spanMs) continue;
    if (sum / hours > best) best = sum / hours;
  }
  return best === -Infinity ? null : best;
}
function referenceByPeriodKw(startMs: Float64Array, kwh: Float64Array, intervalMinutes: number, windowMinutes: number, periodIdx: Int8Array, periodCount: number): (number | null)[] {
  const k = intervalsPerWindow(windowMinutes, intervalMinutes);
  const stepMs = intervalMinutes * 60_000;
  const hours = (k * intervalMinutes) / 60;
  const best = new Float64Array(periodCount).fill(-Infinity);
  let sum = 0;
  let run = 0;
  for (let i = 0; i < kwh.length; i++) {
    sum += kwh[i]!;
    if (i >= k) sum -= kwh[i - k]!;
    run = i > 0 && periodIdx[i] === periodIdx[i - 1] && startMs[i]! - startMs[i - 1]! === stepMs ? run + 1 : 1;
    if (run >= k && periodIdx[i]! >= 0 && sum / hours > best[periodIdx[i]!]!) best[periodIdx[i]!] = sum / hours;
  }
  return Array.from(best, (b) => (b === -Infinity ? null : b));
}

describe("window demand: bit-identical to dividing every window (x ↦ x / hours never decreases)", () => {
  it("random readings with gaps, NaN and -0, the same instants priced with several sets of readings (reference: the former per-window loop)", () => {
    fc.assert(
      fc.property(
        fc.array(fc.record({ gap: fc.boolean(), period: fc.integer({ min: 0, max: 2 }) }), { minLength: 1, maxLength: 60 }),
        fc.array(fc.array(fc.oneof(fc.double({ min: -5, max: 500, noNaN: true }), fc.constant(NaN), fc.constant(-0)), { minLength: 60, maxLength: 60 }), { minLength: 1, maxLength: 3 }),
        fc.constantFrom(15, 30, 45, 60),
        (slots, readings, window) => {
          let t = 0;
          const startMs = Float64Array.from(slots, (s) => (t += s.gap ? 3_600_000 : 900_000));
          const idx = Int8Array.from(slots, (s) => s.period);
          for (const r of readings) {
            const kwh = Float64Array.from(slots, (_, i) => r[i]!);
            expect(maxWindowDemandKw(startMs, kwh, 15, window).kw).toBe(referenceMaxKw(startMs, kwh, 15, window));
            expect(maxWindowDemandByPeriodKw(startMs, kwh, 15, window, idx, 3)).toEqual(referenceByPeriodKw(startMs, kwh, 15, window, idx, 3));
            const both = maxWindowDemandsKw(startMs, kwh, 15, window, idx, 3);
            expect(both.whole.kw).toBe(referenceMaxKw(startMs, kwh, 15, window));
            expect(both.byPeriod).toEqual(referenceByPeriodKw(startMs, kwh, 15, window, idx, 3));
          }
        },
      ),
      { numRuns: 300 },
    );
  });
});
