import { describe, expect, it } from "vitest";
import { readFileSync } from "node:fs";
import { regularizedIncompleteBeta, studentTCdf, studentTQuantile, studentTTwoSidedP } from "../../src/model/studentT.ts";
import { ModelInputError } from "../../src/model/errors.ts";

const fixture = JSON.parse(readFileSync(new URL("../fixtures/reference/student-t.json", import.meta.url), "utf8")) as {
  quantiles: { p: number; df: number; t: number }[];
  cdf: { t: number; df: number; cdf: number; twoSidedP: number }[];
};

describe("Student t quantile", () => {
  it("matches 40-digit mpmath quantiles to 1e-11 relative (scripts/reference/make_fixtures.py)", () => {
    // Tolerance: the quantile inherits the CDF's rounding (≈1e-14 absolute from the continued
    // fraction, more terms at large df) divided by the density; the worst case seen is 3e-12
    // relative at df = 8750. scipy 1.10's own t.ppf is off by up to 5e-9, hence mpmath.
    expect(fixture.quantiles.length).toBeGreaterThan(50);
    for (const q of fixture.quantiles) {
      const got = studentTQuantile(q.p, q.df);
      expect(Math.abs(got - q.t), `p=${q.p} df=${q.df}`).toBeLessThanOrEqual(1e-11 * Math.max(1, Math.abs(q.t)));
    }
  });
  it("gives the textbook table value t(0.975, 10) = 2.228 (common statistical tables)", () => {
    expect(studentTQuantile(0.975, 10)).toBeCloseTo(2.228, 3);
    expect(studentTQuantile(0.5, 7)).toBe(0);
  });
  it("rejects p outside (0, 1) and df ≤ 0", () => {
    expect(() => studentTQuantile(1, 5)).toThrow(ModelInputError);
    expect(() => studentTQuantile(0.9, 0)).toThrow(ModelInputError);
  });
});

describe("Student t CDF", () => {
  it("matches scipy.stats.t.cdf and 2·sf to 1e-12 absolute (scripts/reference/make_fixtures.py)", () => {
    for (const c of fixture.cdf) {
      expect(Math.abs(studentTCdf(c.t, c.df) - c.cdf), `t=${c.t} df=${c.df}`).toBeLessThan(1e-12);
      const p = studentTTwoSidedP(c.t, c.df);
      expect(Math.abs(p - c.twoSidedP), `t=${c.t} df=${c.df}`).toBeLessThanOrEqual(1e-12 + 1e-9 * c.twoSidedP);
    }
  });
  it("I_x(a,b) is symmetric: I_0.5(2,2) = 0.5 and I_x(1,1) = x (hand-computed)", () => {
    expect(regularizedIncompleteBeta(0.5, 2, 2)).toBeCloseTo(0.5, 14);
    expect(regularizedIncompleteBeta(0.3, 1, 1)).toBeCloseTo(0.3, 14);
  });
});
