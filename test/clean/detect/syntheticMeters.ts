/**
 * Invented test data: a year of 15-minute readings from meters of different kinds, seeded, on
 * the local clock of America/Chicago from Monday 2024-01-01. Every meter is clean (no faults),
 * so every detection on it is a false flag; tests plant faults on copies. The kinds are the
 * ordinary behaviours that a naive detector mistakes for faults:
 *  - `coarse-night`: a small shop whose meter reads in 0.02 kWh steps; at night the load is
 *    ~0.1 kWh per quarter-hour and barely moves, so equal readings repeat for hours (except on
 *    cold nights, when heat tracing cycles);
 *  - `staging-chiller`: an office whose chiller stages on and off: on warm afternoons a
 *    quarter-hour is often 15–20 % above its neighbours;
 *  - `steady-lab`: a 24/7 load with little noise and occasional +18 % quarter-hours;
 *  - `pulse-meter`: 1 kWh per pulse on a small load (readings 0, 1, 2, 3…);
 *  - `heating-school`: electric heating, weekday schedule, cold mornings with a big warm-up.
 * Temperature: seasonal cosine (coldest mid-January) + diurnal cycle + AR(1) day and hour anomalies.
 */
import { DateTime } from "luxon";
import type { IntervalSeries, WeatherSeries } from "../../../src/domain/types.ts";
import { gauss, rng } from "./syntheticOffice.ts";

export const METER_ZONE = "America/Chicago";
const HOUR_MS = 3_600_000;
/** Local midnight Monday 2024-01-01 in America/Chicago (UTC−6). */
export const YEAR_START_MS = Date.UTC(2024, 0, 1, 6);

export type MeterKind = "coarse-night" | "staging-chiller" | "steady-lab" | "pulse-meter" | "heating-school";
export const METER_KINDS: readonly MeterKind[] = ["coarse-night", "staging-chiller", "steady-lab", "pulse-meter", "heating-school"];

/** Resolution (step between possible readings) of each kind, in kWh. */
export const RESOLUTION: Record<MeterKind, number> = {
  "coarse-night": 0.02,
  "staging-chiller": 0.01,
  "steady-lab": 0.1,
  "pulse-meter": 1,
  "heating-school": 0.01,
};

const offsetCache = new Map<number, number>();
function localOffsetHours(ms: number): number {
  const hour = Math.floor(ms / HOUR_MS);
  let off = offsetCache.get(hour);
  if (off === undefined) offsetCache.set(hour, (off = DateTime.fromMillis(hour * HOUR_MS, { zone: METER_ZONE }).offset / 60));
  return off;
}

/** Hourly weather over the meter's span, from 2 days before to 2 days after. */
export function makeYearWeather(seed: number, weeks = 52, startMs = YEAR_START_MS): WeatherSeries {
  const g = gauss(rng(seed * 7919 + 1));
  const wStart = startMs - 2 * 86_400_000;
  const hours = (weeks * 7 + 4) * 24;
  const tempC = new Float64Array(hours);
  let day = 0;
  let hourly = 0;
  for (let k = 0; k < hours; k++) {
    const ms = wStart + k * HOUR_MS;
    if (k % 24 === 0) day = 0.75 * day + 2.5 * g();
    hourly = 0.8 * hourly + 0.6 * g();
    const local = ms + localOffsetHours(ms) * HOUR_MS;
    const doy = (local - Date.UTC(2024, 0, 1)) / 86_400_000;
    const hod = (((local / HOUR_MS) % 24) + 24) % 24;
    const seasonal = 12 - 14 * Math.cos((2 * Math.PI * (doy - 15)) / 365);
    tempC[k] = seasonal + 5 * Math.cos((2 * Math.PI * (hod - 15)) / 24) + day + hourly;
  }
  return { stationId: "WX-SYN", startMs: wStart, tempC, filled: new Uint8Array(hours) };
}

