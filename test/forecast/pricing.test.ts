import { describe, expect, it } from "vitest";
import { priceForecastMonth, type MonthPricingContext } from "../../src/forecast/priceMonth.ts";
import { forecastMeter, meterUsageScenarios, type MeterForecastInput } from "../../src/forecast/forecastMeter.ts";
import { monthColumn, scenarioTotals } from "../../src/forecast/scenarioMatrix.ts";
import { monthsAfter } from "../../src/core/time/index.ts";
import { bandOf } from "../../src/forecast/quantiles.ts";
import { BLOCK_DEMAND_YAML, calendarBills, meter, tariffFrom } from "./helpers.ts";
import { calendarMonth } from "../../src/core/time/index.ts";

const tariff = tariffFrom(BLOCK_DEMAND_YAML);

function ctx(overrides: Partial<MonthPricingContext> = {}): MonthPricingContext {
  return {
    tariff,
    timezone: "UTC",
    usageUnit: "kWh",
    month: calendarMonth("2026-01"),
    shape: null,
    loadShapeByHourOfWeek: null,
    kwPerUsePerDay: 3.1,
    powerFactor: null,
    escalationFactor: 1,
    ...overrides,
  };
}

describe("pricing a forecast month (hand-computed)", () => {
  it("blocks + demand: 150 kWh in January at 3.1 kW per kWh/day", () => {
    // demand = 3.1 × 150 / 31 = 15 kW; 10 + 100 × 0.10 + 50 × 0.05 + 15 × 5 = 97.50
    const r = priceForecastMonth(ctx(), 150, []);
    expect(r.cost).toBeCloseTo(97.5, 10);
    expect(r.billingDemandKw).toBeCloseTo(15, 10);
  });

  it("applies the escalation factor to the priced total", () => {
    expect(priceForecastMonth(ctx({ escalationFactor: 1.1 }), 150, []).cost).toBeCloseTo(107.25, 10);
  });

  it("without demand ratios the bill has no measured demand: 10 + 10 + 2.5 = 22.50 for 150 kWh", () => {
    expect(priceForecastMonth(ctx({ kwPerUsePerDay: null }), 150, []).cost).toBeCloseTo(22.5, 10);
  });

  it("a block tariff is not linear: price of the mean usage ≠ mean of the prices (hand-computed)", () => {
    const noDemand = ctx({ kwPerUsePerDay: null });
    // 50 kWh → 10 + 5 = 15; 150 kWh → 22.5; mean of prices 18.75; price of mean (100 kWh) = 20.
    const prices = [50, 150].map((u) => priceForecastMonth(noDemand, u, []).cost);
    expect((prices[0]! + prices[1]!) / 2).toBeCloseTo(18.75, 10);
    expect(priceForecastMonth(noDemand, 100, []).cost).toBeCloseTo(20, 10);
  });
});

function fallbackInput(overrides: Partial<MeterForecastInput> = {}): MeterForecastInput {
  // Two years of invented monthly bills; usage swings between years so the fallback has scatter.
  const bills = [
    ...calendarBills(2024, (m) => 60 + 10 * m, () => 1),
    ...calendarBills(2025, (m) => 90 + 8 * m, () => 1),
  ].map((b, i) => ({ ...b, billId: `M1-${i}` }));
  return {
    meter: meter(),
    timezone: "UTC",
    tariff: tariffFrom(BLOCK_DEMAND_YAML.replace("      - label: Demand\n        demand: 5\n", "")),
    asOf: "2025-12-31",
    months: 12,
    fit: null,
    typicalMonthlyTemp: null,
    weatherYears: [],
    bills,
    escalation: 0,
    scenarios: 300,
    ...overrides,
  };
}

