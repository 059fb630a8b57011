/**
 * Invented data for tests and the benchmark: a fictional office's 15-minute electricity use
 * and the hourly weather it responds to. Not a real building; the physics is only plausible.
 */
import { DateTime } from "luxon";
import type { IntervalSeries, WeatherSeries } from "../../../src/domain/types.ts";
import { mulberry32 } from "../../../src/core/random.ts";
import { isUsFederalHoliday } from "../../../src/core/time/index.ts";

export interface SyntheticOffice {
  series: IntervalSeries;
  weather: WeatherSeries;
  zone: string;
  /** True mean kW per interval before noise (for checks). */
  trueKw: Float64Array;
}

export interface SyntheticOfficeOptions {
  startIso?: string;
  days?: number;
  seed?: number;
  zone?: string;
  /** Scale of the whole load (kW of the occupied block). Default 80. */
  occupiedKw?: number;
  baseKw?: number;
  /** Relative noise (sd as a share of the true load). Default 0.05. */
  noise?: number;
  /** Seed of the weather; meters sharing it share a station. Default seed + 1000. */
  weatherSeed?: number;
}

/** Hourly weather: seasonal + daily cycle + AR(1) noise, °C. */
export function syntheticWeather(startMs: number, hours: number, seed: number): WeatherSeries {
  const rand = mulberry32(seed);
  const t = new Float64Array(hours);
  let ar = 0;
  for (let h = 0; h < hours; h++) {
    const ms = startMs + h * 3_600_000;
    const dayOfYear = (ms - Date.UTC(new Date(ms).getUTCFullYear(), 0, 1)) / 86_400_000;
    const gauss = Math.sqrt(-2 * Math.log(1 - rand())) * Math.cos(2 * Math.PI * rand());
    ar = 0.97 * ar + 0.6 * gauss;
    const hourUtc = new Date(ms).getUTCHours();
    t[h] = 12 - 14 * Math.cos((2 * Math.PI * (dayOfYear - 15)) / 365) + 5 * Math.sin((2 * Math.PI * (hourUtc - 15)) / 24) + ar;
  }
  return { stationId: "SYN-1", startMs, tempC: t, filled: new Uint8Array(hours) };
}

/**
 * A year (by default) of 15-minute office data, starting at local midnight.
 * Load (kW): base + occupied block on working days 7–19 h local (not on federal holidays)
 * + cooling 3 kW/°C above 18 °C of the 3-hour-lagged temperature (halved when unoccupied)
 * + heating 2 kW/°C below 10 °C, times (1 + noise·N(0,1)).
 */
export function syntheticOffice(options: SyntheticOfficeOptions = {}): SyntheticOffice {
  const zone = options.zone ?? "America/Chicago";
  const start = DateTime.fromISO(options.startIso ?? "2025-01-01", { zone }).toMillis();
  const days = options.days ?? 365;
  const rand = mulberry32(options.seed ?? 1);
  const hours = days * 24 + 48;
  const weather = syntheticWeather(start - 24 * 3_600_000, hours, options.weatherSeed ?? (options.seed ?? 1) + 1000);
  const n = days * 96;
  const startMs = new Float64Array(n);
  const values = new Float64Array(n);
  const trueKw = new Float64Array(n);
  const occKw = options.occupiedKw ?? 80;
  const baseKw = options.baseKw ?? 40;
  const noise = options.noise ?? 0.05;
  let lastDay = "";
  let holiday = false;
  for (let i = 0; i < n; i++) {
    const ms = start + i * 900_000;
    startMs[i] = ms;
    const local = DateTime.fromMillis(ms, { zone });
    const day = local.toISODate()!;
    if (day !== lastDay) {
      lastDay = day;
      holiday = isUsFederalHoliday(day);
    }
    const occupied = local.weekday <= 5 && !holiday && local.hour >= 7 && local.hour < 19;
    const wi = Math.floor((ms - weather.startMs) / 3_600_000);
    const tLag = weather.tempC[wi - 3]!;
    const tNow = weather.tempC[wi]!;
    const kw = baseKw + (occupied ? occKw : 0) + 3 * Math.max(tLag - 18, 0) * (occupied ? 1 : 0.5) + 2 * Math.max(10 - tNow, 0);
    trueKw[i] = kw;
    const gauss = Math.sqrt(-2 * Math.log(1 - rand())) * Math.cos(2 * Math.PI * rand());
    values[i] = (kw * (1 + noise * gauss)) / 4; // kWh in 15 minutes
  }
  return { series: { meterId: "SYN-OFFICE-1", intervalMinutes: 15, startMs, values }, weather, zone, trueKw };
}