/** One clean meter of `kind`, a year (or `weeks`) of 15-minute readings, rounded to its resolution. */
export function makeMeter(kind: MeterKind, seed: number, weather: WeatherSeries, weeks = 52, startMs = YEAR_START_MS): IntervalSeries {
  const u = rng(seed * 104_729 + METER_KINDS.indexOf(kind) + 1);
  const g = gauss(u);
  const n = weeks * 7 * 96;
  const times = new Float64Array(n);
  const values = new Float64Array(n);
  const q = RESOLUTION[kind];
  let ar = 0;
  for (let i = 0; i < n; i++) {
    const ms = startMs + i * 15 * 60_000;
    times[i] = ms;
    const local = ms + localOffsetHours(ms) * HOUR_MS;
    const dow = (Math.floor(local / 86_400_000) + 3) % 7; // 0 = Monday
    const hod = (((local / HOUR_MS) % 24) + 24) % 24;
    const t = weather.tempC[Math.floor((ms - weather.startMs) / HOUR_MS)]!;
    const weekday = dow < 5;
    ar = 0.9 * ar + g();
    let v: number;
    switch (kind) {
      case "coarse-night": {
        const open = hod >= 9 && hod < 20 && dow < 6;
        v = open ? 2.5 + 0.08 * Math.max(t - 20, 0) + 0.15 * g() : t < 14 ? 0.3 + 0.08 * g() : 0.1 + 0.004 * ar; // heat tracing cycles on cold nights
        break;
      }
      case "staging-chiller": {
        const occ = weekday && hod >= 7 && hod < 19;
        const cooling = Math.max(t - 16, 0) * (occ ? 2.5 : 0.6);
        v = (occ ? 40 : 12) + cooling;
        if (cooling > 10 && u() < 0.08) v *= 1.15 + 0.05 * u(); // a chiller stage for one quarter-hour
        v *= 1 + 0.02 * g();
        break;
      }
      case "steady-lab": {
        v = 80 + 0.3 * Math.max(t - 18, 0) + 0.6 * ar;
        if (u() < 0.01) v *= 1.18; // an autoclave cycle
        break;
      }
      case "pulse-meter": {
        const occ = weekday && hod >= 8 && hod < 17;
        v = Math.max(0, (occ ? 3 : 0.4) + 0.5 * g());
        break;
      }
      case "heating-school": {
        const occ = weekday && hod >= 7 && hod < 16;
        const warmUp = weekday && hod >= 5 && hod < 7;
        const heating = Math.max(15 - t, 0) * (occ ? 1.2 : warmUp ? 2.5 : 0.3);
        v = (occ ? 25 : 6) + heating;
        v *= 1 + 0.03 * g();
        break;
      }
    }
    values[i] = Math.round(Math.max(0, v) / q) * q;
    // keep the decimal representation exact for the step (0.02 × 7 = 0.14, not 0.14000000000000001)
    values[i] = Number(values[i]!.toFixed(6));
  }
  return { meterId: `${kind}-${seed}`, intervalMinutes: 15, startMs: times, values };
}

/** A fault planted on a copy of a clean meter: what a detector must find there. */
export interface PlantedFault {
  kind: "spike" | "constant-run" | "zero-run";
  /** Index of the first planted interval and how many. */
  at: number;
  intervals: number;
}

/**
 * Plants, on a copy: five 25× spikes (weekday 11:00 and 14:00 in weeks 5, 17, 29, and a weekday
 * 03:00 in weeks 11 and 41; a zero reading is first raised to the resolution), a register stuck
 * for 10 h from 09:00 on the Wednesday of week 22, and a 12-hour zero outage from 08:00 on the
 * Tuesday of week 35. Positions are local-clock by construction (index arithmetic from local
 * midnight Monday, valid away from DST days: none of these days is one).
 */
export function plantFaults(clean: IntervalSeries, kind: MeterKind): { series: IntervalSeries; planted: PlantedFault[] } {
  const v = Float64Array.from(clean.values);
  const planted: PlantedFault[] = [];
  const perDay = 96;
  const localIndex = (week: number, dow: number, hour: number): number => {
    // Find the interval whose local clock is week/dow/hour by scanning from the expected spot.
    const target = Date.UTC(2024, 0, 1 + week * 7 + dow, hour);
    let i = (week * 7 + dow) * perDay + hour * 4;
    for (let k = 0; k < 12; k++) {
      const local = clean.startMs[i]! + localOffsetHours(clean.startMs[i]!) * HOUR_MS;
      if (local === target) return i;
      i += local < target ? 4 : -4;
    }
    throw new Error(`no interval at week ${week} day ${dow} ${hour}:00`);
  };
  const q = RESOLUTION[kind];
  for (const [week, dow, hour] of [[5, 1, 11], [17, 2, 14], [29, 3, 11], [11, 1, 3], [41, 2, 3]] as const) {
    const i = localIndex(week, dow, hour);
    v[i] = Number((25 * Math.max(v[i]!, q)).toFixed(6));
    planted.push({ kind: "spike", at: i, intervals: 1 });
  }
  const c = localIndex(22, 2, 9);
  for (let i = c; i < c + 40; i++) v[i] = v[c]! === 0 ? q : v[c]!;
  planted.push({ kind: "constant-run", at: c, intervals: 40 });
  const z = localIndex(35, 1, 8);
  for (let i = z; i < z + 48; i++) v[i] = 0;
  planted.push({ kind: "zero-run", at: z, intervals: 48 });
  return { series: { ...clean, values: v }, planted };
}
