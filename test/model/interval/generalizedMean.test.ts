import { describe, expect, it } from "vitest";
import { generalizedWeightedMean } from "../../../src/model/interval/generalizedMean.ts";
import { combinePredictions, searchEnsemble, simplexGrid } from "../../../src/model/interval/ensemble.ts";

describe("generalized weighted mean (hand-computed)", () => {
  const w = [0.5, 0.5];
  it("p = 1 arithmetic: 2.5", () => expect(generalizedWeightedMean([1, 4], w, 1)).toBe(2.5));
  it("p = 2 quadratic: √8.5", () => expect(generalizedWeightedMean([1, 4], w, 2)).toBeCloseTo(Math.sqrt(8.5), 14));
  it("p = 0 geometric: 2", () => expect(generalizedWeightedMean([1, 4], w, 0)).toBeCloseTo(2, 14));
  it("p → 0 tends to the geometric mean", () => expect(generalizedWeightedMean([1, 4], w, 1e-7)).toBeCloseTo(2, 6));
  it("p = −1 harmonic: 1.6", () => expect(generalizedWeightedMean([1, 4], w, -1)).toBeCloseTo(1.6, 14));
  it("weights are normalized; unequal weights [3, 1] of [1, 4] at p = 1: 1.75", () =>
    expect(generalizedWeightedMean([1, 4], [3, 1], 1)).toBe(1.75));
  it("rejects non-positive values when p ≠ 1 and all-zero weights", () => {
    expect(() => generalizedWeightedMean([0, 4], w, 0)).toThrow(/positive/);
    expect(() => generalizedWeightedMean([1, 4], [0, 0], 1)).toThrow(/weights/);
  });
});

describe("ensemble search", () => {
  it("simplex grid of 3 models with step 0.5 has 6 points", () => {
    expect(simplexGrid(3, 0.5)).toHaveLength(6);
    for (const g of simplexGrid(3, 0.1)) expect(g.reduce((a, b) => a + b, 0)).toBeCloseTo(1, 12);
  });

  it("finds the arithmetic half-half blend of two models with opposite errors, and reports the gain", () => {
    const actual = Array.from({ length: 200 }, (_, i) => 100 + 10 * Math.sin(i / 7));
    const a = actual.map((v, i) => v + (i % 2 ? 5 : -5));
    const b = actual.map((v, i) => v - (i % 2 ? 5 : -5));
    const e = searchEnsemble(actual, [a, b], ["a", "b"], { exponents: [0, 1, 2] });
    expect(e.weights).toEqual([0.5, 0.5]);
    expect(e.exponent).toBe(1);
    expect(e.cvRmsePct).toBeLessThan(1e-9);
    expect(e.gainPct).toBeCloseTo(100, 6);
    expect(e.used).toBe(true);
  });

  it("is not used when one model is already exact", () => {
    const actual = [1, 2, 3, 4, 5];
    const e = searchEnsemble(actual, [actual, actual.map((v) => v + 1)], ["exact", "off"]);
    expect(e.used).toBe(false);
    expect(e.bestSingleKind).toBe("exact");
    expect(e.gainPct).toBe(0);
  });

  it("combinePredictions applies the geometric mean row by row", () => {
    expect(Array.from(combinePredictions([[1, 9], [4, 1]], [0.5, 0.5], 0, 1e-9)).map((v) => +v.toFixed(12))).toEqual([2, 3]);
  });
});
