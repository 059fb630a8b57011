import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { DEFAULT_TOWT_KNOTS_F, temperatureComponents } from "../../src/clean/timeOfWeek.ts";
import { CleanInputError } from "../../src/clean/errors.ts";
import { hourOfWeek, intervalOfWeek } from "../../src/core/time/index.ts";

describe("piecewise-linear temperature components (Mathieu et al. 2011)", () => {
  it("T = 67 °F with knots 40…80 → 40, 10, 10, 7, 0, 0 (project references, computed)", () => {
    expect(DEFAULT_TOWT_KNOTS_F).toEqual([40, 50, 60, 70, 80]);
    expect(temperatureComponents(67)).toEqual([40, 10, 10, 7, 0, 0]);
  });
  it("below the first knot and above the last (hand-computed)", () => {
    expect(temperatureComponents(12)).toEqual([12, 0, 0, 0, 0, 0]);
    expect(temperatureComponents(95)).toEqual([40, 10, 10, 10, 10, 15]);
    expect(temperatureComponents(-5, [0, 10])).toEqual([-5, 0, 0]);
  });
  it("components always sum to T (property of the definition)", () => {
    fc.assert(fc.property(fc.double({ min: -60, max: 130, noNaN: true }), (t) => {
      const sum = temperatureComponents(t).reduce((a, b) => a + b, 0);
      return Math.abs(sum - t) <= 1e-9;
    }));
  });
  it("rejects non-increasing knots and NaN", () => {
    expect(() => temperatureComponents(50, [40, 40, 60])).toThrow(CleanInputError);
    expect(() => temperatureComponents(Number.NaN)).toThrow(CleanInputError);
  });
});

describe("hour of week in the building's IANA zone (luxon; US DST rules, 15 U.S.C. 260a)", () => {
  it("Monday 2024-01-01 09:00 EST (14:00 UTC) is hour 9; Sunday 23:00 local is 167", () => {
    expect(hourOfWeek(Date.UTC(2024, 0, 1, 14), "America/New_York")).toBe(9);
    expect(hourOfWeek(Date.UTC(2024, 0, 8, 4, 30), "America/New_York")).toBe(167); // Sun 2024-01-07 23:30 EST
  });
  it("the same UTC instant falls in different hours of week in different zones", () => {
    const t = Date.UTC(2024, 5, 3, 0, 0); // Monday 00:00 UTC
    expect(hourOfWeek(t, "UTC")).toBe(0);
    expect(hourOfWeek(t, "America/Los_Angeles")).toBe(6 * 24 + 17); // Sunday 17:00 PDT
  });
  it("spring forward 2024-03-10: 06:59 UTC is 01:59 EST, 07:00 UTC is 03:00 EDT (02:xx never occurs)", () => {
    expect(hourOfWeek(Date.UTC(2024, 2, 10, 6, 59), "America/New_York")).toBe(6 * 24 + 1);
    expect(hourOfWeek(Date.UTC(2024, 2, 10, 7, 0), "America/New_York")).toBe(6 * 24 + 3);
  });
  it("fall back 2024-11-03: 05:30 and 06:30 UTC are both 01:30 local (hour 145)", () => {
    expect(hourOfWeek(Date.UTC(2024, 10, 3, 5, 30), "America/New_York")).toBe(145);
    expect(hourOfWeek(Date.UTC(2024, 10, 3, 6, 30), "America/New_York")).toBe(145);
  });
  it("15-minute intervals: Monday 00:45 local is interval 3; a week has 672", () => {
    expect(intervalOfWeek(Date.UTC(2024, 0, 1, 0, 45), "UTC", 15)).toBe(3);
    expect(intervalOfWeek(Date.UTC(2024, 0, 7, 23, 45), "UTC", 15)).toBe(671);
  });
  it("an unknown zone or a bad interval is an error with a hint", () => {
    expect(() => hourOfWeek(0, "Mars/Olympus")).toThrow(/IANA/);
    expect(() => intervalOfWeek(0, "UTC", 7)).toThrow(RangeError);
  });
});
