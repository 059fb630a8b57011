/**
 * Month-segmented TOWT: one time-of-week-and-temperature model per calendar month, each fitted
 * by weighted least squares on its own month (weight 1) and the month before and after
 * (weight ½). This is the "three-month weighted" segmentation of the CalTRACK hourly methods
 * (CalTRACK Methods 2.0, hourly section; cited from memory): occupancy, hour-of-week levels and
 * temperature slopes may then differ by season, so a school's summer break or a shop's
 * December is learned from a year of history and the calendar alone.
 *
 * A month whose segment cannot be fitted (no or too few hours, as in a short history or a
 * cross-validation fold that holds the month out with its neighbours) uses a TOWT fitted on
 * all training hours instead, and the model says which months did.
 */
import { ModelInputError } from "../errors.ts";
import { fitTowt, fitTowtOnTable } from "./towt.ts";
import type { TowtData, TowtModel, TowtOptions } from "./towt.ts";
import { frameCutFrom } from "./hourlyFrame.ts";
import type { FittedHourlyModel, HourlyFeatures, HourlyFrame, HourlyModelSpec } from "./types.ts";

export interface TowtMonthlyOptions extends TowtOptions {
  /** Weight of the neighbouring months' hours. Default 0.5 (CalTRACK's three-month weighting). */
  neighbourWeight?: number;
  /**
   * A segment needs at least this weight of hours (own month 1 each, neighbours ½ each).
   * Default 2 weeks (336): a month missing from training (a held-out block) is still modelled
   * from its neighbours, as the year-ahead model models it from last year's same month.
   */
  minSegmentWeight?: number;
}

export interface TowtMonthlyModel extends FittedHourlyModel {
  readonly kind: "towt-monthly";
  /** Model of each month (index 0 = January); the all-hours fit where the segment could not be fitted. */
  byMonth: TowtModel[];
  /** Months (1 … 12) that fell back to the all-hours fit. */
  fallbackMonths: number[];
}

/**
 * Weight of a row of month `rowMonth` in the segment of month `segmentMonth` (both 1 … 12,
 * December and January are neighbours): 1, `neighbour`, or 0.
 * @example segmentWeight(12, 1, 0.5) // 0.5
 */
export function segmentWeight(segmentMonth: number, rowMonth: number, neighbour: number): number {
  const d = (rowMonth - segmentMonth + 12) % 12;
  if (d === 0) return 1;
  return d === 1 || d === 11 ? neighbour : 0;
}

/**
 * Fit the month-segmented TOWT.
 * p (for the Guideline 14 statistics) is the largest coefficient count of the models used: each
 * hour's prediction comes from one month's TOWT. (The sum over all twelve, ~2,000, would leave
 * a four-week validation block with n ≤ p; the page states the convention, as for trees.)
 * @param kept segment fits of earlier tables fitted with the same options: a table cut from one
 *   of them (frameCutFrom) reuses its segment fits where its months lost no row; this table's
 *   are added. The same numbers as without it.
 * @throws ModelInputError when not even the all-hours TOWT can be fitted.
 * @example fitTowtMonthly(frame).predict(frame)
 */
export function fitTowtMonthly(train: HourlyFrame, options: TowtMonthlyOptions = {}, kept?: TowtMonthlySegmentFits): TowtMonthlyModel {
  const { neighbourWeight = 0.5, minSegmentWeight = 336, ...towtOptions } = options;
  if (!(neighbourWeight > 0 && neighbourWeight <= 1)) throw new ModelInputError(`neighbour weight must be in (0, 1], got ${neighbourWeight}`);
  // the TOWT candidate's fit on the same table, when it has been fitted already
  const overall = fitTowtOnTable(train, towtOptions);
  // the columns read once (tables come in several object shapes)
  const { month, hourOfWeek, holiday, tempC, kwh } = train;
  const n = kwh.length;
  // the loops over rows are functions of their own, each optimized by V8 with complete feedback
  const monthHours = hoursPerMonth(month, n);
  // A fold's table lost one block of its frame's rows: a segment whose months lost none is the
  // frame's segment row for row, and its fit (or failure) is the frame's.
  const parent = kept ? frameCutFrom(train) : undefined;
  const parentSegments = parent ? kept!.get(parent) : undefined;
  const segments: SegmentFits = { monthHours, fits: new Array<TowtModel | null>(13).fill(null) };
  const byMonth: TowtModel[] = [];
  const fallbackMonths: number[] = [];
  let parameterCount = 0;
  for (let m = 1; m <= 12; m++) {
    let model: TowtModel | null = null;
    const weight = segmentTotalWeight(m, neighbourWeight, monthHours);
    if (parentSegments && sameSegment(m, neighbourWeight, monthHours, parentSegments.monthHours)) {
      model = parentSegments.fits[m]!;
    } else if (weight >= minSegmentWeight) {
      const seg = segmentRows(m, neighbourWeight, month, hourOfWeek, holiday, tempC, kwh);
      try {
        model = fitTowt(seg, towtOptions);
      } catch (e) {
        if (!(e instanceof ModelInputError)) throw e;
      }
    }
    segments.fits[m] = model;
    if (!model) fallbackMonths.push(m);
    byMonth.push(model ?? overall);
    parameterCount = Math.max(parameterCount, (model ?? overall).parameterCount);
  }
  kept?.set(train, segments);
  return { kind: "towt-monthly", parameterCount, byMonth, fallbackMonths, predict: (f) => predictByMonth(byMonth, f) };
}

