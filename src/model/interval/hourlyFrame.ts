/**
 * Hourly training table of one meter: interval data summed to UTC hours, hours with any
 * masked, non-finite or missing interval left out (and counted by reason), joined to the
 * hourly temperature and the features of hourlyFeatures.ts.
 */
import type { IntervalSeries, WeatherSeries } from "../../domain/types.ts";
import { ModelInputError } from "../errors.ts";
import { HOUR_MS, hourlyFeaturesAt, selectFeatureRows } from "./hourlyFeatures.ts";
import type { HourlyFeatureOptions } from "./hourlyFeatures.ts";
import type { HourlyAccounting, HourlyFeatures, HourlyFrame } from "./types.ts";

export interface HourlyFrameOptions extends HourlyFeatureOptions {
  /** Meter multiplier applied to every value (default 1): energy = value × multiplier. */
  multiplier?: number;
}

/**
 * Build the hourly training table. An hour is used only when it holds every one of its
 * 60 / intervalMinutes intervals, none masked, all finite, and it has a temperature.
 * Each excluded hour is counted under the first reason that applies, in the order
 * masked → nonFinite → incomplete → noWeather, so hoursUsed + Σ excluded = hoursSpanned.
 * @param mask same length as series.values; 1 = interval excluded from training (cleaning).
 * @throws ModelInputError when the interval length does not divide an hour, the mask
 *   length differs, the multiplier is not positive, or the zone is unknown.
 * @example hourlyFrame(series15min, mask, weather, "America/Chicago").accounting.hoursUsed
 */
export function hourlyFrame(
  series: IntervalSeries,
  mask: Uint8Array | null,
  weather: WeatherSeries,
  zone: string,
  options: HourlyFrameOptions = {},
): HourlyFrame {
  const minutes = series.intervalMinutes;
  if (!(Number.isInteger(minutes) && minutes > 0 && 60 % minutes === 0)) {
    throw new ModelInputError(`meter ${series.meterId}: interval models need intervals that divide an hour (1–60 min), got ${minutes} min`);
  }
  const multiplier = options.multiplier ?? 1;
  if (!(multiplier > 0 && Number.isFinite(multiplier))) throw new ModelInputError(`multiplier must be positive, got ${multiplier}`);
  const n = series.values.length;
  if (mask && mask.length !== n) throw new ModelInputError(`mask has ${mask.length} entries but the series has ${n} intervals`);
  const perHour = 60 / minutes;
  const accounting: HourlyAccounting = {
    intervalsRead: n,
    intervalsUsed: 0,
    hoursSpanned: 0,
    hoursUsed: 0,
    excluded: { masked: 0, nonFinite: 0, incomplete: 0, noWeather: 0 },
    derivedFeatureFallbacks: 0,
  };
  if (n === 0) return frameOf(emptyFeatures(), new Float64Array(0), accounting);
  const firstHour = Math.floor(series.startMs[0]! / HOUR_MS) * HOUR_MS;
  const lastHour = Math.floor(series.startMs[n - 1]! / HOUR_MS) * HOUR_MS;
  const hours = Math.round((lastHour - firstHour) / HOUR_MS) + 1;
  accounting.hoursSpanned = hours;
  const sum = new Float64Array(hours);
  const count = new Uint16Array(hours);
  const masked = new Uint8Array(hours);
  const bad = new Uint8Array(hours);
  // each long loop is a small function of its own, so V8 optimizes each with complete feedback
  // instead of optimizing hourlyFrame inside its first loop and discarding it at the next
  sumIntoHours(series.startMs, series.values, mask, multiplier, firstHour, sum, count, masked, bad);
  const candidates = candidateHours(accounting.excluded, count, masked, bad, perHour, firstHour);
  const table = hourlyFeaturesAt(weather, zone, candidates, options);
  const keep = rowsWithTemperature(table.features.tempC, candidates.length);
  accounting.excluded.noWeather += candidates.length - keep.length;
  const features = selectFeatureRows(table.features, keep);
  const kwh = new Float64Array(keep.length);
  accounting.intervalsUsed += targetOfRows(features.hourStartMs, firstHour, sum, count, kwh);
  accounting.hoursUsed = keep.length;
  // hourlyFeaturesAt counts fallbacks only on hours with a temperature, i.e. exactly the kept ones.
  accounting.derivedFeatureFallbacks = table.derivedFallbacks;
  return frameOf(features, kwh, accounting);
}

