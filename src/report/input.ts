/**
 * What the pipeline hands the report stage. Everything here is already computed; the report
 * stage only selects, formats and arranges it into view models (src/report/siteModel.ts).
 *
 * The later blocks (findings, models, forecast) are optional and described by small
 * interfaces of our own, so the audit, model and forecast stages can plug in their results
 * without the report stage importing their internals. Each stage maps its result to these.
 */
import type { Portfolio } from "../domain/types.ts";
import type { InputIssue } from "../core/issues.ts";
import type { Dispute } from "../disputes/index.ts";
import type { PricedBill } from "../tariff/index.ts";
import type { ModelSummary } from "../model/index.ts";

/**
 * Outcome of re-pricing one bill. A bill has up to two recomputations, each on one basis only
 * (bases are never mixed inside one recomputation):
 *  - `computed`: on the BILLED quantities (usage and demand as printed; interval data, scaled to
 *    the billed usage, only splits time-of-use periods). Checks the arithmetic and the rates.
 *  - `metered`: on the METERED quantities (interval sum × multiplier and the meter's peak), when
 *    interval data covers the period. Checks the quantities.
 */

/** One calendar month of interval-meter data for one meter, multiplier applied, in the meter's bill unit. */
export interface MonthlyMetered {
  /** Calendar month in the building's zone, `YYYY-MM`. */
  month: string;
  /** Sum of the month's interval values (bill unit, multiplier applied). */
  total: number;
  /** Intervals present in the month. */
  intervals: number;
  /** Intervals a complete month would have (DST-aware). */
  expectedIntervals: number;
}

/** One audit finding, in the shape of `OUT/data/findings.json` (outputs.md), camel-cased. */
export interface ReportFinding {
  buildingId: string;
  meterId: string | null;
  billId: string | null;
  periodStart: string | null;
  periodEnd: string | null;
  /** Stable check code, e.g. `total-mismatch`. */
  check: string;
  severity: "error" | "warning" | "info";
  /** Money at stake in the portfolio currency; positive = bill looks too high; null = not money. */
  amountAtStake: number | null;
  message: string;
}

/** Fit statistics of the model chosen for one meter (ASHRAE Guideline 14 statistics). */
/** A fitted model's headline statistics (defined by the model stage). */
export type ReportModelSummary = ModelSummary;

/** One month of one meter's cost forecast (outputs.md `forecast.csv`), camel-cased. */
export interface ReportForecastMonth {
  buildingId: string;
  meterId: string;
  /** `YYYY-MM`. */
  month: string;
  usageP50: number;
  costP10: number;
  costP50: number;
  costP90: number;
}

/** One problem a data-cleaning detector found in a meter's interval data. */
export interface ReportDetection {
  /** Kind code of data-quality.csv: `zero-run`, `constant-run`, `spike`, `negative`, `reset`, `duplicate`, `missing`. */
  kind: string;
  /** First flagged interval start, UTC epoch ms. */
  startMs: number;
  /** End of the last flagged interval (exclusive), UTC epoch ms. */
  endMs: number;
  /** Number of intervals involved. */
  intervals: number;
  /** Action code of data-quality.csv: `excluded` | `interpolated` | `kept` | `corrected` (shown in plain words). */
  action: string;
  /** Plain-words evidence, e.g. "14 h of 0 kWh; the same hours of other weeks average 42 kWh". */
  detail: string;
}

/** The clock-offset check of one interval meter against its building's weather. */
export interface ReportAlignment {
  /** Offset (hours, −14…+14) with the best load–temperature relationship. */
  suggestedOffsetHours: number;
  /** Offset actually applied before modelling (0 when none). */
  appliedOffsetHours: number;
  /** Whether the evidence for the suggestion counts as strong. */
  strong: boolean;
  /** One plain sentence of evidence or of why nothing was applied. */
  note: string;
  /** Score per offset tried (partial R² of temperature, 0…1), any order. */
  scores: { offsetHours: number; score: number }[];
}

/** Data-cleaning results for one interval meter. */
export interface ReportMeterQuality {
  meterId: string;
  buildingId: string;
  intervalMinutes: number;
  detections: ReportDetection[];
  /** 1 = interval flagged (excluded from models); same length and order as `portfolio.intervals.get(meterId)`. */
  mask: Uint8Array;
  /** Null when alignment was not checked (e.g. no weather). */
  alignment: ReportAlignment | null;
}

/** A gap in a weather station's hourly temperatures and what was done about it. */
export interface ReportWeatherDetection {
  stationId: string;
  /** First missing hour, UTC epoch ms. */
  startMs: number;
  /** End of the gap (exclusive), UTC epoch ms. */
  endMs: number;
  hours: number;
  /** Action code as in data-quality.csv, e.g. `interpolated` (gap filled) or `kept` (left missing, reported). */
  action: string;
}

