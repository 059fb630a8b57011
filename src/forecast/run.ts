/**
 * One call for the build: apply the audit's corrections to the bills, run the rolling-origin
 * backtests (weather basis, band calibration, track record), and forecast the next months with
 * the chosen basis and, for meters with a track record, the calibrated noise.
 */
import type { Portfolio } from "../domain/types.ts";
import type { Tariff } from "../tariff/index.ts";
import type { MeterBaseline } from "../model/index.ts";
import { correctBills, type CorrectedBillSet, type MoneyFindingLike } from "./correctedBills.ts";
import { rollingBacktest, MIN_TRACK_RECORD_MONTHS, type RollingBacktest } from "./backtest.ts";
import { forecastPortfolio, type PortfolioForecast } from "./forecastPortfolio.ts";
import { trackRecordFromBacktest, type TrackRecord } from "./trackRecord.ts";
import type { Memo } from "../core/memo.ts";
import type { AnalysedPricing } from "./portfolioInputs.ts";

export interface CalibrationResult {
  /** Noise factor of the forecast for meters with a track record (1 = the model's own band). */
  factor: number;
  /** False when no backtest could be scored: every band is the model's own. */
  calibrated: boolean;
  /** Pooled share of backtest meter-months inside P10–P90 for each factor tried (every origin). */
  coverageByFactor: { factor: number; coverage: number; months: number }[];
  note: string;
}

export interface ForecastBundle {
  forecast: PortfolioForecast;
  calibration: CalibrationResult;
  /** The latest origin (one year before as-of) per meter, with the out-of-sample band. */
  trackRecord: TrackRecord;
  /** Every rolling origin: basis scores, accuracy and coverage per origin. */
  backtest: RollingBacktest;
  /** Bills corrected by the audit and used as the base (count and amounts). */
  corrections: CorrectedBillSet["deltaByBill"];
}

/**
 * Backtests, calibration and forecast.
 * @param options.asOf last day of data; options.months the horizon (forecast_months);
 *   options.findings the audit's findings (their corrected bills become the base)
 * @example const { forecast, trackRecord } = forecastWithTrackRecord(portfolio, { asOf: "2025-12-31", months: 12 })
 */
export function forecastWithTrackRecord(
  portfolio: Portfolio<Tariff>,
  options: {
    asOf: string;
    months: number;
    scenarios?: number;
    seed?: number;
    baselines?: ReadonlyMap<string, Pick<MeterBaseline, "fit" | "typicalMonthlyTemp">>;
    findings?: readonly (MoneyFindingLike & { meterId: string })[];
    /** Keeps each meter's backtest paths and forecast between builds (see rollingBacktest, forecastPortfolio). */
    memo?: Memo;
    /** The analysis's pricing of `portfolio.bills` (analysedPricing), so the ratchet history is not priced again. */
    analysed?: AnalysedPricing;
  },
): ForecastBundle {
  const corrected = correctBills(portfolio.bills, options.findings ?? []);
  const base: Portfolio<Tariff> = { ...portfolio, bills: corrected.bills };
  const backtest = rollingBacktest(base, { asOf: options.asOf, scenarios: options.scenarios, seed: options.seed, memo: options.memo, analysed: options.analysed });
  const calibrationByMeter = new Map(
    portfolio.meters.map((m) => [m.meterId, backtest.calibrated && (backtest.monthsOfBills.get(m.meterId) ?? 0) >= MIN_TRACK_RECORD_MONTHS ? backtest.factor : 1]),
  );
  const forecast = forecastPortfolio(base, {
    asOf: options.asOf,
    months: options.months,
    scenarios: options.scenarios,
    seed: options.seed,
    baselines: options.baselines,
    basis: backtest.basis ?? undefined,
    adjustment: backtest.adjustment,
    calibration: backtest.factor,
    calibrationByMeter,
    billedBills: portfolio.bills,
    memo: options.memo,
    analysed: options.analysed,
  });
  const chosen = backtest.coverageByFactor.find((c) => c.factor === backtest.factor);
  const calibration: CalibrationResult = {
    factor: backtest.factor,
    calibrated: backtest.calibrated,
    coverageByFactor: backtest.coverageByFactor.map((c) => ({ factor: c.factor, coverage: c.coverage, months: c.meterMonths })),
    note: backtest.calibrated && chosen
      ? `noise factor ${backtest.factor} puts ${(chosen.coverage * 100).toFixed(1)} % of ${chosen.meterMonths} backtest meter-months (${backtest.origins.length} origin(s)) inside P10–P90`
      : "no backtest could be scored: every band is the model's own (uncalibrated)",
  };
  return { forecast, calibration, trackRecord: trackRecordFromBacktest(base, backtest, options.asOf), backtest, corrections: corrected.deltaByBill };
}
