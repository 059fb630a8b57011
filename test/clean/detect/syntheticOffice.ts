/**
 * Invented test data: an office-like 15-minute load and hourly temperature, seeded so every
 * run is the same. Building in America/New_York (schedule on the local clock, DST-aware via
 * luxon), by default 8 weeks from Monday 2025-06-02 (EDT, UTC−4, no DST change inside). Occupied 07:00–19:00 local on weekdays; nights low (~2 kWh per
 * interval, small noise); weekends low (~5); cooling load proportional to degrees above 18 °C,
 * full when occupied and 20 % otherwise. Temperature = diurnal cycle (peak 15:00 local) + a
 * day-to-day anomaly (AR(1) over days) + an hourly AR(1) wiggle.
 */
import { DateTime } from "luxon";
import type { IntervalSeries, WeatherSeries } from "../../../src/domain/types.ts";

export const HOUR_MS = 3_600_000;
export const DAY_MS = 86_400_000;
/** Local midnight Monday 2025-06-02 in America/New_York (UTC−4 in June). */
export const START_MS = Date.UTC(2025, 5, 2, 4);
export const ZONE = "America/New_York";
export const LOCAL_OFFSET_HOURS = -4;

/** mulberry32: a tiny seeded PRNG (public-domain algorithm), uniform in [0, 1). */
export function rng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Standard normal draws from a uniform source (Box–Muller). */
export function gauss(u: () => number): () => number {
  return () => Math.sqrt(-2 * Math.log(1 - u())) * Math.cos(2 * Math.PI * u());
}

export interface OfficeOptions {
  weeks?: number;
  seed?: number;
  intervalMinutes?: number;
  /** Nights and weekends read exactly 0 (a building that is switched off). */
  offWhenClosed?: boolean;
  startMs?: number;
  /** Cooling load per °C above 18 °C when occupied (kWh per 15 min). Default 3; 0 = no weather response. */
  coolingPerDegree?: number;
}

export interface Office {
  series: IntervalSeries;
  weather: WeatherSeries;
}

/** Builds the load and its weather (weather starts 2 days early and ends 2 days late). */
export function makeOffice(opts: OfficeOptions = {}): Office {
  const weeks = opts.weeks ?? 8;
  const seed = opts.seed ?? 42;
  const intervalMinutes = opts.intervalMinutes ?? 15;
  const start = opts.startMs ?? START_MS;
  const u = rng(seed);
  const g = gauss(u);

  // Weather: hourly, from start − 2 days to end + 2 days.
  const wStart = start - 2 * DAY_MS;
  const wHours = (weeks * 7 + 4) * 24;
  const tempC = new Float64Array(wHours);
  let dayAnom = 0;
  let hourAnom = 0;
  for (let k = 0; k < wHours; k++) {
    const ms = wStart + k * HOUR_MS;
    if (k % 24 === 0) dayAnom = 0.7 * dayAnom + 2.5 * g();
    hourAnom = 0.8 * hourAnom + 0.8 * g();
    const localHour = (((ms / HOUR_MS + utcOffsetHours(ms)) % 24) + 24) % 24;
    const diurnal = 5 * Math.cos((2 * Math.PI * (localHour - 15)) / 24);
    tempC[k] = 24 + diurnal + dayAnom + hourAnom;
  }
  const weather: WeatherSeries = { stationId: "WX1", startMs: wStart, tempC, filled: new Uint8Array(wHours) };

  const perDay = (24 * 60) / intervalMinutes;
  const n = weeks * 7 * perDay;
  const startMs = new Float64Array(n);
  const values = new Float64Array(n);
  const scale = intervalMinutes / 15;
  for (let i = 0; i < n; i++) {
    const ms = start + i * intervalMinutes * 60_000;
    startMs[i] = ms;
    const localMs = ms + utcOffsetHours(ms) * HOUR_MS;
    const dow = (Math.floor(localMs / DAY_MS) + 3) % 7; // 0 = Monday (1970-01-01 was a Thursday)
    const hourOfDay = ((localMs % DAY_MS) + DAY_MS) % DAY_MS / HOUR_MS;
    const weekday = dow < 5;
    const occupied = weekday && hourOfDay >= 7 && hourOfDay < 19;
    const t = tempC[Math.floor((ms - wStart) / HOUR_MS)]!;
    const cooling = (opts.coolingPerDegree ?? 3) * Math.max(t - 18, 0) * (occupied ? 1 : 0.2);
    let v: number;
    if (opts.offWhenClosed && !occupied) v = 0;
    else if (occupied) v = (50 + cooling) * (1 + 0.04 * g());
    else if (weekday) v = 2 + 0.2 * cooling + 0.15 * g();
    else v = 5 + 0.2 * cooling + 0.3 * g();
    values[i] = Math.round(Math.max(0, v) * scale * 100) / 100;
  }
  return { series: { meterId: "M1", intervalMinutes, startMs, values }, weather };
}

/** UTC offset of America/New_York at an instant, hours (−5 in winter, −4 in summer). */
export function utcOffsetHours(ms: number): number {
  // Cached per UTC hour: luxon is exact but slow, and a year of 15-minute data asks 35,040 times.
  const hour = Math.floor(ms / HOUR_MS);
  let off = offsetCache.get(hour);
  if (off === undefined) offsetCache.set(hour, (off = DateTime.fromMillis(hour * HOUR_MS, { zone: ZONE }).offset / 60));
  return off;
}
const offsetCache = new Map<number, number>();

/** Index of the interval starting at local day `day` (0 = first Monday) and local `hour`; valid while no DST change lies between the start and that day. */
export function indexAt(series: IntervalSeries, day: number, hour: number, minute = 0): number {
  return ((day * 24 + hour) * 60 + minute) / series.intervalMinutes;
}

/** Copy of a series with timestamps moved by `hours` (stamped = true + hours). */
export function shiftStamps(series: IntervalSeries, hours: number): IntervalSeries {
  const startMs = series.startMs.map((t) => t + hours * HOUR_MS);
  return { ...series, startMs };
}

/** Copy of a series without the intervals [from, to). */
export function dropRange(series: IntervalSeries, from: number, to: number): IntervalSeries {
  const keep = (_: number, i: number): boolean => i < from || i >= to;
  return {
    ...series,
    startMs: Float64Array.from(Array.from(series.startMs).filter(keep)),
    values: Float64Array.from(Array.from(series.values).filter(keep)),
  };
}
