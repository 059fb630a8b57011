/** roundCents' shortcut away from half cents gives exactly what cleaning to 15 digits gives (fast-check). */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { Compensated, roundCents, sumAmounts } from "../../src/core/money.ts";

/** The rule as written before the shortcut: clean the cents to 15 significant digits, then round half up. */
function reference(amount: number): number {
  if (!Number.isFinite(amount)) return amount;
  const cents = Number((Math.abs(amount) * 100).toPrecision(15));
  const rounded = Math.floor(cents + 0.5) / 100;
  return amount < 0 ? -rounded : rounded === 0 ? 0 : rounded;
}

const same = (x: number): void => {
  expect(Object.is(roundCents(x), reference(x)), `roundCents(${x})`).toBe(true);
};

describe("roundCents", () => {
  it("agrees with the 15-digit rule on any double, on amounts of every size, and next to every half cent", () => {
    fc.assert(fc.property(fc.double({ noNaN: true }), same), { numRuns: 20_000 });
    fc.assert(fc.property(fc.double({ min: -1e9, max: 1e9, noNaN: true }), same), { numRuns: 20_000 });
    fc.assert(fc.property(fc.double({ min: -1000, max: 1000, noNaN: true }), same), { numRuns: 20_000 });
    // Half cents (k + 0.5) / 100 and their neighbours a few ulps and a little more away, up to 10^8 units.
    fc.assert(
      fc.property(fc.integer({ min: -1e10, max: 1e10 }), fc.integer({ min: -40, max: 40 }), fc.constantFrom(0, 1e-13, 1e-9, 1e-7, 2e-7, 1e-6), (k, ulps, rel) => {
        let x = (k + 0.5) / 100;
        x *= 1 + ulps * Number.EPSILON + Math.sign(ulps) * rel;
        same(x);
      }),
      { numRuns: 20_000 },
    );
  });

  it("keeps the documented cases", () => {
    expect(roundCents(1.005)).toBe(1.01);
    expect(roundCents(-2.345)).toBe(-2.35);
    expect(roundCents(421_696_373.6845)).toBe(421_696_373.68);
    expect(Object.is(roundCents(-0.001), -0)).toBe(Object.is(reference(-0.001), -0));
  });
});

/** sumAmounts' loop as written before it went through Compensated: Neumaier's compensated sum. */
function formerSumAmounts(values: readonly number[]): number {
  let sum = 0;
  let c = 0;
  for (const v of values) {
    const t = sum + v;
    c += Math.abs(sum) >= Math.abs(v) ? sum - t + v : v - t + sum;
    sum = t;
  }
  return sum + c;
}

describe("sumAmounts and Compensated", () => {
  it("keep what plain addition loses (Neumaier's example, from memory: 1 + 1e100 + 1 − 1e100 = 2; ten dimes are a dollar)", () => {
    expect(sumAmounts([1, 1e100, 1, -1e100])).toBe(2);
    expect(sumAmounts(new Array(10).fill(0.1))).toBe(1);
  });

  it("add one value at a time to the former loop's number, -0 and huge cancellations included", () => {
    fc.assert(
      fc.property(fc.array(fc.oneof(fc.double({ noNaN: true, noDefaultInfinity: true }), fc.double({ min: -1e3, max: 1e3 }), fc.constant(-0), fc.constant(1e308)), { maxLength: 12 }), (xs) => {
        const acc = new Compensated().reset();
        for (const x of xs) acc.add(x);
        expect(Object.is(acc.total(), formerSumAmounts(xs))).toBe(true);
        expect(Object.is(sumAmounts(xs), formerSumAmounts(xs))).toBe(true);
        expect(acc.count).toBe(xs.length);
      }),
      { numRuns: 500 },
    );
  });
});
