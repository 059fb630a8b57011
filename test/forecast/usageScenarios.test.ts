import { describe, expect, it } from "vitest";
import { fitChangePointAt } from "../../src/model/changePoint.ts";
import { drawScenarioNoise, fallbackUsageScenarios, modelUsageScenarios } from "../../src/forecast/usageScenarios.ts";
import { monthColumn, valueAt } from "../../src/forecast/scenarioMatrix.ts";
import { scenarioTemperatures, weatherYears } from "../../src/forecast/weatherYears.ts";
import { scenarioUniforms as mulberry32, studentScale, standardNormal } from "../../src/forecast/random.ts";
import type { WeatherSeries } from "../../src/domain/types.ts";
import { calendarMonth } from "../../src/core/time/index.ts";
import { calendarBills } from "./helpers.ts";

// Invented bills: use per day = 100 − 2·T plus a fixed pseudo-random scatter, 30-day periods.
const points = Array.from({ length: 24 }, (_, i) => {
  const temp = -5 + i * 1.5;
  return { temp, usePerDay: 100 - 2 * temp + 6 * Math.sin(i * 2.3), days: 30 };
});
const fit = fitChangePointAt(points, "2P", [], { weightByDays: true });
const january = calendarMonth("2026-01");

describe("model usage scenarios", () => {
  it("at calibration 1, about 80 % of draws fall in the model's own 80 % prediction interval (Student-t, n − p df)", () => {
    const typical = new Array<number>(12).fill(5);
    const s = modelUsageScenarios({ fit, typicalMonthlyTemp: typical, temperatureSets: [typical], months: [january], scenarios: 6000, calibration: 1, rng: mulberry32(1) });
    const band = fit.predictWithInterval(5, 0.8, 31);
    const jan = Array.from(monthColumn(s.usage, 0));
    const inside = jan.filter((u) => u / 31 >= band.lower && u / 31 <= band.upper).length / jan.length;
    // 6000 draws: standard error of the share √(0.16/6000) = 0.005; allow 4.5 SE.
    expect(inside).toBeGreaterThan(0.8 - 0.023);
    expect(inside).toBeLessThan(0.8 + 0.023);
  });

  it("a calibration factor of 2 doubles the spread (share in the 80 % interval falls to about half: P(|t| < 1.3212/2) for t with 22 df = 0.4843 by scipy.stats.t)", () => {
    const typical = new Array<number>(12).fill(5);
    const s = modelUsageScenarios({ fit, typicalMonthlyTemp: typical, temperatureSets: [typical], months: [january], scenarios: 3000, calibration: 2, rng: mulberry32(1) });
    const band = fit.predictWithInterval(5, 0.8, 31);
    const jan = Array.from(monthColumn(s.usage, 0));
    const inside = jan.filter((u) => u / 31 >= band.lower && u / 31 <= band.upper).length / jan.length;
    expect(inside).toBeGreaterThan(0.42);
    expect(inside).toBeLessThan(0.55);
  });

  it("cycles the weather years: scenario s uses year s mod W", () => {
    const typical = new Array<number>(12).fill(5);
    const sets = [typical.map(() => 0), typical.map(() => 10)];
    const s = modelUsageScenarios({ fit, typicalMonthlyTemp: typical, temperatureSets: sets, months: [january], scenarios: 4, calibration: 1e-9, rng: mulberry32(1) });
    expect(Array.from(s.weatherIndex)).toEqual([0, 1, 0, 1]);
    // Negligible noise: usage = ŷ(T)·31 for T = 0 and 10.
    expect(valueAt(s.usage, 0, 0)).toBeCloseTo(fit.predict(0) * 31, 4);
    expect(valueAt(s.usage, 1, 0)).toBeCloseTo(fit.predict(10) * 31, 4);
  });

  it("reusing the draws of an earlier call gives the same numbers as drawing anew (the backtests reuse them across bases and factors)", () => {
    const typical = new Array<number>(12).fill(5);
    const months = [january, calendarMonth("2026-02"), calendarMonth("2026-03")];
    const options = { fit, typicalMonthlyTemp: typical, temperatureSets: [typical, typical.map((t) => t + 3)], months, scenarios: 50 };
    const first = modelUsageScenarios({ ...options, calibration: 1, rng: mulberry32(7) });
    for (const calibration of [0.5, 2]) {
      const fresh = modelUsageScenarios({ ...options, calibration, rng: mulberry32(7) });
      const reused = modelUsageScenarios({ ...options, calibration, rng: () => { throw new Error("must not draw"); }, noise: first.noise });
      expect(Array.from(reused.usage.values)).toEqual(Array.from(fresh.usage.values));
    }
    // Draws of another shape (other df, counts or the fallback's) are not taken: fresh draws are made.
    const other = drawScenarioNoise(mulberry32(7), 3, 50, 3, true);
    expect(Array.from(modelUsageScenarios({ ...options, calibration: 1, rng: mulberry32(7), noise: other }).usage.values)).toEqual(Array.from(first.usage.values));
    const bills = [...calendarBills(2024, (m) => 60 + 10 * m, () => 1), ...calendarBills(2025, (m) => 90 + 8 * m, () => 1)].map((b, i) => ({ ...b, billId: `M1-${i}` }));
    const fb = fallbackUsageScenarios({ bills, months, scenarios: 50, calibration: 1, rng: mulberry32(9) })!;
    const fbReused = fallbackUsageScenarios({ bills, months, scenarios: 50, calibration: 2, rng: () => { throw new Error("must not draw"); }, noise: fb.noise })!;
    const fbFresh = fallbackUsageScenarios({ bills, months, scenarios: 50, calibration: 2, rng: mulberry32(9) })!;
    expect(Array.from(fbReused.usage.values)).toEqual(Array.from(fbFresh.usage.values));
  });
});

