/**
 * Hourly feature columns from a weather series and a time zone: local hour of week,
 * holiday flag, local day of year, temperature and three derived temperatures (Savitzky–Golay smooth and slope,
 * a lag, a trailing mean). Used for training tables and for predicting any future hours.
 */
import type { WeatherSeries } from "../../domain/types.ts";
import { savgolFilter } from "../../clean/index.ts";
import { ModelInputError } from "../errors.ts";
import type { HourlyFeatures } from "./types.ts";
import { civilDay, hourOfWeek, isUsFederalHoliday, localMs, type LocalDay } from "../../core/time/index.ts";

export const HOUR_MS = 3_600_000;
const DAY_MS = 86_400_000;

/** Options of the derived temperature features. */
export interface HourlyFeatureOptions {
  /** Savitzky–Golay window in hours (odd). Default 7: smooths sensor noise, keeps the daily swing. */
  savgolWindowHours?: number;
  /** Savitzky–Golay polynomial order. Default 2. */
  savgolOrder?: number;
  /** Lag of the lagged temperature, hours. Default 3 (a building's thermal mass delays its response). */
  lagHours?: number;
  /** Length of the trailing mean, hours. Default 24. */
  rollingHours?: number;
}

export const DEFAULT_FEATURE_OPTIONS: Required<HourlyFeatureOptions> = {
  savgolWindowHours: 7,
  savgolOrder: 2,
  lagHours: 3,
  rollingHours: 24,
};

/** Derived temperature columns over a whole weather grid (NaN where undefined). */
interface DerivedWeather {
  smooth: Float64Array;
  slope: Float64Array;
  lag: Float64Array;
  rolling: Float64Array;
}

const derivedCache = new WeakMap<WeatherSeries, Map<string, DerivedWeather>>();

/**
 * Derived columns over the weather grid. Savitzky–Golay outputs whose window touches a
 * missing hour are NaN (savgolFilter propagates NaN); the trailing mean needs at least half
 * of its window present, so a short gap does not blank a whole day.
 */
function derivedWeather(weather: WeatherSeries, o: Required<HourlyFeatureOptions>): DerivedWeather {
  const key = `${o.savgolWindowHours}/${o.savgolOrder}/${o.lagHours}/${o.rollingHours}`;
  let perSeries = derivedCache.get(weather);
  if (!perSeries) derivedCache.set(weather, (perSeries = new Map()));
  const hit = perSeries.get(key);
  if (hit) return hit;
  const t = weather.tempC;
  const n = t.length;
  const smooth = n >= o.savgolWindowHours ? savgolFilter(t, o.savgolWindowHours, o.savgolOrder) : nanArray(n);
  const slope = n >= o.savgolWindowHours ? savgolFilter(t, o.savgolWindowHours, o.savgolOrder, 1, 1) : nanArray(n);
  const lag = laggedColumn(t, o.lagHours);
  const rolling = trailingMean(t, o.rollingHours);
  const out = { smooth, slope, lag, rolling };
  perSeries.set(key, out);
  return out;
}

/** n NaNs. (Module-level functions rather than closures per call, so V8 keeps their optimized code.) */
function nanArray(n: number): Float64Array {
  return new Float64Array(n).fill(Number.NaN);
}

/** t lagged by `lagHours` (NaN for the first hours). */
function laggedColumn(t: ArrayLike<number>, lagHours: number): Float64Array {
  const n = t.length;
  const lag = nanArray(n);
  for (let i = lagHours; i < n; i++) lag[i] = t[i - lagHours]!;
  return lag;
}

/** Trailing mean of the finite values among the last `rollingHours`, where at least half are present. */
function trailingMean(t: ArrayLike<number>, rollingHours: number): Float64Array {
  const n = t.length;
  const rolling = nanArray(n);
  let sum = 0;
  let count = 0;
  for (let i = 0; i < n; i++) {
    if (Number.isFinite(t[i]!)) {
      sum += t[i]!;
      count++;
    }
    const drop = i - rollingHours;
    if (drop >= 0 && Number.isFinite(t[drop]!)) {
      sum -= t[drop]!;
      count--;
    }
    if (count * 2 >= rollingHours) rolling[i] = sum / count;
  }
  return rolling;
}

