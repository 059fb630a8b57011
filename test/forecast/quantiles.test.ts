import { describe, expect, it } from "vitest";
import { quantile } from "simple-statistics";
import fc from "fast-check";
import { bandOf, p50Of } from "../../src/forecast/quantiles.ts";
import { ForecastInputError } from "../../src/forecast/errors.ts";

describe("bandOf (P10/P50/P90, type-7 quantiles)", () => {
  it("matches simple-statistics quantile on a random sample", () => {
    const xs = Array.from({ length: 301 }, (_, i) => Math.sin(i * 12.9898) * 43758.5453 % 100);
    const [p10, p50, p90] = quantile(xs, [0.1, 0.5, 0.9]) as number[];
    expect(bandOf(xs)).toEqual({ p10, p50, p90 });
  });

  it("is bit-identical to simple-statistics quantile for scenario-sized samples, with ties and negative values", () => {
    for (const n of [1, 2, 3, 10, 299, 300, 301, 1000]) {
      for (let seed = 1; seed <= 5; seed++) {
        // Rounded to cents so ties occur; centred near 0 so negatives and zeros occur.
        const xs = Array.from({ length: n }, (_, i) => Math.round(((Math.sin((i + 1) * seed * 12.9898) * 43758.5453) % 50) * 100) / 100);
        const [p10, p50, p90] = quantile(xs, [0.1, 0.5, 0.9]) as number[];
        const band = bandOf(Float64Array.from(xs));
        expect(Object.is(band.p10, p10) && Object.is(band.p50, p50) && Object.is(band.p90, p90), `n=${n} seed=${seed}`).toBe(true);
      }
    }
  });

  it("interpolates at index (n − 1)·p, as R type 7 / numpy 'linear' (hand-computed; numpy.quantile gives the same values)", () => {
    // n = 5: P10 index 0.4 → 1 + 0.4·(2 − 1) = 1.4; P90 index 3.6 → 4 + 0.6·(5 − 4) = 4.6.
    expect(bandOf([5, 1, 4, 2, 3])).toEqual({ p10: 1.4, p50: 3, p90: 4.6 });
    // The simple-statistics doc example sample, n = 11: indices 1, 5, 9 fall on order statistics.
    expect(bandOf([3, 6, 7, 8, 8, 9, 10, 13, 15, 16, 20])).toEqual({ p10: 6, p50: 9, p90: 16 });
  });

  it("is not the nearest-rank definition (which would give 1 and 5 for n = 5)", () => {
    const b = bandOf([1, 2, 3, 4, 5]);
    expect(b.p10).not.toBe(1);
    expect(b.p90).not.toBe(5);
  });

  it("rejects an empty sample and non-finite values", () => {
    expect(() => bandOf([])).toThrow(/no scenarios/);
    expect(() => bandOf([1, NaN])).toThrow(/not a finite number/);
  });
});

describe("p50Of", () => {
  it("is bandOf's p50, bit for bit, for any length (reference: bandOf, simple-statistics type 7)", () => {
    fc.assert(
      fc.property(fc.array(fc.double({ min: 0, max: 1e6, noNaN: true }), { minLength: 1, maxLength: 320 }), (xs) => {
        expect(Object.is(p50Of(xs), bandOf(xs).p50)).toBe(true);
        expect(Object.is(p50Of(Float64Array.from(xs)), bandOf(Float64Array.from(xs)).p50)).toBe(true);
      }),
      { numRuns: 300 },
    );
  });
  it("rejects what bandOf rejects", () => {
    expect(() => p50Of([])).toThrow(ForecastInputError);
    expect(() => p50Of([1, NaN])).toThrow(ForecastInputError);
  });
});
