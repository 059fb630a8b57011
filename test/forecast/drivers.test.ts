import { describe, expect, it } from "vitest";
import { buildingChangeDrivers, meterChangeDrivers } from "../../src/forecast/drivers.ts";
import { forecastMeter, type MeterForecastInput } from "../../src/forecast/forecastMeter.ts";
import { calendarBills, meter, tariffFrom } from "./helpers.ts";

const tariff = tariffFrom(`
id: t-flat
name: Test flat energy with a rate rise
commodity: electricity
usage_unit: kWh
currency: USD
versions:
  - from: 2020-01-01
    charges:
      - label: Energy
        energy: 0.10
  - from: 2026-01-01
    charges:
      - label: Energy
        energy: 0.12
`);

function input(): MeterForecastInput {
  const bills = calendarBills(2025, () => 1000, () => 100).map((b, i) => ({ ...b, billId: `b${i}` }));
  return { meter: meter({ tariffId: "t-flat" }), timezone: "UTC", tariff, asOf: "2025-12-31", months: 12, fit: null, typicalMonthlyTemp: null, weatherYears: [], bills, escalation: 0, scenarios: 200 };
}

describe("change drivers (hand-computed)", () => {
  const i = input();
  const f = forecastMeter(i);
  const d = meterChangeDrivers(i, f);

  it("rates: last year's 1000 kWh a month at 0.12 instead of 0.10 → 12 × 20 = 240", () => {
    expect(d.months).toHaveLength(12);
    expect(d.lastYearCost).toBeCloseTo(1200, 8);
    expect(d.rates).toBeCloseTo(240, 8);
  });

  it("weather is 0 without a weather model, and the three drivers add up to the change", () => {
    expect(d.weather).toBe(0);
    expect(d.weather + d.rates + d.usageTrend).toBeCloseTo(d.change, 8);
    expect(d.change).toBeCloseTo(d.forecastCost - 1200, 8);
    // The fallback centres on last year's 1000 kWh/month: forecast ≈ 12 × 120 = 1440, trend small.
    expect(d.forecastCost).toBeGreaterThan(1440 * 0.95);
    expect(d.forecastCost).toBeLessThan(1440 * 1.05);
  });

  it("building drivers add their meters' rates and keep the identity", () => {
    const b = buildingChangeDrivers("B1", [i, i], [f, f]);
    expect(b.rates).toBeCloseTo(480, 8);
    expect(b.lastYearCost).toBeCloseTo(2400, 8);
    expect(b.weather + b.rates + b.usageTrend).toBeCloseTo(b.change, 8);
  });
});