/** One bill as a point of a bill-level baseline (average period temperature vs use per day). */
export interface ReportBaselinePoint {
  billId: string;
  /** Mean outdoor temperature over the bill period, in `tempUnit`. */
  temp: number;
  /** Billed use per day, meter unit. */
  usePerDay: number;
  /** Reason the bill was left out of the fit (e.g. "estimated read"); absent = used. */
  excluded?: string;
}

/** Guideline 14 statistics of a fitted model. */
export interface ReportFitStats {
  /** CV(RMSE) in percent, n − p degrees of freedom. */
  cvRmsePct: number;
  /** NMBE in percent, n − p degrees of freedom. */
  nmbePct: number;
  r2: number;
  /** Observations fitted. */
  n: number;
  /** Model parameters. */
  p: number;
}

/** One candidate model the selection considered. */
export interface ReportModelTried {
  kind: string;
  accepted: boolean;
  /** Plain reasons for rejection or selection, e.g. ["heating slope positive"]. */
  reasons: string[];
  cvRmsePct: number | null;
  nmbePct: number | null;
  r2: number | null;
}

/** Model expectations for one bill (meter unit, whole bill period). */
export interface ReportBillExpectation {
  billId: string;
  /** Model use for the period at the period's actual mean temperature. */
  expectedAtActualWeather: number;
  /** Model use for the same days at typical-year temperatures. */
  expectedAtTypicalWeather: number;
  /** Lower edge of the prediction band around `expectedAtActualWeather` (same unit and period), when the model gives one. */
  bandLow?: number;
  /** Upper edge of that band. */
  bandHigh?: number;
}

/** The bill-level weather baseline of one meter. */
export interface ReportBaseline {
  meterId: string;
  /** Chosen form: `1P`, `2P`, `3PH`, `3PC`, `4P`, `5P`, … or `none` when no model was accepted. */
  kind: string;
  tempUnit: "C" | "F";
  /** Meter usage unit (use per day is in this unit). */
  unit: string;
  points: ReportBaselinePoint[];
  /** The fitted line sampled across the temperature range, ascending temperature. */
  curve: { temp: number; usePerDay: number }[];
  stats: ReportFitStats | null;
  /** Whether CV(RMSE) ≤ 15 % and |NMBE| ≤ 5 % (monthly data, Guideline 14). */
  meetsGuideline14: boolean;
  /** Weather-normalized annual use, meter unit; null without a model or typical weather. */
  normalizedAnnual: number | null;
  typicalSource: "normals" | "history" | null;
  tried: ReportModelTried[];
  perBill: ReportBillExpectation[];
}

/** Backtest accuracy of the forecast for one meter. */
export interface ReportTrackRecord {
  meterId: string;
  /** Error of the annual cost forecast, percent of actual (signed, + = forecast high). */
  annualCostErrorPct: number;
  /** CV(RMSE) of the monthly cost forecast, percent. */
  monthlyCvRmsePct: number;
  /** Share of actual months inside the P10–P90 band, 0…1. */
  coverage: number;
  /** Annual cost error of the naive "same month last year" forecast, percent. */
  naiveAnnualCostErrorPct: number;
}

/** A cost range for the next forecast period (portfolio currency). */
export interface ReportCostRange {
  p10: number;
  p50: number;
  p90: number;
}

/** Why next year's cost differs from last year's over the same calendar months (currency; weather + rates + usageTrend = change). */
export interface ReportForecastDrivers {
  /** Last year's months compared, `YYYY-MM` ascending. */
  months: string[];
  lastYearCost: number;
  forecastCost: number;
  change: number;
  /** Typical weather priced next year minus last year's weather priced next year. */
  weather: number;
  /** Next year's prices minus last year's, on last year's use. */
  rates: number;
  /** The remainder: changes in use, model bias, demand effects (never a billing error). */
  usageTrend: number;
  /** Last year as billed (`lastYearCost` is last year as it should have been, with the audit's corrections). */
  lastYearBilledCost?: number;
  /** Corrected − billed last year: the billing errors that will not recur. */
  billingErrors?: number;
}

/** How the forecast was made: the weather basis chosen by backtests, the band's calibration, the backtests by origin. */
export interface ReportForecastMethod {
  /** Plain words for the basis used, and why it was chosen. */
  basisLabel: string;
  basisReason: string;
  /** The calendar-month adjustment used, in words, and every adjustment scored at that basis. */
  adjustmentLabel?: string;
  adjustments?: { label: string; meanAbsAnnualErrorPct: number; cvRmsePct: number; chosen: boolean }[];
  /** Every basis scored: mean absolute meter annual cost error and monthly CV(RMSE) over the origins (percent). */
  bases: { label: string; meanAbsAnnualErrorPct: number; cvRmsePct: number; chosen: boolean }[];
  /** Each rolling origin (cut date), newest first. */
  origins: {
    cut: string;
    meters: number;
    historyMonths: { min: number; max: number };
    modelAnnualErrorPct: number | null;
    naiveAnnualErrorPct: number | null;
    modelCvRmsePct: number | null;
    naiveCvRmsePct: number | null;
    coverage: number | null;
    factor: number;
    calibrated: boolean;
  }[];
  /** Noise factor used for meters with a track record; calibrated false = every band is the model's own. */
  factor: number;
  calibrated: boolean;
  /** Out-of-sample share of backtest meter-months inside P10–P90, pooled over the origins. */
  coverage: number | null;
  /** Meters whose band is the model's own (under 24 months of bills), with their months. */
  uncalibratedMeters: { meterId: string; buildingId: string; months: number }[];
  /** Bills the audit corrected that the forecast uses as they should have been. */
  correctedBills: number;
}

