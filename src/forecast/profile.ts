/**
 * Load shapes for pricing forecast months.
 *
 * Interval meters: the shape of a forecast month is the meter's own data from a whole number of
 * 52-week steps (364 days) earlier — the most recent such copy that lies before the as-of cut
 * and covers at least 90 % of the month's intervals. Shifting by whole weeks keeps weekdays and
 * weekends in place (holidays and the days around a DST change can be off by an hour or a day).
 * Missing intervals in the copy take the copy's mean. The shape is normalised to sum 1 and then
 * scaled to each scenario's usage, so energy by time-of-use period and the demand peaks scale
 * with the usage.
 *
 * Bill-only meters: a share of use by hour of week (168 values, Monday 00:00 first), from any
 * interval meter of the same building, lets the tariff engine split time-of-use energy (the
 * engine marks those lines estimated).
 */
import type { IntervalSeries } from "../domain/types.ts";
import type { IntervalUsage } from "../tariff/index.ts";
import { localMidnightMs, hourOfWeek, type CalendarMonth } from "../core/time/index.ts";
import { lowerBound } from "../core/sorted.ts";

const WEEK52_MS = 364 * 86_400_000;
const MIN_COVERAGE = 0.9;

/** A month's normalised interval shape: `values` sum to 1. */
export interface MonthShape {
  startMs: Float64Array;
  values: Float64Array;
  intervalMinutes: number;
  /** How many 52-week steps back the copy came from. */
  weeksBack: number;
}

/**
 * The normalised shape of `month` from `series`, or null when no copy `minYearsBack`…`maxYearsBack`
 * 52-week steps back (before `untilMs`) covers 90 % of the month. minYearsBack = 0 takes the
 * month's own readings (for pricing a past month).
 * @example a March 2026 forecast takes the 15-minute readings of 2025-03-02 … 2025-04-01 (364 days earlier)
 */
export function monthShapeFromIntervals(
  series: IntervalSeries, zone: string, month: CalendarMonth, untilMs: number, maxYearsBack = 3, minYearsBack = 1,
): MonthShape | null {
  const stepMs = series.intervalMinutes * 60_000;
  const a = localMidnightMs(month.start, zone);
  const b = localMidnightMs(month.end, zone);
  const n = Math.round((b - a) / stepMs);
  if (n <= 0) return null;
  for (let j = minYearsBack; j <= maxYearsBack; j++) {
    const shift = j * WEEK52_MS;
    if (b - shift > untilMs) continue;
    const startMs = new Float64Array(n);
    const values = new Float64Array(n).fill(NaN);
    let found = 0;
    let sum = 0;
    let idx = lowerBound(series.startMs, a - shift);
    for (let k = 0; k < n; k++) {
      const t = a + k * stepMs;
      startMs[k] = t;
      const src = t - shift;
      while (idx < series.startMs.length && series.startMs[idx]! < src) idx++;
      if (idx < series.startMs.length && series.startMs[idx] === src) {
        const v = series.values[idx]!;
        if (Number.isFinite(v) && v >= 0) {
          values[k] = v;
          sum += v;
          found++;
        }
      }
    }
    if (found < MIN_COVERAGE * n || !(sum > 0)) continue;
    const fill = sum / found;
    const total = sum + fill * (n - found);
    for (let k = 0; k < n; k++) values[k] = (Number.isNaN(values[k]!) ? fill : values[k]!) / total;
    return { startMs, values, intervalMinutes: series.intervalMinutes, weeksBack: j * 52 };
  }
  return null;
}

/**
 * The shape scaled to `usage` (meter unit), ready for the tariff engine. With `into` (as long
 * as the shape) the values are written there instead of a new array: a forecast prices the
 * same month 300 times and the engine keeps nothing of the readings it is given.
 */
export function scaleShape(shape: MonthShape, usage: number, into?: Float64Array): IntervalUsage {
  const values = into ?? new Float64Array(shape.values.length);
  for (let k = 0; k < values.length; k++) values[k] = shape.values[k]! * usage;
  return { startMs: shape.startMs, values, intervalMinutes: shape.intervalMinutes };
}

/**
 * Share of use by local hour of week (168 values summing to 1, Monday 00:00 first) from the
 * readings before `untilMs`; null without data. Each hour-of-week value is the mean reading of
 * that hour (so a week that occurs more often does not weigh more), then normalised.
 * @example a meter using 2 kWh every weekday hour and 1 kWh at weekends → weekday hours 2/288 each
 */
export function loadShapeByHourOfWeek(series: IntervalSeries, zone: string, untilMs = Infinity): number[] | null {
  const sum = new Float64Array(168);
  const count = new Float64Array(168);
  // hourOfWeek goes through Luxon per call: compute it once per UTC hour and reuse it.
  let lastHour = NaN;
  let how = 0;
  for (let i = 0; i < series.startMs.length; i++) {
    const t = series.startMs[i]!;
    if (t >= untilMs) break;
    const v = series.values[i]!;
    if (!(Number.isFinite(v) && v >= 0)) continue;
    const hourStart = Math.floor(t / 3_600_000);
    if (hourStart !== lastHour) {
      lastHour = hourStart;
      how = hourOfWeek(t, zone);
    }
    sum[how] += v;
    count[how]++;
  }
  const means = Array.from(sum, (s, h) => (count[h]! > 0 ? s / count[h]! : NaN));
  const seen = means.filter(Number.isFinite);
  if (seen.length === 0) return null;
  const fill = seen.reduce((a, b) => a + b, 0) / seen.length;
  const filled = means.map((m) => (Number.isFinite(m) ? m : fill));
  const total = filled.reduce((a, b) => a + b, 0);
  return total > 0 ? filled.map((m) => m / total) : null;
}