describe("forecastMeter: every scenario priced", () => {
  it("monthly bands are quantiles of the scenario prices, not the price of a usage quantile mean", () => {
    const f = forecastMeter(fallbackInput());
    expect(f.error).toBeNull();
    expect(f.method).toBe("same-month-average");
    const k = 2; // March: mean use (90 + 114)/2 = 102 kWh sits on the 100 kWh block edge
    // The usage each scenario was priced from: the same seeded draws again.
    const usage = Array.from(monthColumn(meterUsageScenarios(fallbackInput(), monthsAfter("2025-12-31", 12), 300, 1)!.usage, k));
    expect(bandOf(usage)).toEqual(f.months[k]!.usage);
    // Re-price every scenario's usage by hand: 10 + 0.10·min(u,100) + 0.05·max(u−100,0), rounded per line.
    const byHand = usage.map((x) => {
      return 10 + Math.round(0.1 * Math.min(x, 100) * 100) / 100 + Math.round(0.05 * Math.max(x - 100, 0) * 100) / 100;
    });
    const band = bandOf(byHand);
    expect(f.months[k]!.cost.p10).toBeCloseTo(band.p10, 6);
    expect(f.months[k]!.cost.p50).toBeCloseTo(band.p50, 6);
    expect(f.months[k]!.cost.p90).toBeCloseTo(band.p90, 6);
    // The block rate falls above 100 kWh (a concave price), so by Jensen's inequality the mean
    // of the scenario prices lies below the price of the mean usage.
    const meanUsage = usage.reduce((s, u) => s + u, 0) / usage.length;
    const meanPrice = byHand.reduce((a, b) => a + b, 0) / byHand.length;
    const priceOfMean = 10 + 0.1 * Math.min(meanUsage, 100) + 0.05 * Math.max(meanUsage - 100, 0);
    expect(meanPrice).toBeLessThan(priceOfMean - 0.1);
  });

  it("the year's band is taken over scenario totals, not summed monthly quantiles", () => {
    const f = forecastMeter(fallbackInput());
    const totals = scenarioTotals(f.scenarioCosts);
    expect(f.total!.cost).toEqual(bandOf(totals));
    const sumOfP90 = f.months.reduce((s, m) => s + m.cost.p90, 0);
    expect(f.total!.cost.p90).toBeLessThan(sumOfP90);
  });

  it("fallback usage centres on the same calendar month's use per day (hand-computed)", () => {
    const f = forecastMeter(fallbackInput());
    // January: (70 + 98) / 2 = 84 kWh over 31 days in both years → 84 kWh expected for Jan 2026.
    expect(f.months[0]!.usage.p50).toBeGreaterThan(84 * 0.95);
    expect(f.months[0]!.usage.p50).toBeLessThan(84 * 1.05);
  });

  it("is deterministic for a seed and changes with the seed", () => {
    const a = forecastMeter(fallbackInput({ seed: 7 }));
    const b = forecastMeter(fallbackInput({ seed: 7 }));
    const c = forecastMeter(fallbackInput({ seed: 8 }));
    expect(a.months).toEqual(b.months);
    expect(a.total).toEqual(b.total);
    expect(c.total!.cost.p50).not.toBe(a.total!.cost.p50);
  });

  it("reports the escalation factor per month, compounding from the day after as-of", () => {
    const f = forecastMeter(fallbackInput({ escalation: 0.03 }));
    expect(f.escalationFrom).toBe("2026-01-01");
    expect(f.months[0]!.escalationFactor).toBeCloseTo(Math.pow(1.03, 15.5 / 365.25), 12);
    expect(f.months[11]!.escalationFactor).toBeCloseTo(Math.pow(1.03, (334 + 15.5) / 365.25), 12);
  });

  it("says why when the tariff is missing, with usage still forecast", () => {
    const f = forecastMeter(fallbackInput({ tariff: null }));
    expect(f.error).toMatch(/tariff 't-blocks' is not available/);
    expect(f.months).toHaveLength(12);
    expect(Number.isFinite(f.months[0]!.usage.p50)).toBe(true);
  });
});
