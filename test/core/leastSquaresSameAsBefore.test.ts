/**
 * CPU work on the small least-squares solver of the change-point searches (issue 17: a column's
 * two sums of squares added in one pass) must not move a single bit: on random designs, the
 * current leastSquaresInPlace gives exactly the former code's SSE, coefficients and overwritten
 * arrays (test/core/former/leastSquaresInPlace.ts, a verbatim copy of commit daa4bc8), including
 * NaN for rank-deficient designs. Tolerance: none (Object.is on every number).
 */
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { leastSquaresInPlace } from "../../src/core/linalg.ts";
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
});
