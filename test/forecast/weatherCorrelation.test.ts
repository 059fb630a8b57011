/**
 * Portfolio totals keep the weather's correlation: scenario s is the same calendar weather year
 * for every meter, even on stations whose histories differ (invented years and a stand-in fit).
 */
import { describe, expect, it } from "vitest";
import type { ChangePointFit } from "../../src/model/changePoint.ts";
import { meterUsageScenarios, type MeterForecastInput } from "../../src/forecast/forecastMeter.ts";
import type { WeatherYear } from "../../src/forecast/weatherYears.ts";
import { meter } from "./helpers.ts";
import { valueAt } from "../../src/forecast/scenarioMatrix.ts";
import { monthsAfter } from "../../src/core/time/index.ts";

/** Use per day = temperature, no prediction noise (only what modelUsageScenarios reads). */
const fit = {
  kind: "2P",
  parameterCount: 2,
  stats: { n: 24 },
  predict: (t: number) => t,
  predictWithInterval: (t: number) => ({ fit: t, seMean: 0, sePrediction: 0 }),
} as unknown as ChangePointFit;
const year = (y: number): WeatherYear => ({ year: y, monthlyTemp: new Array<number>(12).fill(y - 2000) });

function input(meterId: string, years: WeatherYear[], order?: number[]): MeterForecastInput {
  return {
    meter: meter({ meterId }), timezone: "UTC", tariff: null, asOf: "2024-12-31", months: 12, fit, typicalMonthlyTemp: new Array<number>(12).fill(21),
    weatherYears: years, bills: [], escalation: 0, scenarioYearOrder: order,
  };
}

describe("weather years aligned across stations", () => {
  const months = monthsAfter("2024-12-31", 12);
  const order = [2020, 2021, 2022];
  const a = meterUsageScenarios(input("A", [year(2020), year(2021), year(2022)], order), months, 6, 1)!;
  const b = meterUsageScenarios(input("B", [year(2021), year(2022)], order), months, 6, 1)!;

  it("scenario s draws calendar year order[s mod 3] on both stations (B lacks 2020 and falls back to its own s mod 2)", () => {
    // A's sets are 2020, 2021, 2022 (indices 0, 1, 2); B's are 2021, 2022 (indices 0, 1).
    expect(Array.from(a.weatherIndex)).toEqual([0, 1, 2, 0, 1, 2]);
    expect(Array.from(b.weatherIndex)).toEqual([0, 0, 1, 1, 0, 1]);
  });

  it("a warm year is warm for both: scenario 2 (2022) is above typical on both stations", () => {
    // Scenario temperature = typical 21 + the year's anomaly from the station's mean (A: 22 − 21; B: 22 − 21.5).
    expect(valueAt(a.usage, 2, 0) / 31).toBeCloseTo(22, 10);
    expect(valueAt(b.usage, 2, 0) / 31).toBeCloseTo(21.5, 10);
  });

  it("without an order each station cycles through its own years", () => {
    const free = meterUsageScenarios(input("B", [year(2021), year(2022)]), months, 4, 1)!;
    expect(Array.from(free.weatherIndex)).toEqual([0, 1, 0, 1]);
  });
});
