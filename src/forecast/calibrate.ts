/**
 * Calibration of the noise scale so the P10–P90 band holds about 80 % of actual months.
 *
 * For each factor c of a small grid, every meter's backtest usage scenarios are drawn again
 * (same seed, so the factors are compared on the same random numbers), the band edges are
 * priced, and the share of compared months whose actual cost lies inside is pooled over the
 * portfolio's meters; the factor whose share is nearest 80 % wins (ties: the smaller factor).
 *
 * To keep this cheap, only the usage P10 and P90 of each month are priced (along their own
 * month-by-month paths, so ratchets see them). That equals the P10/P90 of priced scenarios when
 * a month's cost never falls as its usage rises — true of blocks, demand charges, ratchets,
 * percent taxes and minimum bills with non-negative rates — and is used only to choose c: the
 * reported bands always price every scenario.
 *
 * With one backtest year (about 12 months per meter) this is a coarse calibration: the
 * coverage of a 22-meter portfolio moves in steps of under half a percent but the months of
 * one year share one weather year, so the chosen factor can be off for the next year.
 */
import type { Bill } from "../domain/types.ts";
import { meterPricingContexts, meterUsageScenarios, DEFAULT_SCENARIOS, type MeterForecastInput } from "./forecastMeter.ts";
import { monthsAfter } from "./months.ts";
import { priceForecastMonth } from "./priceMonth.ts";
import { bandOf } from "./quantiles.ts";
import { actualMonthlyCost } from "./trackRecord.ts";

/** Noise factors tried by default. */
export const CALIBRATION_GRID: readonly number[] = [0.5, 0.75, 1, 1.25, 1.5, 1.75, 2, 2.5, 3, 4, 5];
export const TARGET_COVERAGE = 0.8;

export interface CalibrationResult {
  factor: number;
  /** Pooled share of compared months inside P10–P90 for each factor tried. */
  coverageByFactor: { factor: number; coverage: number; months: number }[];
  note: string;
}

/**
 * Chooses the noise factor (see the module comment).
 * @param inputs backtest inputs (trackRecord.backtestInputs), as of one year before `asOf`
 * @param billsByMeter every bill of each meter (actuals are taken up to `asOf`)
 * @example calibrateNoise(backtestInputs(p, { asOf }), billsByMeter, "2025-12-31").factor
 */
export function calibrateNoise(
  inputs: readonly MeterForecastInput[], billsByMeter: ReadonlyMap<string, readonly Bill[]>, asOf: string, grid: readonly number[] = CALIBRATION_GRID,
): CalibrationResult {
  const results = grid.map((factor) => {
    let inside = 0;
    let months = 0;
    for (const input of inputs) {
      const r = meterCoverage(input, billsByMeter.get(input.meter.meterId) ?? [], asOf, factor);
      inside += r.inside;
      months += r.months;
    }
    return { factor, coverage: months > 0 ? inside / months : NaN, months };
  });
  const scored = results.filter((r) => Number.isFinite(r.coverage));
  if (scored.length === 0) return { factor: 1, coverageByFactor: results, note: "no month could be compared: noise left as the model states it (factor 1)" };
  const best = scored.reduce((a, b) => (Math.abs(b.coverage - TARGET_COVERAGE) < Math.abs(a.coverage - TARGET_COVERAGE) - 1e-12 ? b : a));
  return {
    factor: best.factor,
    coverageByFactor: results,
    note: `factor ${best.factor} puts ${(best.coverage * 100).toFixed(1)} % of ${best.months} backtest months inside P10–P90 (one backtest year: a coarse calibration)`,
  };
}

/** Months inside the priced usage-P10…P90 band for one meter at one factor. */
function meterCoverage(input: MeterForecastInput, bills: readonly Bill[], asOf: string, factor: number): { inside: number; months: number } {
  if (!input.tariff || input.tariff.versions.length === 0) return { inside: 0, months: 0 };
  const months = monthsAfter(input.asOf, input.months);
  const usage = meterUsageScenarios(input, months, Math.max(1, Math.floor(input.scenarios ?? DEFAULT_SCENARIOS)), factor);
  if (!usage) return { inside: 0, months: 0 };
  const contexts = meterPricingContexts(input, input.tariff, months);
  const actual = actualMonthlyCost(bills, asOf);
  const pathCost = (p: "p10" | "p90"): number[] => {
    const previous = [...(input.previousBillingDemandsKw ?? [])];
    return months.map((_, k) => {
      const u = bandOf(usage.usage.map((row) => row[k]!))[p];
      const priced = priceForecastMonth(contexts[k]!, u, previous);
      if (priced.billingDemandKw !== null) previous.push(priced.billingDemandKw);
      return priced.cost;
    });
  };
  let lo: number[];
  let hi: number[];
  try {
    lo = pathCost("p10");
    hi = pathCost("p90");
  } catch {
    return { inside: 0, months: 0 };
  }
  let inside = 0;
  let count = 0;
  months.forEach((m, k) => {
    const a = actual.get(m.month);
    if (!a || !a.complete) return;
    count++;
    if (a.cost >= lo[k]! && a.cost <= hi[k]!) inside++;
  });
  return { inside, months: count };
}
