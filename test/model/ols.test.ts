import { describe, expect, it } from "vitest";
import { readFileSync } from "node:fs";
import { fitOls } from "../../src/model/ols.ts";
import { ModelInputError } from "../../src/model/errors.ts";

interface OlsCase {
  name: string;
  intercept: boolean;
  x: number[][];
  y: number[];
  weights: number[] | null;
  expected: {
    coefficients: number[];
    standardErrors: number[];
    tValues: number[];
    pValues: number[];
    residualStdError: number;
    rSquared: number;
    adjRSquared: number;
    dfResidual: number;
    sse: number;
  };
  predictions: { x: number[]; level: number; fit: number; seMean: number; lower: number; upper: number }[];
}
const fixture = JSON.parse(readFileSync(new URL("../fixtures/reference/ols.json", import.meta.url), "utf8")) as { cases: OlsCase[] };

function expectRel(got: number, want: number, rel: number, label: string): void {
  expect(Math.abs(got - want), `${label}: got ${got}, want ${want}`).toBeLessThanOrEqual(rel * Math.max(Math.abs(want), 1e-300));
}

describe("fitOls against statsmodels (scripts/reference/make_fixtures.py)", () => {
  expect(fixture.cases.map((c) => c.name)).toEqual(["simple", "quadratic-offset", "no-intercept", "weighted"]);
  for (const c of fixture.cases) {
    it(`${c.name}: coefficients, SEs, t, p, R², interval match to 1e-8 relative`, () => {
      const fit = fitOls(c.x, c.y, { intercept: c.intercept, weights: c.weights ?? undefined });
      const e = c.expected;
      // 1e-8: both sides solve the same least-squares problem by orthogonal methods in double
      // precision; the ill-conditioned case has cond(X) ≈ 1e5, so 1e-16·cond² stays well below it.
      e.coefficients.forEach((v, j) => expectRel(fit.coefficients[j], v, 1e-8, `beta${j}`));
      e.standardErrors.forEach((v, j) => expectRel(fit.standardErrors[j], v, 1e-8, `se${j}`));
      e.tValues.forEach((v, j) => expectRel(fit.tValues[j], v, 1e-8, `t${j}`));
      e.pValues.forEach((v, j) => expectRel(fit.pValues[j], v, 1e-7, `p${j}`));
      expectRel(fit.residualStdError, e.residualStdError, 1e-8, "s");
      expectRel(fit.rSquared, e.rSquared, 1e-8, "R2");
      expectRel(fit.adjRSquared, e.adjRSquared, 1e-8, "adjR2");
      expectRel(fit.sse, e.sse, 1e-8, "sse");
      expect(fit.dfResidual).toBe(e.dfResidual);
      expect(c.predictions.length).toBeGreaterThan(0);
      for (const p of c.predictions) {
        const got = fit.predictWithInterval(p.x, p.level);
        expectRel(got.fit, p.fit, 1e-8, "fit");
        expectRel(got.seMean, p.seMean, 1e-8, "seMean");
        expectRel(got.lower, p.lower, 1e-8, `lower@${p.level}`);
        expectRel(got.upper, p.upper, 1e-8, `upper@${p.level}`);
      }
    });
  }
});

describe("fitOls input checks", () => {
  it("exact line: y = 1 + 2x gives zero residual (hand-computed)", () => {
    const fit = fitOls([[0], [1], [2], [3]], [1, 3, 5, 7]);
    expect(fit.coefficients[0]).toBeCloseTo(1, 12);
    expect(fit.coefficients[1]).toBeCloseTo(2, 12);
    expect(fit.sse).toBeLessThan(1e-24);
  });
  it("names the collinear column", () => {
    expect(() => fitOls([[1, 2], [2, 4], [3, 6], [4, 8]], [1, 2, 3, 4], { columnNames: ["a", "b"] })).toThrow(/b is constant or a combination/);
  });
  it("rejects NaN, bad weights and too few rows", () => {
    expect(() => fitOls([[1], [2], [3]], [1, Number.NaN, 3])).toThrow(ModelInputError);
    expect(() => fitOls([[1], [2], [3]], [1, 2, 3], { weights: [1, 0, 1] })).toThrow(/weight/);
    expect(() => fitOls([[1], [2]], [1, 2])).toThrow(/more observations/);
  });
});