function checkOptions(options: HourlyFeatureOptions): Required<HourlyFeatureOptions> {
  const o = { ...DEFAULT_FEATURE_OPTIONS, ...options };
  if (!(Number.isInteger(o.savgolWindowHours) && o.savgolWindowHours >= 3 && o.savgolWindowHours % 2 === 1)) {
    throw new ModelInputError(`Savitzky–Golay window must be an odd number of hours ≥ 3, got ${o.savgolWindowHours}`);
  }
  if (!(Number.isInteger(o.savgolOrder) && o.savgolOrder >= 1 && o.savgolOrder < o.savgolWindowHours)) {
    throw new ModelInputError(`Savitzky–Golay order must be 1 … window − 1, got ${o.savgolOrder}`);
  }
  if (!(Number.isInteger(o.lagHours) && o.lagHours >= 1)) throw new ModelInputError(`lag must be a whole number of hours ≥ 1, got ${o.lagHours}`);
  if (!(Number.isInteger(o.rollingHours) && o.rollingHours >= 2)) throw new ModelInputError(`rolling window must be a whole number of hours ≥ 2, got ${o.rollingHours}`);
  return o;
}

/** Result of {@link hourlyFeaturesAt}: the feature table and how many derived values fell back. */
export interface FeatureTable {
  features: HourlyFeatures;
  /** Rows whose smoothed, slope, lagged or rolling temperature was undefined and fell back to tempC (slope to 0). */
  derivedFallbacks: number;
}

/**
 * Features for the given UTC hour starts (each a top of an hour). Temperature comes from
 * the weather grid (NaN when the hour is off the grid or missing); derived temperatures that
 * are undefined (near a gap or the grid's edges) fall back to the hour's own temperature
 * (slope to 0), and are counted, so one short gap does not drop the surrounding hours.
 * @throws ModelInputError on bad options or an unknown zone.
 * @example hourlyFeaturesAt(weather, "America/Chicago", [Date.UTC(2024, 0, 1, 6)]).features.hourOfWeek[0] // 0 (Mon 00:00 CST)
 */
export function hourlyFeaturesAt(
  weather: WeatherSeries,
  zone: string,
  hourStartMs: ArrayLike<number>,
  options: HourlyFeatureOptions = {},
): FeatureTable {
  const o = checkOptions(options);
  const d = derivedWeather(weather, o);
  const n = hourStartMs.length;
  const f: HourlyFeatures = {
    hourStartMs: Float64Array.from(hourStartMs),
    hourOfWeek: new Uint8Array(n),
    holiday: new Uint8Array(n),
    dayOfYear: new Uint16Array(n),
    month: new Uint8Array(n),
    tempC: new Float64Array(n),
    tempSmoothC: new Float64Array(n),
    tempSlopeCPerHour: new Float64Array(n),
    tempLagC: new Float64Array(n),
    tempRollingMeanC: new Float64Array(n),
  };
  // the calendar and the temperatures in two loops of their own (each optimized on its own)
  calendarColumns(f, hourStartMs, zone);
  const fallbacks = temperatureColumns(f, hourStartMs, weather.startMs, weather.tempC, d);
  return { features: f, derivedFallbacks: fallbacks };
}

/** Local hour of week, holiday flag, day of year and month of each hour start. */
function calendarColumns(f: HourlyFeatures, hourStartMs: ArrayLike<number>, zone: string): void {
  const n = hourStartMs.length;
  let lastDayNum = Number.NaN;
  let day: LocalDay | null = null;
  let lastHoliday = 0;
  for (let r = 0; r < n; r++) {
    const ms = hourStartMs[r]!;
    // The local clock once per hour, the calendar (and the holiday lookup) once per local day:
    // the numbers hourOfWeek and localPartsOf give, without their date string every hour.
    const local = localMsOrThrow(ms, zone);
    const dayNum = Math.floor(local / DAY_MS);
    if (dayNum !== lastDayNum || day === null) {
      lastDayNum = dayNum;
      day = civilDay(dayNum);
      lastHoliday = isUsFederalHoliday(day.date) ? 1 : 0;
    }
    f.hourOfWeek[r] = (day.isoWeekday - 1) * 24 + Math.floor(Math.floor((local - dayNum * DAY_MS) / 60_000) / 60);
    f.holiday[r] = lastHoliday;
    f.dayOfYear[r] = day.dayOfYear;
    f.month[r] = day.month;
  }
}