describe("random variates", () => {
  it("standard normals have mean ≈ 0 and variance ≈ 1 (20,000 draws; SE 0.007 and 0.01)", () => {
    const u = mulberry32(123);
    const xs = Array.from({ length: 20000 }, () => standardNormal(u));
    const mean = xs.reduce((a, b) => a + b, 0) / xs.length;
    const v = xs.reduce((a, b) => a + (b - mean) ** 2, 0) / (xs.length - 1);
    expect(Math.abs(mean)).toBeLessThan(0.03);
    expect(Math.abs(v - 1)).toBeLessThan(0.05);
  });

  it("normal × studentScale(df) has the t variance df/(df − 2) (df = 10 → 1.25)", () => {
    const u = mulberry32(99);
    const xs = Array.from({ length: 40000 }, () => standardNormal(u) * studentScale(u, 10));
    const v = xs.reduce((a, b) => a + b * b, 0) / xs.length;
    expect(Math.abs(v - 1.25)).toBeLessThan(0.06);
  });
});

describe("weather years", () => {
  // Invented station: two full years of hourly data in UTC; 2024 is 1 °C warmer than 2023 every hour,
  // and each month's temperature is the month number.
  const start = Date.UTC(2023, 0, 1);
  const hours = (Date.UTC(2025, 0, 1) - start) / 3_600_000;
  const tempC = new Float64Array(hours);
  for (let h = 0; h < hours; h++) {
    const d = new Date(start + h * 3_600_000);
    tempC[h] = d.getUTCMonth() + 1 + (d.getUTCFullYear() === 2024 ? 1 : 0);
  }
  const weather: WeatherSeries = { stationId: "X", startMs: start, tempC, filled: new Uint8Array(hours) };

  it("gives monthly means per calendar year, in the model's unit", () => {
    const years = weatherYears(weather, "UTC", "C");
    expect(years.map((y) => y.year)).toEqual([2023, 2024]);
    expect(years[0]!.monthlyTemp[0]).toBeCloseTo(1, 12);
    expect(years[1]!.monthlyTemp[6]).toBeCloseTo(8, 12);
    expect(weatherYears(weather, "UTC", "F")[0]!.monthlyTemp[0]).toBeCloseTo(33.8, 10);
  });

  it("stops at the as-of cut (a backtest cannot see later weather)", () => {
    const years = weatherYears(weather, "UTC", "C", Date.UTC(2024, 0, 1));
    expect(years.map((y) => y.year)).toEqual([2023]);
  });

  it("scenario temperatures = typical + each year's anomaly (hand-computed)", () => {
    const years = weatherYears(weather, "UTC", "C");
    const typical = new Array<number>(12).fill(0);
    // January: years 1 and 2, mean 1.5 → anomalies −0.5 and +0.5 around typical 0.
    const sets = scenarioTemperatures(typical, years);
    expect(sets[0]![0]).toBeCloseTo(-0.5, 12);
    expect(sets[1]![0]).toBeCloseTo(0.5, 12);
    expect(scenarioTemperatures(typical, [])).toEqual([typical]);
  });
});
