/**
 * The window-demand loops by runs of equal eligibility (demand.ts windowPeaks) against the
 * former per-interval loops (test/tariff/former/windowDemand.ts, verbatim), to the bit: months
 * of 15-minute data with gaps, long and short period runs, -0 and NaN readings, every window
 * the input allows, the same instants priced with several readings (cached runs).
 */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { maxWindowDemandByPeriodKw, maxWindowDemandKw, maxWindowDemandsKw } from "../../src/tariff/demand.ts";
import { formerMaxWindowDemandByPeriodKw, formerMaxWindowDemandKw, formerMaxWindowDemandsKw } from "./former/windowDemand.ts";

const same = (a: unknown, b: unknown) => expect(a).toStrictEqual(b);

describe("window demand by runs", () => {
  it("gives the former loops' numbers", () => {
    fc.assert(
      fc.property(
        fc.array(fc.record({ len: fc.integer({ min: 1, max: 40 }), period: fc.integer({ min: 0, max: 2 }), gapAfter: fc.boolean() }), { minLength: 1, maxLength: 12 }),
        fc.array(fc.array(fc.oneof(fc.double({ min: 0, max: 500, noNaN: true }), fc.double({ min: -5, max: 5, noNaN: true }), fc.constant(NaN), fc.constant(-0)), { minLength: 50, maxLength: 50 }), { minLength: 1, maxLength: 3 }),
        fc.constantFrom(5, 15, 30, 45, 60),
        (runs, readings, window) => {
          const slots = runs.flatMap((r) => Array.from({ length: r.len }, (_, i) => ({ period: r.period, gap: r.gapAfter && i === r.len - 1 })));
          let t = 0;
          const startMs = Float64Array.from(slots, (s) => (t += s.gap ? 3_600_000 : 900_000));
          const idx = Int8Array.from(slots, (s) => s.period);
          for (const r of readings) {
            const kwh = Float64Array.from(slots, (_, i) => r[i % r.length]!);
            same(maxWindowDemandKw(startMs, kwh, 15, window), formerMaxWindowDemandKw(startMs, kwh, 15, window));
            same(maxWindowDemandKw(startMs, kwh, 15, window, idx, 1), formerMaxWindowDemandKw(startMs, kwh, 15, window, idx, 1));
            same(maxWindowDemandByPeriodKw(startMs, kwh, 15, window, idx, 3), formerMaxWindowDemandByPeriodKw(startMs, kwh, 15, window, idx, 3));
            same(maxWindowDemandsKw(startMs, kwh, 15, window, idx, 3), formerMaxWindowDemandsKw(startMs, kwh, 15, window, idx, 3));
          }
        },
      ),
      { numRuns: 500 },
    );
  });
});