/** localMs, its errors as ModelInputError (a function of its own: no try/catch in the hot loop). */
function localMsOrThrow(ms: number, zone: string): number {
  try {
    if (!Number.isFinite(ms)) hourOfWeek(ms, zone); // throws its RangeError
    return localMs(ms, zone);
  } catch (e) {
    throw new ModelInputError((e as Error).message);
  }
}

/**
 * Temperature and derived temperatures of each hour start (see hourlyFeaturesAt); returns the
 * number of rows whose derived values fell back.
 */
function temperatureColumns(f: HourlyFeatures, hourStartMs: ArrayLike<number>, gridStartMs: number, tempC: ArrayLike<number>, d: DerivedWeather): number {
  const n = hourStartMs.length;
  let fallbacks = 0;
  for (let r = 0; r < n; r++) {
    const ms = hourStartMs[r]!;
    const i = Math.round((ms - gridStartMs) / HOUR_MS);
    const t = i >= 0 && i < tempC.length ? tempC[i]! : Number.NaN;
    f.tempC[r] = t;
    if (!Number.isFinite(t)) {
      f.tempSmoothC[r] = f.tempSlopeCPerHour[r] = f.tempLagC[r] = f.tempRollingMeanC[r] = Number.NaN;
      continue;
    }
    const s = d.smooth[i]!;
    const sl = d.slope[i]!;
    const lg = d.lag[i]!;
    const rm = d.rolling[i]!;
    const ok = Number.isFinite(s) && Number.isFinite(sl) && Number.isFinite(lg) && Number.isFinite(rm);
    if (!ok) fallbacks++;
    f.tempSmoothC[r] = Number.isFinite(s) ? s : t;
    f.tempSlopeCPerHour[r] = Number.isFinite(sl) ? sl : 0;
    f.tempLagC[r] = Number.isFinite(lg) ? lg : t;
    f.tempRollingMeanC[r] = Number.isFinite(rm) ? rm : t;
  }
  return fallbacks;
}

/**
 * Hour starts covering [startMs, endMs): the first top of an hour at or after startMs, then
 * every hour before endMs.
 * @example hourGrid(0, 3 * 3_600_000) // [0, 3600000, 7200000]
 */
export function hourGrid(startMs: number, endMs: number): Float64Array {
  if (!(Number.isFinite(startMs) && Number.isFinite(endMs))) throw new ModelInputError("hour range must be finite epoch times");
  const first = Math.ceil(startMs / HOUR_MS) * HOUR_MS;
  const n = Math.max(0, Math.ceil((endMs - first) / HOUR_MS));
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) out[i] = first + i * HOUR_MS;
  return out;
}

/**
 * Rows `indices` of a feature table (or of a frame's feature part), in the given order.
 * @example selectFeatureRows(f, [0, 2]).tempC.length // 2
 */
export function selectFeatureRows(f: HourlyFeatures, indices: ArrayLike<number>): HourlyFeatures {
  const out: HourlyFeatures = {
    hourStartMs: pickRows(f.hourStartMs, indices),
    hourOfWeek: pickRows(f.hourOfWeek, indices),
    holiday: pickRows(f.holiday, indices),
    dayOfYear: pickRows(f.dayOfYear, indices),
    month: pickRows(f.month, indices),
    tempC: pickRows(f.tempC, indices),
    tempSmoothC: pickRows(f.tempSmoothC, indices),
    tempSlopeCPerHour: pickRows(f.tempSlopeCPerHour, indices),
    tempLagC: pickRows(f.tempLagC, indices),
    tempRollingMeanC: pickRows(f.tempRollingMeanC, indices),
  };
  if (f.buildingIndex) out.buildingIndex = pickRows(f.buildingIndex, indices);
  return out;
}

/** Entries `indices` of a typed array, in a new array of the same type (module-level so V8 keeps its optimized code between calls). */
function pickRows<T extends Float64Array | Uint8Array | Uint16Array>(a: T, indices: ArrayLike<number>): T {
  const out = new (a.constructor as new (n: number) => T)(indices.length);
  for (let i = 0; i < indices.length; i++) out[i] = a[indices[i]!]!;
  return out;
}
