import { describe, expect, it } from "vitest";
import { readFileSync } from "node:fs";
import { savgolCoefficients, savgolFilter } from "../../src/clean/savitzkyGolay.ts";
import { CleanInputError } from "../../src/clean/errors.ts";

const fixture = JSON.parse(readFileSync(new URL("../fixtures/reference/savitzky-golay.json", import.meta.url), "utf8")) as {
  coefficients: { window: number; order: number; deriv: number; pos: number | null; coefficients: number[] }[];
  values: number[];
  filters: { window: number; order: number; deriv: number; delta: number; output: number[] }[];
};

describe("Savitzky–Golay convolution weights against the published tables (Savitzky & Golay 1964, Steinier et al. 1972 corrections)", () => {
  // [window, order, deriv, integer weights, normalizer] as tabulated (project references, read/computed).
  const table: [number, number, number, number[], number][] = [
    [5, 2, 0, [-3, 12, 17, 12, -3], 35],
    [5, 3, 0, [-3, 12, 17, 12, -3], 35], // quadratic and cubic share weights
    [7, 2, 0, [-2, 3, 6, 7, 6, 3, -2], 21],
    [9, 2, 0, [-21, 14, 39, 54, 59, 54, 39, 14, -21], 231],
    [5, 1, 1, [-2, -1, 0, 1, 2], 10],
    [5, 2, 1, [-2, -1, 0, 1, 2], 10],
    [7, 2, 1, [-3, -2, -1, 0, 1, 2, 3], 28],
    [5, 3, 1, [1, -8, 0, 8, -1], 12],
    [5, 4, 1, [1, -8, 0, 8, -1], 12],
  ];
  for (const [w, k, d, ints, norm] of table) {
    it(`window ${w}, order ${k}, derivative ${d}: (${ints.join(" ")}) / ${norm}`, () => {
      const got = savgolCoefficients(w, k, { deriv: d });
      ints.forEach((v, j) => expect(got[j]).toBeCloseTo(v / norm, 13));
    });
  }
});

describe("Savitzky–Golay against scipy.signal (scripts/reference/make_fixtures.py)", () => {
  it("savgol_coeffs(use='dot') for many window/order/derivative/position combinations, 1e-10 absolute", () => {
    // 1e-10: weights are O(1) and come from a small least-squares solve in both libraries;
    // the worst case (window 25, 3rd derivative) is still far inside this.
    expect(fixture.coefficients.length).toBeGreaterThan(10);
    for (const c of fixture.coefficients) {
      const got = savgolCoefficients(c.window, c.order, { deriv: c.deriv, pos: c.pos ?? undefined });
      expect(got.length).toBe(c.coefficients.length);
      c.coefficients.forEach((v, j) => expect(Math.abs(got[j] - v), `w${c.window} k${c.order} d${c.deriv} pos${c.pos} [${j}]`).toBeLessThan(1e-10));
    }
  });
  it("savgol_filter(mode='interp') including both edges, 1e-9 absolute on values of order 10", () => {
    for (const f of fixture.filters) {
      const got = savgolFilter(fixture.values, f.window, f.order, f.deriv, f.delta);
      expect(got.length).toBe(f.output.length);
      f.output.forEach((v, i) => expect(Math.abs(got[i] - v), `w${f.window} k${f.order} d${f.deriv} i${i}`).toBeLessThan(1e-9));
    }
  });
});

describe("savgolFilter behaviour", () => {
  it("reproduces a polynomial of the filter's order exactly, edges included (least-squares property)", () => {
    const y = Array.from({ length: 20 }, (_, i) => 2 - 0.5 * i + 0.1 * i * i);
    const smooth = savgolFilter(y, 7, 2);
    y.forEach((v, i) => expect(smooth[i]).toBeCloseTo(v, 10));
    const slope = savgolFilter(y, 7, 2, 1, 0.5); // spacing 0.5 → derivative per unit of x = 2·dy/di
    y.forEach((_, i) => expect(slope[i]).toBeCloseTo((-0.5 + 0.2 * i) / 0.5, 10));
  });
  it("NaN in a window makes that window's outputs NaN (no silent fill)", () => {
    const y = Array.from({ length: 15 }, (_, i) => i);
    y[7] = Number.NaN;
    const out = savgolFilter(y, 5, 2);
    expect(Number.isNaN(out[7])).toBe(true);
    expect(Number.isNaN(out[5])).toBe(true);
    expect(out[4]).toBeCloseTo(4, 12);
  });
  it("rejects even windows, order ≥ window and series shorter than the window", () => {
    expect(() => savgolCoefficients(4, 2)).toThrow(CleanInputError);
    expect(() => savgolCoefficients(5, 5)).toThrow(CleanInputError);
    expect(() => savgolFilter([1, 2, 3], 5, 2)).toThrow(/shorter/);
  });
});
