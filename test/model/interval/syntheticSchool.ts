/**
 * Invented school-like hourly data for tests (not a real building): a year in UTC with a summer
 * break, and a root-mean-square error helper.
 */
import type { HourlyFrame } from "../../../src/model/interval/types.ts";
import { mulberry32 } from "../../../src/core/random.ts";

const H = 3_600_000;

/**
 * Invented school-like meter over `days` days from UTC day `day0` (zone ignored: UTC): weekdays
 * 8–15 h use 60 kWh in term and 9 kWh in the break (days of year 166–243), 15 kWh otherwise,
 * plus 1 kWh per °C of a temperature whose year-to-year pattern differs (seeded noise).
 */
export function schoolYear(year: number, seed: number): HourlyFrame {
  const rand = mulberry32(seed);
  const start = Date.UTC(year, 0, 1);
  const n = 365 * 24;
  const f: HourlyFrame = {
    hourStartMs: new Float64Array(n), hourOfWeek: new Uint8Array(n), holiday: new Uint8Array(n), dayOfYear: new Uint16Array(n), month: new Uint8Array(n),
    tempC: new Float64Array(n), tempSmoothC: new Float64Array(n), tempSlopeCPerHour: new Float64Array(n), tempLagC: new Float64Array(n),
    tempRollingMeanC: new Float64Array(n), kwh: new Float64Array(n),
    accounting: { intervalsRead: n, intervalsUsed: n, hoursSpanned: n, hoursUsed: n, excluded: { masked: 0, nonFinite: 0, incomplete: 0, noWeather: 0 }, derivedFeatureFallbacks: 0 },
  };
  for (let i = 0; i < n; i++) {
    const ms = start + i * H;
    const d = new Date(ms);
    const doy = Math.floor(i / 24) + 1;
    const how = ((d.getUTCDay() + 6) % 7) * 24 + d.getUTCHours();
    const t = 10 - 8 * Math.cos((2 * Math.PI * (doy - 15)) / 365) + 6 * (rand() - 0.5);
    const working = how < 120 && d.getUTCHours() >= 8 && d.getUTCHours() <= 15;
    const inBreak = doy >= 166 && doy <= 243;
    f.hourStartMs[i] = ms;
    f.hourOfWeek[i] = how;
    f.dayOfYear[i] = doy;
    f.month[i] = d.getUTCMonth() + 1;
    f.tempC[i] = f.tempSmoothC[i] = f.tempLagC[i] = f.tempRollingMeanC[i] = t;
    f.kwh[i] = 15 + (working ? (inBreak ? 9 : 60) : 0) + t + 2 * (rand() - 0.5);
  }
  return f;
}

export function rmse(y: ArrayLike<number>, p: ArrayLike<number>): number {
  let s = 0;
  for (let i = 0; i < y.length; i++) s += (y[i]! - p[i]!) ** 2;
  return Math.sqrt(s / y.length);
}

