import { describe, expect, it } from "vitest";
import { escalationBase, escalationFactorForDays, escalationFactorForMonth } from "../../src/forecast/escalation.ts";
import { calendarMonth } from "../../src/core/time/index.ts";

describe("escalation compounding", () => {
  it("3 %/year for 18 months (1.5 years of 365.25 days) is 1.03^1.5 = 1.045336 (hand-computed: 1.03 × √1.03)", () => {
    expect(escalationFactorForDays(0.03, 1.5 * 365.25)).toBeCloseTo(1.03 * Math.sqrt(1.03), 12);
    expect(escalationFactorForDays(0.03, 1.5 * 365.25)).toBeCloseTo(1.0453358, 6);
  });

  it("is 1 at or before the base date and with a zero rate", () => {
    expect(escalationFactorForDays(0.05, 0)).toBe(1);
    expect(escalationFactorForDays(0.05, -10)).toBe(1);
    expect(escalationFactorForDays(0, 400)).toBe(1);
  });

  it("counts to the middle of the forecast month (hand-computed)", () => {
    // 2026-01-01 → 2027-07-01 is 546 days; July has 31 days → midpoint 546 + 15.5 = 561.5 days.
    const f = escalationFactorForMonth(0.03, "2026-01-01", calendarMonth("2027-07"));
    expect(f).toBeCloseTo(Math.pow(1.03, 561.5 / 365.25), 12);
    // 4 % a year from a version of 2026-07-01 to the middle of December 2027:
    // 2026-07-01 → 2027-12-16T12:00 = 533.5 days.
    expect(escalationFactorForMonth(0.04, "2026-07-01", calendarMonth("2027-12"))).toBeCloseTo(Math.pow(1.04, 533.5 / 365.25), 12);
  });

  it("compounds from the later of the last version's start and the day after as-of", () => {
    expect(escalationBase("2022-01-01", "2025-12-31")).toBe("2026-01-01");
    expect(escalationBase("2026-07-01", "2025-12-31")).toBe("2026-07-01");
  });
});