/** Rows per month (index 1 … 12) of rows 0 … n − 1. */
function hoursPerMonth(month: ArrayLike<number>, n: number): Int32Array {
  const monthHours = new Int32Array(13);
  for (let i = 0; i < n; i++) monthHours[month[i]!]!++;
  return monthHours;
}

/** Total weight of month m's segment, from the hours per month. */
function segmentTotalWeight(m: number, neighbourWeight: number, monthHours: Int32Array): number {
  let weight = 0;
  for (let k = 1; k <= 12; k++) weight += segmentWeight(m, k, neighbourWeight) * monthHours[k]!;
  return weight;
}

/** The rows of month m's segment (own month and neighbours), in row order, with their weights. */
function segmentRows(
  m: number,
  neighbourWeight: number,
  month: ArrayLike<number>,
  hourOfWeek: ArrayLike<number>,
  holiday: ArrayLike<number>,
  tempC: ArrayLike<number>,
  kwh: ArrayLike<number>,
): TowtData {
  const n = kwh.length;
  let size = 0;
  for (let i = 0; i < n; i++) if (segmentWeight(m, month[i]!, neighbourWeight) > 0) size++;
  const seg = { hourOfWeek: new Uint8Array(size), holiday: new Uint8Array(size), tempC: new Float64Array(size), kwh: new Float64Array(size), weights: new Float64Array(size) };
  for (let i = 0, r = 0; i < n; i++) {
    const wi = segmentWeight(m, month[i]!, neighbourWeight);
    if (wi > 0) {
      seg.hourOfWeek[r] = hourOfWeek[i]!;
      seg.holiday[r] = holiday[i]!;
      seg.tempC[r] = tempC[i]!;
      seg.kwh[r] = kwh[i]!;
      seg.weights[r++] = wi;
    }
  }
  return seg;
}

/**
 * Predictions of the month-segmented model: each month's model on that month's rows only.
 * Module-level (not a closure per fit) so V8 keeps its optimized code between fits.
 */
function predictByMonth(byMonth: readonly TowtModel[], f: HourlyFeatures): Float64Array {
  const n = f.tempC.length;
  const out = new Float64Array(n);
  // Predict with each month's model only on that month's rows (grouped by month, in row order).
  // (the grouping is a function of its own, so V8 optimizes it and this loop separately)
  const start = new Int32Array(14);
  const rows = rowsByMonth(f.month, n, start);
  for (let k = 1; k <= 12; k++) if (start[k + 1]! > start[k]!) byMonth[k - 1]!.predictRows(f, rows.subarray(start[k]!, start[k + 1]!), out);
  return out;
}

/** Rows 0 … n − 1 grouped by month, in row order; month k's are rows[start[k] … start[k + 1]). */
function rowsByMonth(month: ArrayLike<number>, n: number, start: Int32Array): Int32Array {
  for (let i = 0; i < n; i++) {
    const m = month[i]!;
    if (!(m >= 1 && m <= 12)) throw new ModelInputError(`month must be 1 … 12, got ${m} at row ${i}`);
    start[m + 1]!++;
  }
  for (let k = 1; k <= 13; k++) start[k]! += start[k - 1]!;
  const rows = new Int32Array(n);
  const next = start.slice(0, 13);
  for (let i = 0; i < n; i++) rows[next[month[i]!]!++] = i;
  return rows;
}

/** A table's segment fits: its hours per month (index 1 … 12) and each month's fit, null where it fell back. */
interface SegmentFits {
  monthHours: Int32Array;
  fits: (TowtModel | null)[];
}

/**
 * The segment fits of each table fitted with one set of options, for the tables cut from it
 * (a frame's cross-validation folds) to reuse: one per model spec, so it lives as long as the
 * spec and holds no table beyond its own life.
 */
export type TowtMonthlySegmentFits = WeakMap<HourlyFrame, SegmentFits>;

/**
 * Whether month m's segment of a table cut from a frame (its rows some of the frame's, in the
 * same order) holds every row of the frame's segment: then they are the same rows, weights
 * and order, and so the same fit.
 */
function sameSegment(m: number, neighbourWeight: number, hours: Int32Array, frameHours: Int32Array): boolean {
  for (let k = 1; k <= 12; k++) if (segmentWeight(m, k, neighbourWeight) > 0 && hours[k] !== frameHours[k]) return false;
  return true;
}

/**
 * Month-segmented TOWT as a model spec.
 * @example towtMonthlySpec().kind // "towt-monthly"
 */
export function towtMonthlySpec(options: TowtMonthlyOptions = {}): HourlyModelSpec {
  const kept: TowtMonthlySegmentFits = new WeakMap();
  return { kind: "towt-monthly", fit: (train) => fitTowtMonthly(train, options, kept) };
}
