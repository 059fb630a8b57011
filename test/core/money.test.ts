/** roundCents' shortcut away from half cents gives exactly what cleaning to 15 digits gives (fast-check). */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { roundCents } from "../../src/core/money.ts";

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
