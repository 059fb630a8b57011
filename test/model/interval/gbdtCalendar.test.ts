import { describe, expect, it } from "vitest";
import { gbdtFeatureColumns, gbdtSpec, spreadHoldoutOrder, GBDT_FEATURE_NAMES } from "../../../src/model/interval/gbdtHourly.ts";
import { rmse, schoolYear } from "./syntheticSchool.ts";

describe("GBDT calendar feature (invented school-like data)", () => {
  it("adds the day of year as the last column (10 features; 9 without the calendar)", () => {
    const f = schoolYear(2021, 1);
    const cols = gbdtFeatureColumns(f);
    expect(cols).toHaveLength(GBDT_FEATURE_NAMES.length);
    expect(GBDT_FEATURE_NAMES.at(-1)).toBe("dayOfYear");
    expect(cols.at(-1)![24 * 200]).toBe(201);
    expect(gbdtFeatureColumns(f, false)).toHaveLength(9);
  });

  it("learns a summer break from one year and predicts it for the next year; without the calendar it cannot", () => {
    const year1 = schoolYear(2021, 1);
    const year2 = schoolYear(2022, 2);
    const withCal = gbdtSpec({ nTrees: 150 }).fit(year1).predict(year2);
    const without = gbdtSpec({ nTrees: 150, calendar: false }).fit(year1).predict(year2);
    // Hand-computed bounds. Blind: the break's 51 kWh step on its working hours (11 weeks × 40 h
    // = 440 of 8760 h) can at best be split between term and break → rmse ≳ 51·½·√(440/8760)
    // ≈ 5.7 kWh. Calendar: 64 quantile bins over 365 days put each of the two break edges up to
    // ~3 days (≈ 24 working hours) off → rmse ≲ 51·√(48/8760) ≈ 3.8 kWh, plus the 0.6 kWh noise.
    expect(rmse(year2.kwh, without)).toBeGreaterThan(5);
    expect(rmse(year2.kwh, withCal)).toBeLessThan(4);
    expect(rmse(year2.kwh, without)).toBeGreaterThan(2 * rmse(year2.kwh, withCal));
  });
});

describe("spreadHoldoutOrder (hand-computed)", () => {
  it("holds out 24-row blocks centred in equal parts of the window, the rest in order in front", () => {
    const o = Array.from(spreadHoldoutOrder(100, 48));
    const held = [...Array.from({ length: 24 }, (_, i) => 13 + i), ...Array.from({ length: 24 }, (_, i) => 63 + i)];
    expect(o.slice(-48)).toEqual(held);
    expect(o.slice(0, 52)).toEqual(Array.from({ length: 100 }, (_, i) => i).filter((i) => !held.includes(i)));
  });
  it("is a permutation and never holds out every row", () => {
    const o = spreadHoldoutOrder(30, 100);
    expect([...o].sort((a, b) => a - b)).toEqual(Array.from({ length: 30 }, (_, i) => i));
  });
});
