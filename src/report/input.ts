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
import type { ComputedBill } from "../tariff/types.ts";

/** Outcome of re-pricing one bill: a computed bill, or the reason it could not be priced. */
export interface PricedBill {
  computed: ComputedBill | null;
  /** Plain-words reason when `computed` is null (e.g. "tariff T9 not found"). */
  error: string | null;
}

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
export interface ReportModelSummary {
  meterId: string;
  /** Model kind, e.g. `3PH`, `5P`, `TOWT`. */
  kind: string;
  /** CV(RMSE) in percent. */
  cvRmsePct: number | null;
  /** NMBE in percent. */
  nmbePct: number | null;
  r2: number | null;
  /** Number of observations the model was fitted on. */
  n: number;
}

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

export interface ReportInput {
  /** The validated portfolio from ingest (buildings, meters, bills, settings, ingest report). */
  portfolio: Portfolio;
  /** Re-pricing result per bill, keyed by `billId`. A bill missing here is shown as "not priced". */
  priced: Map<string, PricedBill>;
  /** Interval data summed by calendar month, keyed by `meterId`, months ascending. */
  monthlyMetered: Map<string, MonthlyMetered[]>;
  /** Every problem found while reading inputs (errors and warnings), for the data page. */
  issues: InputIssue[];
  /** Build date `YYYY-MM-DD`, injected by the caller (never read from the clock here). */
  buildDate: string;
  /** Rows rejected at ingest that could be attributed to a building, keyed by `buildingId`. */
  rejectedRowsByBuilding?: Map<string, number>;
  /** Audit findings, when the audit stage ran. */
  findings?: ReportFinding[];
  /** Chosen model per meter, when the model stage ran. */
  models?: ReportModelSummary[];
  /** Cost forecast by meter and month, when the forecast stage ran. */
  forecast?: ReportForecastMonth[];
}
