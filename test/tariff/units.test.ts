import { describe, expect, it } from "vitest";
import { unitFactor } from "../../src/tariff/units.ts";
import { GAL_PER_CCF, KWH_PER_THERM } from "../../src/core/units.ts";

describe("unitFactor", () => {
  it("1 therm = 29.3071 kWh (100,000 Btu, EIA; Btu = 1055.05585262 J, NIST SP 811)", () => {
    expect(KWH_PER_THERM).toBeCloseTo(29.3071, 4);
    expect(unitFactor("gas", "therm", "kWh")).toBeCloseTo(29.3071, 4);
    expect(unitFactor("gas", "kWh", "therm")).toBeCloseTo(1 / 29.3071, 7);
  });
  it("1 ccf = 748.052 gal (1 gal = 231 in3, computed)", () => {
    expect(GAL_PER_CCF).toBeCloseTo(748.0519, 4);
    expect(unitFactor("water", "ccf", "gal")).toBeCloseTo(748.052, 3);
    expect(unitFactor("water", "m3", "gal")).toBeCloseTo(264.172, 3); // 1 m3 / 3.785411784 L
  });
  it("ccf -> therm uses the heat content (default 1.037 therm/ccf)", () => {
    expect(unitFactor("gas", "ccf", "therm")).toBeCloseTo(1.037, 12);
    expect(unitFactor("gas", "ccf", "therm", 1.02)).toBeCloseTo(1.02, 12);
    // 1 m3 = 35.3147 ft3 = 0.353147 ccf (1 ft = 0.3048 m exactly)
    expect(unitFactor("gas", "m3", "therm", 1)).toBeCloseTo(0.353147, 6);
  });
  it("MWh <-> kWh and case-insensitive names", () => {
    expect(unitFactor("electricity", "MWh", "kWh")).toBe(1000);
    expect(unitFactor("electricity", "kwh", "MWH")).toBe(0.001);
  });
  it("returns null for units of another commodity", () => {
    expect(unitFactor("electricity", "therm", "kWh")).toBeNull();
    expect(unitFactor("water", "kWh", "gal")).toBeNull();
  });
});
