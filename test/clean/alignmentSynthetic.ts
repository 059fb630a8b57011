/**
 * Invented test data for the clock-alignment tests: an office in America/New_York, 15-minute
 * readings, with a heating- or a cooling-dominated season, a thermal lag (the load answers the
 * mean temperature of the last `lagHours` + 1 hours, as buildings do), and an optional clock
 * offset (stamped = true + offset). Seeded; nothing here is real.
 * - cooling: 12 weeks from Monday 2025-06-02, mean 24 °C; cooling load ∝ (T − 18)⁺.
 * - heating: 12 weeks from Monday 2025-01-06, mean 0 °C; heating load ∝ (15 − T)⁺.
 * - dst: 12 weeks from Monday 2025-02-17 across the 2025-03-09 change, mean 4 °C, heating.
 * Occupied 07:00–19:00 local on weekdays (the schedule follows the local clock through DST).
 */
import { DateTime } from "luxon";
import type { IntervalSeries, WeatherSeries } from "../../src/domain/types.ts";
import { gauss, rng } from "./detect/syntheticOffice.ts";

export const ALIGN_ZONE = "America/New_York";
const HOUR_MS = 3_600_000;
const DAY_MS = 86_400_000;

export type Season = "cooling" | "heating" | "dst";

export interface AlignOptions {
  season: Season;
  seed: number;
  /** Hours of thermal lag (0 = the load answers this hour's temperature). Default 1. */
  lagHours?: number;
  /** Meter timestamp − true time, hours. Default 0. */
  offsetHours?: number;
  weeks?: number;
  meterId?: string;
  /** Load scale (so meters on one station differ). Default 1. */
  scale?: number;
}

const START: Record<Season, number> = {
  cooling: Date.UTC(2025, 5, 2, 4),
  heating: Date.UTC(2025, 0, 6, 5),
  dst: Date.UTC(2025, 1, 17, 5),
};
const MEAN_C: Record<Season, number> = { cooling: 24, heating: 0, dst: 4 };

const offsets = new Map<number, number>();
function zoneOffsetHours(ms: number): number {
  const h = Math.floor(ms / HOUR_MS);
  let o = offsets.get(h);
  if (o === undefined) offsets.set(h, (o = DateTime.fromMillis(h * HOUR_MS, { zone: ALIGN_ZONE }).offset / 60));
  return o;
}

/** Hourly weather for a season (from 2 days before its start to 2 days after its end). */
export function seasonWeather(season: Season, seed: number, weeks = 12): WeatherSeries {
  const g = gauss(rng(seed * 31 + 7));
  const start = START[season] - 2 * DAY_MS;
  const hours = (weeks * 7 + 4) * 24;
  const tempC = new Float64Array(hours);
  let day = 0;
  let hourly = 0;
  for (let k = 0; k < hours; k++) {
    const ms = start + k * HOUR_MS;
    if (k % 24 === 0) day = 0.7 * day + 3 * g();
    hourly = 0.8 * hourly + 0.8 * g();
    const localHour = (((ms / HOUR_MS + zoneOffsetHours(ms)) % 24) + 24) % 24;
    tempC[k] = MEAN_C[season] + 5 * Math.cos((2 * Math.PI * (localHour - 15)) / 24) + day + hourly;
  }
  return { stationId: "WX-A", startMs: start, tempC, filled: new Uint8Array(hours) };
}

/** One office meter on `weather`, with the season's HVAC response, lag and clock offset. */
export function officeOnStation(weather: WeatherSeries, opts: AlignOptions): IntervalSeries {
  const u = rng(opts.seed * 1_000_003 + (opts.meterId?.length ?? 0) * 17 + Math.round((opts.scale ?? 1) * 100));
  const g = gauss(u);
  const weeks = opts.weeks ?? 12;
  const lag = opts.lagHours ?? 1;
  const scale = opts.scale ?? 1;
  const start = START[opts.season];
  const n = weeks * 7 * 96;
  const startMs = new Float64Array(n);
  const values = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const ms = start + i * 15 * 60_000;
    const local = ms + zoneOffsetHours(ms) * HOUR_MS;
    const dow = (Math.floor(local / DAY_MS) + 3) % 7;
    const hod = (((local % DAY_MS) + DAY_MS) % DAY_MS) / HOUR_MS;
    const occupied = dow < 5 && hod >= 7 && hod < 19;
    const k = Math.floor((ms - weather.startMs) / HOUR_MS);
    let t = 0;
    for (let j = 0; j <= lag; j++) t += weather.tempC[k - j]!;
    t /= lag + 1;
    const hvac = opts.season === "cooling" ? Math.max(t - 18, 0) : Math.max(15 - t, 0);
    const v = (occupied ? 40 : 8) + hvac * (occupied ? 2.5 : 1.2);
    values[i] = Math.round(Math.max(0, v * scale * (1 + 0.03 * g())) * 100) / 100;
    startMs[i] = ms + (opts.offsetHours ?? 0) * HOUR_MS;
  }
  return { meterId: opts.meterId ?? "M", intervalMinutes: 15, startMs, values };
}
