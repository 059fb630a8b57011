/**
 * binCuts now sorts a column of small whole numbers (hour of week, weekday, day of year, flags)
 * by counting instead of comparing. That must not move a bit: on random columns of whole
 * numbers (with −0, which the comparison sort puts before +0, and values at and past the
 * counting limit), decimals, mixes with NaN and ±Infinity, any training length and bin count,
 * binCuts gives exactly the cuts of the code before it (test/model/interval/former/gbdtBins.ts,
 * a verbatim copy of commit 8b374f5). Tolerance: none (Object.is on every cut).
 */
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { binCuts } from "../../../src/model/interval/gbdtBins.ts";
import { binCuts as formerBinCuts } from "./former/gbdtBins.ts";

function sameCuts(a: Float64Array, b: Float64Array): boolean {
  return a.length === b.length && a.every((x, i) => Object.is(x, b[i]));
}

const wholeSmall = fc.integer({ min: 0, max: 200 });
const value = fc.oneof(
  wholeSmall,
  fc.integer({ min: 4090, max: 4100 }),
  fc.constantFrom(-0, 0, -1, 0.5, Number.NaN, Number.POSITIVE_INFINITY, Number.NEGATIVE_INFINITY),
  fc.double({ min: -50, max: 50, noNaN: true }),
);

describe("binCuts cuts the same bins as before", () => {
  it("on columns of small whole numbers (the counted path)", () => {
    fc.assert(
      fc.property(fc.array(wholeSmall, { minLength: 1, maxLength: 600 }), fc.integer({ min: 2, max: 255 }), (xs, maxBins) => {
        const col = Float64Array.from(xs);
        expect(sameCuts(binCuts(col, maxBins).cuts, formerBinCuts(col, maxBins).cuts)).toBe(true);
      }),
      { numRuns: 400 },
    );
  });

  it("on any column, with a training window shorter than the column", () => {
    fc.assert(
      fc.property(fc.array(value, { minLength: 1, maxLength: 400 }), fc.integer({ min: 2, max: 80 }), fc.double({ min: 0, max: 1, noNaN: true }), (xs, maxBins, share) => {
        const col = Float64Array.from(xs);
        const length = Math.floor(share * col.length);
        expect(sameCuts(binCuts(col, maxBins, length).cuts, formerBinCuts(col, maxBins, length).cuts)).toBe(true);
      }),
      { numRuns: 600 },
    );
  });

  it("on the calendar columns of a year of hours (the counted path, more values than bins)", () => {
    const hourOfWeek = Float64Array.from({ length: 8760 }, (_, i) => (i + 77) % 168);
    const dayOfYear = Float64Array.from({ length: 8760 }, (_, i) => 1 + Math.floor(i / 24));
    for (const col of [hourOfWeek, dayOfYear]) for (const maxBins of [16, 64, 255]) expect(sameCuts(binCuts(col, maxBins).cuts, formerBinCuts(col, maxBins).cuts)).toBe(true);
    // A −0 among whole numbers takes the comparison sort, as before.
    const withNegativeZero = Float64Array.from([3, -0, 0, 1, -0, 2]);
    expect(sameCuts(binCuts(withNegativeZero, 64).cuts, formerBinCuts(withNegativeZero, 64).cuts)).toBe(true);
  });
});