/** Forecast accuracy over the backtest year (percent; coverage 0…1). */
export interface ReportAccuracy {
  months: number;
  annualErrorPct: number;
  cvRmsePct: number;
  /** Null for the naive forecast (no band). */
  coverage: number | null;
}

/** One building's forecast beyond the per-meter rows: proper monthly bands, budget by commodity, drivers, track record. */
export interface ReportBuildingForecast {
  buildingId: string;
  /**
   * Building cost band per forecast month (quantiles of scenario sums over the building's
   * meters), with last year's billed cost of the same calendar month (null when last year's
   * bills do not cover that month completely for every forecast meter).
   */
  monthly: (ReportCostRange & { month: string; lastYearMonth: string; lastYearCost: number | null })[];
  /** Months the budget totals cover (the first `totalMonths` forecast months, at most 12). */
  totalMonths: number;
  /** Per commodity: P50 per month (median of that commodity's scenario sums) and the total with its band. */
  byCommodity: { commodity: string; monthly: { month: string; p50: number }[]; total: ReportCostRange | null }[];
  drivers: ReportForecastDrivers | null;
  /** The building's backtest, model and naive "same month last year"; null when nothing could be compared. */
  trackRecord: { model: ReportAccuracy | null; naive: ReportAccuracy | null } | null;
}

export interface ReportInput {
  /** The validated portfolio from ingest (buildings, meters, bills, settings, ingest report). */
  portfolio: Portfolio;
  /** Re-pricing result per bill, keyed by `billId`. A bill missing here is shown as "not priced". */
  priced: ReadonlyMap<string, PricedBill>;
  /** Interval data summed by calendar month, keyed by `meterId`, months ascending. */
  monthlyMetered: Map<string, MonthlyMetered[]>;
  /** Every problem found while reading inputs (errors and warnings), for the data page. */
  issues: InputIssue[];
  /** Build date `YYYY-MM-DD`, injected by the caller (never read from the clock here). */
  buildDate: string;
  /** `built`: the date the site was built (SOURCE_DATE_EPOCH); `data` (default when absent: built): the portfolio's as-of date. */
  buildDateKind?: "built" | "data";
  /** Heat content of gas billed in ccf or m³, therm per ccf, keyed by `meterId` (from the meter's tariff; 1.037 when absent). */
  heatContentByMeter?: Map<string, number>;
  /** Rows rejected at ingest that could be attributed to a building, keyed by `buildingId`. */
  rejectedRowsByBuilding?: Map<string, number>;
  /** Audit findings, when the audit stage ran. */
  findings?: ReportFinding[];
  /**
   * Claims and back-billing risks built from the findings (src/disputes), largest claim first.
   * The bills table, the dispute list and disputes.csv all read their money from here.
   */
  disputes?: Dispute[];
  /** Chosen model per meter, when the model stage ran. */
  models?: ReportModelSummary[];
  /** Cost forecast by meter and month, when the forecast stage ran. */
  forecast?: ReportForecastMonth[];
  /** Data-cleaning results per interval meter, when the cleaning stage ran. */
  quality?: ReportMeterQuality[];
  /** Weather gaps per station and what was done about them. */
  weatherDetections?: ReportWeatherDetection[];
  /** Bill-level weather baseline per meter, when the model stage ran. */
  baselines?: ReportBaseline[];
  /** Forecast backtest per meter. */
  trackRecord?: ReportTrackRecord[];
  /** Forecast cost of the whole forecast horizon per building, with its range (proper percentiles of the sum). */
  forecastTotals?: (ReportCostRange & { buildingId: string })[];
  /** Forecast cost of the whole portfolio over the forecast horizon. */
  portfolioForecast?: ReportCostRange;
  /** Per-building forecast detail (monthly bands, budget by commodity, drivers), when the forecast stage ran. */
  buildingForecasts?: ReportBuildingForecast[];
  /** How the forecast was made (basis, calibration, backtests by origin), when the forecast stage ran. */
  forecastMethod?: ReportForecastMethod;
  /** Meters without a track record and why, e.g. "not enough history for a track record (14 months)". */
  trackRecordNotes?: { meterId: string; buildingId: string; note: string }[];
  /** Portfolio backtest (model and naive), when the forecast stage ran. */
  portfolioTrackRecord?: { model: ReportAccuracy | null; naive: ReportAccuracy | null };
}
