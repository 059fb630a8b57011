/**
 * The forecast, rolling-origin backtests and calibration run on the invented demo portfolio: sane
 * bounds, every meter forecast, the drivers add up, and the acceptance figures of issue 12
 * (model vs the naive "same month last year" on the same meter-months; out-of-sample coverage).
 */
import { beforeAll, describe, expect, it } from "vitest";
import { loadPortfolio } from "../../src/ingest/index.ts";
import type { Portfolio } from "../../src/domain/types.ts";
import type { Tariff } from "../../src/tariff/index.ts";
import { CALIBRATION_GRID, forecastWithTrackRecord, type ForecastBundle } from "../../src/forecast/index.ts";

let portfolio: Portfolio<Tariff>;
let bundle: ForecastBundle;

beforeAll(async () => {
  const loaded = await loadPortfolio("data/demo");
  portfolio = loaded.portfolio as Portfolio<Tariff>;
  bundle = forecastWithTrackRecord(portfolio, { asOf: "2025-12-31", months: 12 });
}, 180_000);

describe("demo forecast", () => {
  it("forecasts every meter for 12 months with finite, ordered bands", () => {
    const rows = bundle.forecast.rows;
    expect(rows).toHaveLength(22 * 12);
    expect(new Set(rows.map((r) => r.month))).toEqual(new Set(Array.from({ length: 12 }, (_, k) => `2026-${String(k + 1).padStart(2, "0")}`)));
    for (const r of rows) {
      for (const v of [r.usage_p50, r.cost_p10, r.cost_p50, r.cost_p90]) expect(Number.isFinite(v)).toBe(true);
      expect(r.usage_p50).toBeGreaterThanOrEqual(0);
      expect(r.cost_p10).toBeLessThanOrEqual(r.cost_p50);
      expect(r.cost_p50).toBeLessThanOrEqual(r.cost_p90);
    }
    expect(bundle.forecast.buildings.every((b) => b.meters.every((m) => m.error === null))).toBe(true);
  });

  it("building and portfolio ranges are ordered, and wider than zero", () => {
    for (const b of bundle.forecast.buildings) {
      const c = b.costNext12m!;
      expect(c.p10).toBeLessThan(c.p50);
      expect(c.p50).toBeLessThan(c.p90);
    }
    const p = bundle.forecast.costNext12m!;
    expect(p.p10).toBeLessThan(p.p50);
    expect(p.p50).toBeLessThan(p.p90);
  });

  it("prices the interval meters from their own shape and says so", () => {
    for (const id of ["TWR-E", "LAB-E", "WHS-E"]) {
      const m = bundle.forecast.buildings.flatMap((b) => b.meters).find((x) => x.meterId === id)!;
      expect(m.months.every((x) => x.pricedFrom === "intervals")).toBe(true);
    }
  });

  it("drivers add up to each building's change vs last year", () => {
    for (const b of bundle.forecast.buildings) {
      const d = b.drivers;
      expect(d.months.length).toBeGreaterThan(6);
      expect(d.billingErrors + d.weather + d.rates + d.usageTrend).toBeCloseTo(d.change, 6);
    }
  });
});

describe("demo rolling-origin backtests", () => {
  it("backtests every cut year the data allows: one and two years of bills before the cut", () => {
    expect(bundle.backtest.origins).toEqual(["2024-12-31", "2023-12-31"]);
    expect(bundle.backtest.summaries.map((s) => s.historyMonths.min)).toEqual([23, 12]);
  });

  it("chooses the weather basis with the smallest mean absolute annual error, and says why", () => {
    const bases = bundle.backtest.bases;
    expect(bases.length).toBeGreaterThanOrEqual(1);
    expect(bundle.backtest.basis).toBe(bases[0]!.basis);
    for (const b of bases) expect(bases[0]!.meanAbsAnnualErrorPct).toBeLessThanOrEqual(b.meanAbsAnnualErrorPct);
    expect(bundle.backtest.basisReason).toMatch(/rolling origin/);
    expect(bundle.forecast.basis).toBe(bundle.backtest.basis);
  });

  it("at the origin with two years of bills the forecast beats the naive one on annual cost error and monthly CV(RMSE)", () => {
    const two = bundle.backtest.summaries.filter((s) => s.historyMonths.min >= 23);
    expect(two.length).toBeGreaterThan(0);
    for (const s of two) {
      expect(Math.abs(s.model!.annualErrorPct)).toBeLessThan(Math.abs(s.naive!.annualErrorPct));
      expect(s.model!.cvRmsePct).toBeLessThan(s.naive!.cvRmsePct);
      expect(s.model!.meterMonths).toBe(s.naive!.meterMonths);
    }
  });

  it("averaged over every origin the forecast beats the naive one on both measures", () => {
    const { model, naive } = bundle.backtest.overall;
    expect(Math.abs(model!.annualErrorPct)).toBeLessThan(Math.abs(naive!.annualErrorPct));
    expect(model!.cvRmsePct).toBeLessThan(naive!.cvRmsePct);
  });

  it("out-of-sample P10–P90 coverage is 70–90 % at every origin and pooled (each origin's factor chosen on the other)", () => {
    for (const s of bundle.backtest.summaries) {
      expect(s.calibrated).toBe(true);
      expect(s.coverage!).toBeGreaterThanOrEqual(0.7);
      expect(s.coverage!).toBeLessThanOrEqual(0.9);
    }
    expect(bundle.backtest.overall.coverage!).toBeGreaterThanOrEqual(0.7);
    expect(bundle.backtest.overall.coverage!).toBeLessThanOrEqual(0.9);
  });
})

describe("demo track record", () => {
  it("compares every meter over the backtest year on the same months as the naive forecast", () => {
    const tr = bundle.trackRecord;
    expect(tr.backtestAsOf).toBe("2024-12-31");
    expect(tr.meters).toHaveLength(22);
    for (const m of tr.meters) {
      expect(m.model).not.toBeNull();
      expect(m.model!.months).toBeGreaterThanOrEqual(10);
      expect(m.naive!.months).toBe(m.model!.months);
      expect(m.model!.coverage).toBeGreaterThanOrEqual(0);
      expect(m.model!.coverage).toBeLessThanOrEqual(1);
      expect(Number.isFinite(m.model!.cvRmsePct)).toBe(true);
    }
  });

  it("the forecast's noise factor is a grid factor, and wider noise never covers fewer months", () => {
    const c = bundle.calibration;
    expect(CALIBRATION_GRID).toContain(c.factor);
    expect(c.calibrated).toBe(true);
    const cov = c.coverageByFactor.map((x) => x.coverage);
    for (let i = 1; i < cov.length; i++) expect(cov[i]!).toBeGreaterThanOrEqual(cov[i - 1]! - 0.02);
  });
});
