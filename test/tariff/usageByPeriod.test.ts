/** usageByPeriod (version-state.ts) against the loop it replaced, to the bit. */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { usageByPeriod } from "../../src/tariff/version-state.ts";

/** The former period split's loop (version-state.ts before runs): one addition per interval through the array. */
function formerSums(usage: Float64Array, idx: Int8Array, n: number): Float64Array {
  const sums = new Float64Array(n);
  for (let i = 0; i < idx.length; i++) sums[idx[i]!]! += usage[i]!;
  return sums;
}

describe("usageByPeriod", () => {
  it("adds the same numbers in the same order as one addition per interval (runs, -1 indices, -0, NaN, huge and tiny values)", () => {
    fc.assert(
      fc.property(
        fc.array(fc.tuple(fc.integer({ min: -1, max: 3 }), fc.integer({ min: 1, max: 9 })), { maxLength: 40 }),
        fc.array(fc.oneof(fc.double({ noNaN: false }), fc.double({ min: -1e3, max: 1e3 }), fc.constant(-0)), { minLength: 400, maxLength: 400 }),
        (runs, values) => {
          const idx = Int8Array.from(runs.flatMap(([p, len]) => Array<number>(len).fill(p)));
          const usage = Float64Array.from(idx, (_, i) => values[i % values.length]!);
          const got = usageByPeriod(usage, idx, 4);
          const want = formerSums(usage, idx, 4);
          for (let p = 0; p < 4; p++) expect(Object.is(got[p], want[p]) || (Number.isNaN(got[p]) && Number.isNaN(want[p]))).toBe(true);
          // A second call reads the cached runs.
          expect(usageByPeriod(usage, idx, 4)).toEqual(got);
        },
      ),
      { numRuns: 400 },
    );
  });
});
