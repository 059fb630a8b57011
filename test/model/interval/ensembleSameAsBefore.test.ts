/**
 * The ensemble search's scorer became a class instead of a closure per exponent (issue 17: V8
 * kept recompiling the closure for every meter). It may not move a bit: on random member
 * predictions the current searchEnsemble makes exactly the choice of the code before it
 * (test/model/interval/former/ensemble.ts, a verbatim copy of commit 3dfa24c). Tolerance: none
 * (Object.is on every number).
 */
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { searchEnsemble } from "../../../src/model/interval/ensemble.ts";
import { searchEnsemble as formerSearchEnsemble } from "./former/ensemble.ts";
import { mulberry32 } from "../../../src/core/random.ts";

function sameNumbers(a: ArrayLike<number>, b: ArrayLike<number>): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (!Object.is(a[i], b[i])) return false;
  return true;
}

describe("searchEnsemble gives the former code's choice bit for bit", () => {
  it("on random member predictions (some NaN), exponents and steps", () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 1000 }), fc.integer({ min: 2, max: 4 }), fc.constantFrom(0.1, 0.25, 0.5), (seed, m, weightStep) => {
        const rand = mulberry32(seed);
        const n = 200;
        const actual = Float64Array.from({ length: n }, () => 10 + rand() * 50);
        const members = Array.from({ length: m }, () => Float64Array.from(actual, (v) => (rand() < 0.01 ? Number.NaN : v + (rand() - 0.5) * 20)));
        const kinds = members.map((_, j) => `k${j}`);
        const options = { weightStep, exponents: [-1, 0, 0.5, 1, 2, 3] };
        const now = searchEnsemble(actual, members, kinds, options);
        const before = formerSearchEnsemble(actual, members, kinds, options);
        expect(now.kinds).toEqual(before.kinds);
        expect(sameNumbers(now.weights, before.weights)).toBe(true);
        expect(Object.is(now.exponent, before.exponent)).toBe(true);
        expect(Object.is(now.cvRmsePct, before.cvRmsePct)).toBe(true);
        expect(Object.is(now.gainPct, before.gainPct)).toBe(true);
        expect(now.used).toBe(before.used);
      }),
      { numRuns: 40 },
    );
  });
});
