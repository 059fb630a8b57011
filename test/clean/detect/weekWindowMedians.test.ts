/** The spike detector's hour-of-week σ: sliding window of weeks against gathering and sorting every key anew. */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { slidingWeekMedians } from "../../../src/clean/detect/weekWindowMedians.ts";
import { MAD_TO_SIGMA, medianOf } from "../../../src/clean/detect/robustStats.ts";

/** The former computation (spikes.ts before the window slid): gather the key's values, take the median. */
function gathered(buckets: readonly number[][], weeks: number, halfWindowWeeks: number): Float64Array {
  const out = new Float64Array(weeks * 168);
  for (let w0 = 0; w0 < weeks; w0++) {
    for (let how = 0; how < 168; how++) {
      const xs: number[] = [];
      for (let w = Math.max(0, w0 - halfWindowWeeks); w <= Math.min(weeks - 1, w0 + halfWindowWeeks); w++) {
        for (const dh of [-1, 0, 1]) for (const x of buckets[w * 168 + ((how + dh + 168) % 168)]!) xs.push(x);
      }
      out[w0 * 168 + how] = xs.length >= 12 ? MAD_TO_SIGMA * medianOf(xs) : NaN;
    }
  }
  return out;
}

describe("slidingWeekMedians", () => {
  it("gives the same σ as gathering each key's values anew, bit for bit (reference: the former loop of spikes.ts)", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 9 }),
        fc.integer({ min: 0, max: 7 }),
        fc.integer({ min: 1, max: 1_000_000 }),
        fc.boolean(),
        (weeks, half, seed, ties) => {
          let s = seed;
          const rnd = () => ((s = (s * 16807) % 2147483647) / 2147483647);
          // 0–5 readings per hour; with `ties` the values repeat (zeros, equal residuals).
          const buckets = Array.from({ length: weeks * 168 }, () =>
            Array.from({ length: Math.floor(rnd() * 6) }, () => (ties ? Math.floor(rnd() * 4) : rnd() * 100)),
          );
          const got = slidingWeekMedians(buckets, weeks, half);
          const want = gathered(buckets, weeks, half);
          for (let k = 0; k < want.length; k++) expect(Object.is(got[k], want[k])).toBe(true);
        },
      ),
      { numRuns: 60 },
    );
  });
});
