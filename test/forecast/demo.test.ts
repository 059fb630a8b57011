/**
 * The forecast, track record and calibration run on the invented demo portfolio: sane bounds,
 * every meter forecast, the drivers add up, and the numbers the report quotes.
 */
import { beforeAll, describe, expect, it } from "vitest";
import { loadPortfolio } from "../../src/ingest/index.ts";
import type { Portfolio } from "../../src/domain/types.ts";
import type { Tariff } from "../../src/tariff/index.ts";
import { CALIBRATION_GRID, TARGET_COVERAGE, forecastWithTrackRecord, type ForecastBundle } from "../../src/forecast/index.ts";

let portfolio: Portfolio<Tariff>;
let bundle: ForecastBundle;
let elapsedMs = 0;

beforeAll(async () => {
  const loaded = await loadPortfolio("data/demo");
  portfolio = loaded.portfolio as Portfolio<Tariff>;
  const t = performance.now();
  bundle = forecastWithTrackRecord(portfolio, { asOf: "2025-12-31", months: 12 });
  elapsedMs = performance.now() - t;
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
      expect(d.weather + d.rates + d.usageTrend).toBeCloseTo(d.change, 6);
    }
  });

  it("runs in a bounded time (shared, loaded machines: generous budget; measured value in the report)", () => {
    expect(elapsedMs).toBeLessThan(120_000);
  });
});

describe("demo track record", () => {
  it("compares every meter over the backtest year, with coverage reported", () => {
    const tr = bundle.trackRecord;
    expect(tr.backtestAsOf).toBe("2024-12-31");
    expect(tr.meters).toHaveLength(22);
    for (const m of tr.meters) {
      expect(m.model).not.toBeNull();
      expect(m.model!.months).toBeGreaterThanOrEqual(10);
      expect(m.model!.coverage).toBeGreaterThanOrEqual(0);
      expect(m.model!.coverage).toBeLessThanOrEqual(1);
      expect(Number.isFinite(m.model!.cvRmsePct)).toBe(true);
    }
  });

  it("picks the grid factor whose pooled coverage is nearest 80 %", () => {
    const c = bundle.calibration;
    expect(CALIBRATION_GRID).toContain(c.factor);
    const chosen = c.coverageByFactor.find((x) => x.factor === c.factor)!;
    for (const x of c.coverageByFactor) expect(Math.abs(chosen.coverage - TARGET_COVERAGE)).toBeLessThanOrEqual(Math.abs(x.coverage - TARGET_COVERAGE) + 1e-12);
    // Wider noise never covers fewer months (same random numbers for every factor).
    const cov = c.coverageByFactor.map((x) => x.coverage);
    for (let i = 1; i < cov.length; i++) expect(cov[i]!).toBeGreaterThanOrEqual(cov[i - 1]! - 0.02);
  });

  it("the calibrated band holds 70–90 % of the backtest months (the issue's acceptance range)", () => {
    const cov = bundle.trackRecord.overall.model!.coverage!;
    expect(cov).toBeGreaterThanOrEqual(0.7);
    expect(cov).toBeLessThanOrEqual(0.9);
  });

  it("beats the naive same-month-last-year forecast on mean absolute annual cost error", () => {
    const { model, naive } = bundle.trackRecord.overall.meanAbsAnnualErrorPct;
    expect(model!).toBeLessThan(naive!);
  });
});