/** Interval values summed into their UTC hours (with counts and masked / non-finite flags per hour). */
function sumIntoHours(
  startMs: ArrayLike<number>,
  values: ArrayLike<number>,
  mask: Uint8Array | null,
  multiplier: number,
  firstHour: number,
  sum: Float64Array,
  count: Uint16Array,
  masked: Uint8Array,
  bad: Uint8Array,
): void {
  const n = values.length;
  for (let i = 0; i < n; i++) {
    const h = Math.floor((startMs[i]! - firstHour) / HOUR_MS);
    const v = values[i]!;
    count[h]!++;
    if (mask && mask[i]) masked[h] = 1;
    else if (!Number.isFinite(v)) bad[h] = 1;
    else sum[h]! += v * multiplier;
  }
}

/** Start of each complete, unmasked, finite hour; the others counted in `excluded` by reason. */
function candidateHours(
  excluded: HourlyAccounting["excluded"],
  count: Uint16Array,
  masked: Uint8Array,
  bad: Uint8Array,
  perHour: number,
  firstHour: number,
): number[] {
  const candidates: number[] = [];
  for (let h = 0; h < count.length; h++) {
    if (masked[h]) excluded.masked++;
    else if (bad[h]) excluded.nonFinite++;
    else if (count[h]! < perHour) excluded.incomplete++;
    else candidates.push(firstHour + h * HOUR_MS);
  }
  return candidates;
}

/** Rows 0 … n − 1 whose temperature is finite. */
function rowsWithTemperature(tempC: Float64Array, n: number): number[] {
  const keep: number[] = [];
  for (let r = 0; r < n; r++) if (Number.isFinite(tempC[r]!)) keep.push(r);
  return keep;
}

/** Each kept hour's summed energy written into kwh; returns the number of intervals in those hours. */
function targetOfRows(hourStartMs: Float64Array, firstHour: number, sum: Float64Array, count: Uint16Array, kwh: Float64Array): number {
  let used = 0;
  for (let r = 0; r < kwh.length; r++) {
    const h = Math.round((hourStartMs[r]! - firstHour) / HOUR_MS);
    kwh[r] = sum[h]!;
    used += count[h]!;
  }
  return used;
}

/**
 * A frame from its feature columns, target and accounting, written out field by field in one
 * order: every frame then has the same object shape (an object spread can give each table a
 * shape of its own, and V8 discards the optimized code of the functions reading frames at each).
 */
function frameOf(f: HourlyFeatures, kwh: Float64Array, accounting: HourlyAccounting): HourlyFrame {
  const frame: HourlyFrame = {
    hourStartMs: f.hourStartMs,
    hourOfWeek: f.hourOfWeek,
    holiday: f.holiday,
    dayOfYear: f.dayOfYear,
    month: f.month,
    tempC: f.tempC,
    tempSmoothC: f.tempSmoothC,
    tempSlopeCPerHour: f.tempSlopeCPerHour,
    tempLagC: f.tempLagC,
    tempRollingMeanC: f.tempRollingMeanC,
    kwh,
    accounting,
  };
  if (f.buildingIndex) frame.buildingIndex = f.buildingIndex;
  return frame;
}

function emptyFeatures(): HourlyFeatures {
  return {
    hourStartMs: new Float64Array(0),
    hourOfWeek: new Uint8Array(0),
    holiday: new Uint8Array(0),
    tempC: new Float64Array(0),
    tempSmoothC: new Float64Array(0),
    tempSlopeCPerHour: new Float64Array(0),
    tempLagC: new Float64Array(0),
    tempRollingMeanC: new Float64Array(0),
    dayOfYear: new Uint16Array(0),
    month: new Uint8Array(0),
  };
}

/** The frame each table made by selectFrameRows with ascending rows was cut from. */
const cutFrom = new WeakMap<HourlyFrame, HourlyFrame>();

/**
 * Rows `indices` of a frame (features and target); accounting is carried over unchanged.
 * @example selectFrameRows(frame, [0, 1, 2]).kwh.length // 3
 */
export function selectFrameRows(frame: HourlyFrame, indices: ArrayLike<number>): HourlyFrame {
  const kwh = new Float64Array(indices.length);
  let ascending = true;
  for (let i = 0; i < indices.length; i++) {
    kwh[i] = frame.kwh[indices[i]!]!;
    if (i > 0 && !(indices[i]! > indices[i - 1]!)) ascending = false;
  }
  const out = frameOf(selectFeatureRows(frame, indices), kwh, frame.accounting);
  if (ascending) cutFrom.set(out, frame);
  return out;
}

/**
 * The frame a table was cut from by {@link selectFrameRows} with strictly ascending rows (a
 * cross-validation fold's training table), or undefined. Its rows are then some of that
 * frame's rows in the same order: a model whose fit depends on a subset of rows (one calendar
 * month's) may reuse the frame's fit when that subset lost no row.
 * @example frameCutFrom(selectFrameRows(frame, [0, 1])) === frame // true
 */
export function frameCutFrom(table: HourlyFrame): HourlyFrame | undefined {
  return cutFrom.get(table);
}
