/**
 * CPU work on the small least-squares solver of the change-point searches (issue 17: a column's
 * two sums of squares added in one pass) must not move a single bit: on random designs, the
 * current leastSquaresInPlace gives exactly the former code's SSE, coefficients and overwritten
 * arrays (test/core/former/leastSquaresInPlace.ts, a verbatim copy of commit daa4bc8), including
 * NaN for rank-deficient designs; and so does a solve that resumes from the state another
 * design with the same leading columns left (the change-point search's kept prefixes).
 * Tolerance: none (Object.is on every number).
 */
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { applyReflection, householderStep, leastSquaresFrom, leastSquaresInPlace } from "../../src/core/linalg.ts";
import { leastSquaresInPlace as former } from "./former/leastSquaresInPlace.ts";

const same = (a: ArrayLike<number>, b: ArrayLike<number>): boolean => a.length === b.length && Array.from(a).every((v, i) => Object.is(v, b[i]));

describe("leastSquaresInPlace gives the former code's numbers bit for bit", () => {
  it("on random column-major designs (with repeated, zero and collinear columns)", () => {
    const value = fc.oneof(fc.double({ min: -1e3, max: 1e3, noNaN: true }), fc.constantFrom(0, -0, 1, 2.5));
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 6 }), fc.integer({ min: 0, max: 30 }), fc.array(value, { minLength: 36 * 6 + 36, maxLength: 36 * 6 + 36 }), fc.constantFrom("none", "dup", "zero"), (k, extra, vals, twist) => {
        const m = k + extra;
        const a = Float64Array.from(vals.slice(0, m * k));
        if (twist === "dup" && k > 1) a.copyWithin((k - 1) * m, 0, m);
        if (twist === "zero") a.fill(0, 0, m);
        const y = Float64Array.from(vals.slice(36 * 6, 36 * 6 + m));
        const [a1, y1, c1] = [a.slice(), y.slice(), new Float64Array(k)];
        const [a2, y2, c2] = [a.slice(), y.slice(), new Float64Array(k)];
        expect(Object.is(leastSquaresInPlace(a1, y1, m, k, c1), former(a2, y2, m, k, c2))).toBe(true);
        expect(same(a1, a2) && same(y1, y2) && same(c1, c2)).toBe(true);
      }),
      { numRuns: 500, seed: 17 },
    );
  });

  it("resuming after p leading columns kept from another design with the same leading columns", () => {
    const value = fc.oneof(fc.double({ min: -1e3, max: 1e3, noNaN: true }), fc.constantFrom(0, -0, 1, 2.5));
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 6 }), fc.integer({ min: 0, max: 30 }), fc.nat(), fc.array(value, { minLength: 36 * 12 + 36, maxLength: 36 * 12 + 36 }), (k, extra, pick, vals) => {
        const m = k + extra;
        const p = pick % (k + 1);
        const a = Float64Array.from(vals.slice(0, m * k));
        const y = Float64Array.from(vals.slice(36 * 12, 36 * 12 + m));
        // another design: the same first p columns, other later ones
        const other = Float64Array.from(vals.slice(36 * 6, 36 * 6 + m * k));
        other.set(a.subarray(0, p * m));
        const [ao, yo, rDiag] = [other, y.slice(), new Float64Array(k)];
        let ok = true;
        for (let c = 0; c < p && ok; c++) ok = householderStep(ao, yo, m, k, c, rDiag);
        const [a2, y2, c2] = [a.slice(), y.slice(), new Float64Array(k)];
        const expected = former(a2, y2, m, k, c2);
        if (!ok) {
          expect(Number.isNaN(expected)).toBe(true);
          return;
        }
        // this design: the kept columns and response, its own later columns with the kept reflections applied
        const a1 = a.slice();
        a1.set(ao.subarray(0, p * m));
        for (let j = p; j < k; j++) for (let c = 0; c < p; c++) applyReflection(a1, m, c, a1, j * m);
        const c1 = new Float64Array(k);
        expect(Object.is(leastSquaresFrom(a1, yo, m, k, p, rDiag, c1), expected)).toBe(true);
        if (!Number.isNaN(expected)) expect(same(c1, c2) && same(yo, y2)).toBe(true);
      }),
      { numRuns: 500 },
    );
  });
});
