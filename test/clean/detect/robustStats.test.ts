import { describe, expect, it } from "vitest";
import { MAD_TO_SIGMA, madOf, medianOf, quantileOf, rollingMedian, rollingMedianBounds } from "../../../src/clean/detect/robustStats.ts";

describe("medianOf (hand-computed)", () => {
  it("odd count: middle value after sorting", () => {
    expect(medianOf([3, 1, 2])).toBe(2);
  });
  it("even count: mean of the two middle values", () => {
    expect(medianOf([4, 1, 3, 2])).toBe(2.5);
  });
  it("skips NaN; empty gives NaN", () => {
    expect(medianOf([NaN, 7, NaN, 1])).toBe(4);
    expect(medianOf([NaN])).toBeNaN();
    expect(medianOf([])).toBeNaN();
  });
  it("does not reorder its input", () => {
    const xs = [3, 1, 2];
    medianOf(xs);
    expect(xs).toEqual([3, 1, 2]);
  });
});

describe("madOf (hand-computed)", () => {
  it("[1,2,3,4,100]: median 3, |deviations| 2,1,0,1,97 → MAD 1", () => {
    expect(madOf([1, 2, 3, 4, 100])).toBe(1);
  });
  it("[2,4,4,4,5,5,7,9]: median 4.5, |dev| 2.5,.5,.5,.5,.5,.5,2.5,4.5 → MAD 0.5", () => {
    expect(madOf([2, 4, 4, 4, 5, 5, 7, 9])).toBe(0.5);
  });
  it("1.4826 is 1/Φ⁻¹(0.75) (Φ⁻¹(0.75) = 0.6744897…, standard normal tables)", () => {
    expect(1 / 0.6744897501960817).toBeCloseTo(MAD_TO_SIGMA, 4);
  });
});

describe("quantileOf (type 7, as R's quantile() default — hand-computed)", () => {
  it("p90 of 1..5: position 0.9 × 4 = 3.6 → 4 + 0.6 × (5 − 4) = 4.6", () => {
    expect(quantileOf([5, 1, 4, 2, 3], 0.9)).toBeCloseTo(4.6, 12);
  });
  it("q = 0 and 1 are min and max", () => {
    expect(quantileOf([5, 1, 4], 0)).toBe(1);
    expect(quantileOf([5, 1, 4], 1)).toBe(5);
  });
});

describe("rollingMedian (hand-computed)", () => {
  it("window 3 with truncated ends", () => {
    // i0 {1,9}→5; i1 {1,9,2}→2; i2 {9,2,3}→3; i3 {2,3,100}→3; i4 {3,100,4}→4; i5 {100,4}→52
    expect(Array.from(rollingMedian([1, 9, 2, 3, 100, 4], 1))).toEqual([5, 2, 3, 3, 4, 52]);
  });
  it("a step stays sharp with window 5 (why spikes are measured against a median)", () => {
    expect(Array.from(rollingMedian([0, 0, 0, 10, 10, 10], 2))).toEqual([0, 0, 0, 10, 10, 10]);
  });
  it("NaN inside a window is skipped; an all-NaN window gives NaN", () => {
    // i0 {1,NaN}→1; i1 {1,NaN,5}→3; i2 {NaN,5,NaN}→5; i3 {5,NaN}→5
    expect(Array.from(rollingMedian([1, NaN, 5, NaN], 1))).toEqual([1, 3, 5, 5]);
    expect(Array.from(rollingMedian([NaN, NaN], 0))).toEqual([NaN, NaN]);
  });
  it("half-window 0 is the identity", () => {
    expect(Array.from(rollingMedian([3, -1, 2], 0))).toEqual([3, -1, 2]);
  });
});

describe("rollingMedianBounds (hand-computed)", () => {
  it("lower and upper middle values; equal for odd counts", () => {
    // i0 {1,9}: 1|9; i1 {1,2,9}: 2; i2 {2,3,9}: 3; i3 {2,3,100}: 3; i4 {3,4,100}: 4; i5 {4,100}: 4|100
    const { lo, hi } = rollingMedianBounds([1, 9, 2, 3, 100, 4], 1);
    expect(Array.from(lo)).toEqual([1, 2, 3, 3, 4, 4]);
    expect(Array.from(hi)).toEqual([9, 2, 3, 3, 4, 100]);
  });
});
