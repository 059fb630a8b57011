/**
 * Builds a station's hourly WeatherSeries on a regular UTC hour grid from hourly readings and
 * daily max/min, then fills short gaps. Pure (no I/O); local days from src/core/time.
 */
import type { WeatherGap } from "../domain/types.ts";
import { addDays, localDateOf, localMidnightMs, localPartsOf } from "../core/time/index.ts";
import type { WeatherSeries } from "../domain/types.ts";
import { interpolateGaps } from "./interpolateGaps.ts";

const HOUR_MS = 3600000;

/** `filled` codes of a WeatherSeries hour. */
export const FILL_MEASURED = 0;
export const FILL_INTERPOLATED = 1;
export const FILL_FROM_DAILY = 2;

export type { WeatherGap };

export interface HourlyReading {
  instantMs: number;
  tempC: number;
}

export interface DailyReading {
  /** Local calendar day `YYYY-MM-DD`. */
  date: string;
  tmaxC: number;
  tminC: number;
}


/**
 * Temperature at local clock hour `hourOfDay` (0–24) from a day's max and min, assuming the
 * minimum near 06:00 and the maximum near 15:00 local: a half cosine rising from Tmin (06:00)
 * to Tmax (15:00), and a half cosine falling from Tmax (15:00) to Tmin at 06:00 next morning,
 * the early hours (00:00–06:00) taking the same day's values. Continuous within the day;
 * the step at midnight between two different days is accepted (a stated simplification).
 * Example: Tmax 20, Tmin 10 → 06:00 = 10, 15:00 = 20, 10:30 = 15.
 */
export function hourFromDailyMaxMin(tmaxC: number, tminC: number, hourOfDay: number): number {
  const mid = (tmaxC + tminC) / 2;
  const amp = (tmaxC - tminC) / 2;
  if (hourOfDay >= 6 && hourOfDay <= 15) return mid - amp * Math.cos((Math.PI * (hourOfDay - 6)) / 9);
  const h = hourOfDay < 6 ? hourOfDay + 24 : hourOfDay;
  return mid + amp * Math.cos((Math.PI * (h - 15)) / 15);
}

/**
 * Combines readings into one series. Hourly readings are snapped to the nearest whole UTC
 * hour (several in one hour are averaged). Daily rows fill only local days (in `timezone`)
 * that have no hourly reading, via {@link hourFromDailyMaxMin}. Gaps of at most
 * `maxGapHours` hours are linearly interpolated; longer ones stay NaN. Returns null when
 * there is no data at all.
 */
export function buildWeatherSeries(
  stationId: string,
  hourly: readonly HourlyReading[],
  daily: readonly DailyReading[],
  timezone: string,
  maxGapHours: number,
): { series: WeatherSeries; gaps: WeatherGap[] } | null {
  const sums = new Map<number, { sum: number; n: number }>();
  const hourlyDays = new Set<string>();
  for (const r of hourly) {
    const h = Math.round(r.instantMs / HOUR_MS);
    const acc = sums.get(h);
    if (acc) {
      acc.sum += r.tempC;
      acc.n++;
    } else sums.set(h, { sum: r.tempC, n: 1 });
  }
  for (const h of sums.keys()) {
    hourlyDays.add(localDateOf(h * HOUR_MS, timezone));
  }
  const fromDaily = new Map<number, number>();
  for (const d of daily) {
    if (hourlyDays.has(d.date)) continue;
    const next = localMidnightMs(addDays(d.date, 1), timezone);
    for (let t = localMidnightMs(d.date, timezone); t < next; t += HOUR_MS) {
      const h = Math.round(t / HOUR_MS);
      const local = localPartsOf(t, timezone);
      if (!sums.has(h)) fromDaily.set(h, hourFromDailyMaxMin(d.tmaxC, d.tminC, local.hour + local.minute / 60));
    }
  }
  const keys = [...sums.keys(), ...fromDaily.keys()];
  if (keys.length === 0) return null;
  let first = Infinity;
  let last = -Infinity;
  for (const k of keys) {
    if (k < first) first = k;
    if (k > last) last = k;
  }
  const n = last - first + 1;
  const raw = new Float64Array(n).fill(Number.NaN);
  const filled = new Uint8Array(n);
  for (const [h, acc] of sums) raw[h - first] = acc.sum / acc.n;
  for (const [h, v] of fromDaily) {
    raw[h - first] = v;
    filled[h - first] = FILL_FROM_DAILY;
  }
  const interp = interpolateGaps(raw, maxGapHours);
  for (let k = 0; k < n; k++) if (interp.filled[k] === 1) filled[k] = FILL_INTERPOLATED;
  const startMs = first * HOUR_MS;
  const gaps: WeatherGap[] = interp.gaps.map((g) => ({
    stationId,
    startMs: startMs + g.start * HOUR_MS,
    endMs: startMs + (g.start + g.length) * HOUR_MS,
    hours: g.length,
    action: g.action,
  }));
  return { series: { stationId, startMs, tempC: interp.values, filled }, gaps };
}
