/**
 * Invented hourly outdoor temperature: a seasonal cosine, a diurnal cosine, a day-to-day
 * weather anomaly (AR(1) on daily values, interpolated) and small hourly AR(1) noise.
 * The simulated series is complete; gaps are only cut out of the written file.
 */
import type { StationDef } from "./definition.ts";
import type { ZoneCalendar } from "./calendar.ts";
import { formatLocalWithOffset } from "./calendar.ts";
import { Rng } from "./prng.ts";

/** Day of year of the climatological coldest day (about January 20 in the continental U.S.). */
const COLDEST_DAY_OF_YEAR = 20;
/** Hour of the daily maximum, local. */
const WARMEST_HOUR = 15;

/**
 * Smooth climatological temperature for a day of year and local hour (no weather noise).
 * @example climateTempC(station, 200, 15) // a July afternoon, near annualMean + amplitude + diurnal
 */
export function climateTempC(station: StationDef, dayOfYear: number, localHour: number): number {
  const season = -Math.cos((2 * Math.PI * (dayOfYear - COLDEST_DAY_OF_YEAR)) / 365.25);
  // Days swing a little more in summer than in winter.
  const diurnal = station.diurnalAmplitudeC * (1 + 0.18 * season);
  return (
    station.annualMeanC +
    station.seasonalAmplitudeC * season +
    diurnal * Math.cos((2 * Math.PI * (localHour - WARMEST_HOUR)) / 24)
  );
}

/**
 * Simulates one station's hourly temperature (°C) on the hour grid of `cal`
 * (hour h = interval 4h), deterministic for the station id.
 */
export function simulateHourlyTempC(station: StationDef, cal: ZoneCalendar): Float64Array {
  const rng = Rng.forKey(`weather:${station.stationId}`);
  const dayCount = cal.days.length;
  const phiDay = 0.72;
  const anomaly = new Float64Array(dayCount + 1);
  anomaly[0] = station.synopticSdC * rng.normal();
  for (let d = 1; d <= dayCount; d++) {
    anomaly[d] = phiDay * anomaly[d - 1] + station.synopticSdC * Math.sqrt(1 - phiDay * phiDay) * rng.normal();
  }
  const hours = Math.floor(cal.startMs.length / 4);
  const tempC = new Float64Array(hours);
  const phiHour = 0.85;
  const hourSd = 0.55;
  let noise = 0;
  for (let h = 0; h < hours; h++) {
    const i = h * 4;
    const di = cal.intervalDay[i];
    const day = cal.days[di];
    const localHour = cal.clockMinute[i] / 60;
    // Anomaly interpolated between consecutive days' values (anchored at local noon).
    const frac = (localHour - 12) / 24;
    const a = frac >= 0 ? anomaly[di] + (anomaly[di + 1] - anomaly[di]) * frac : anomaly[Math.max(di - 1, 0)] + (anomaly[di] - anomaly[Math.max(di - 1, 0)]) * (1 + frac);
    noise = phiHour * noise + hourSd * Math.sqrt(1 - phiHour * phiHour) * rng.normal();
    // Weather systems swing harder in winter than in summer in continental climates.
    const season = -Math.cos((2 * Math.PI * (day.dayOfYear - COLDEST_DAY_OF_YEAR)) / 365.25);
    tempC[h] = climateTempC(station, day.dayOfYear, localHour) + a * (1 - 0.4 * season) + noise;
  }
  return tempC;
}

/** Temperature at each 15-minute interval, linearly interpolated from the hourly series. */
export function intervalTempC(hourlyTempC: Float64Array, intervalCount: number): Float64Array {
  const out = new Float64Array(intervalCount);
  for (let i = 0; i < intervalCount; i++) {
    const h = Math.floor(i / 4);
    const next = Math.min(h + 1, hourlyTempC.length - 1);
    out[i] = hourlyTempC[h] + (hourlyTempC[next] - hourlyTempC[h]) * ((i % 4) / 4);
  }
  return out;
}

/** Mean temperature of each local day, °C. */
export function dailyMeanTempC(hourlyTempC: Float64Array, cal: ZoneCalendar): Float64Array {
  const out = new Float64Array(cal.days.length);
  cal.days.forEach((d, di) => {
    let sum = 0;
    const n = d.intervalCount / 4;
    for (let k = 0; k < n; k++) sum += hourlyTempC[d.firstInterval / 4 + k];
    out[di] = sum / n;
  });
  return out;
}

/** °C → °F. */
export function cToF(tempC: number): number {
  return tempC * 1.8 + 32;
}

/**
 * Writes the station's hourly CSV (`station_id,timestamp,temperature_c|_f`), timestamps in
 * local time with their UTC offset, the planned gaps left out as absent rows.
 */
export function weatherCsv(station: StationDef, cal: ZoneCalendar, hourlyTempC: Float64Array): string {
  const skip = new Set<number>();
  for (const gap of station.gaps) {
    const di = cal.dayIndex.get(gap.date);
    if (di === undefined) throw new Error(`demo weather gap outside the calendar: ${gap.date}`);
    const firstHour = cal.days[di].firstInterval / 4 + gap.hour;
    for (let k = 0; k < gap.hours; k++) skip.add(firstHour + k);
  }
  const column = station.fileUnit === "F" ? "temperature_f" : "temperature_c";
  const rows = [`station_id,timestamp,${column}`];
  for (let h = 0; h < hourlyTempC.length; h++) {
    if (skip.has(h)) continue;
    const i = h * 4;
    const day = cal.days[cal.intervalDay[i]];
    const value = station.fileUnit === "F" ? cToF(hourlyTempC[h]) : hourlyTempC[h];
    rows.push(`${station.stationId},${formatLocalWithOffset(day.date, cal.clockMinute[i], cal.offsetMinutes[i])},${value.toFixed(1)}`);
  }
  return rows.join("\n") + "\n";
}

/**
 * Writes a typical year (8,760 hourly rows of local year 2023) from the smooth climate,
 * with a gentle deterministic ripple so the normal year is not a perfect cosine.
 */
export function normalsCsv(station: StationDef, cal: ZoneCalendar): string {
  const column = station.fileUnit === "F" ? "temperature_f" : "temperature_c";
  const rows = [`station_id,timestamp,${column}`];
  for (const day of cal.days) {
    if (day.year !== 2023) continue;
    for (let k = 0; k < day.intervalCount; k += 4) {
      const i = day.firstInterval + k;
      const localHour = cal.clockMinute[i] / 60;
      const ripple = 1.1 * Math.sin((2 * Math.PI * day.dayOfYear) / 9.5) * Math.cos((2 * Math.PI * day.dayOfYear) / 41);
      const tempC = climateTempC(station, day.dayOfYear, localHour) + ripple;
      const value = station.fileUnit === "F" ? cToF(tempC) : tempC;
      rows.push(`${station.stationId},${formatLocalWithOffset(day.date, cal.clockMinute[i], cal.offsetMinutes[i])},${value.toFixed(1)}`);
    }
  }
  return rows.join("\n") + "\n";
}
