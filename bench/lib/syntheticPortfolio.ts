/**
 * A small synthetic portfolio with KNOWN physics for the model benchmark, driven by any hourly
 * WeatherSeries (the benchmark uses real NOAA temperatures), plus the helpers the benchmark
 * scores it with: the two naive baselines, held-out statistics, band coverage and calendar-month
 * bills. Buildings and meters are fictional; every number is invented. Pure: no I/O, no clock,
 * randomness only from a seeded generator (same inputs → same output on every machine).
 *
 * Physics of one meter, per local hour h (T = mean outdoor temperature of the 4 hours ending
 * at h, a stand-in for the building's thermal lag):
 *   expected(h) = base + occupiedLoad·occ(h)
 *               + Σ over HVAC terms: slope · max(0, ±(T − balance(occ)))   (heating: balance − T; cooling: T − balance)
 *   actual(h)   = max(0, expected(h) · (1 + εday) · (1 + εhour)),  ε ~ Normal(0, sd), seeded.
 * occ(h) ∈ [0, 1] comes from the building's schedule (office hours, school term, shop hours,
 * warehouse shifts); balance(occ) is the occupied balance point when occ > 0, else the setback one.
 */
import { DateTime } from "luxon";
import type { Bill, Building, Commodity, IntervalSeries, Meter, WeatherSeries } from "../../src/domain/types.ts";
import { mulberry32 } from "../../src/core/random.ts";
import { isUsFederalHoliday, localMidnightMs } from "../../src/core/time/index.ts";

const HOUR_MS = 3_600_000;

/** One local hour of the calendar the schedules read. */
export interface LocalHour {
  hourStartMs: number;
  /** Local date `YYYY-MM-DD`. */
  isoDate: string;
  month: number;
  day: number;
  /** ISO weekday, 1 = Monday … 7 = Sunday. */
  weekday: number;
  /** Local clock hour 0–23. */
  hour: number;
  /** Observed U.S. federal holiday (src/tariff/holidays.ts). */
  holiday: boolean;
}

/** A heating or cooling term: load = slopePerK · max(0, ±(T − balance)). */
export interface HvacTerm {
  mode: "heating" | "cooling";
  /** Energy per hour per kelvin beyond the balance point, meter unit. */
  slopePerK: number;
  balanceOccupiedC: number;
  /** Setback balance point when nobody is in (use ±99 to switch the term off). */
  balanceUnoccupiedC: number;
}

/** Everything that defines one synthetic meter. */
export interface MeterProfile {
  meterId: string;
  buildingId: string;
  buildingName: string;
  useType: string;
  floorAreaM2: number;
  commodity: Commodity;
  /** Unit of the values (kWh for electricity, therm for gas). */
  unit: string;
  /** Always-on energy per hour. */
  base: number;
  /** Extra energy per hour at full occupancy. */
  occupiedLoad: number;
  /** Occupancy 0–1 for a local hour. */
  occupancy: (h: LocalHour) => number;
  hvac: HvacTerm[];
  /** Standard deviation of the day-level and hour-level multiplicative noise. */
  dailyNoiseSd: number;
  hourlyNoiseSd: number;
  seed: number;
}

/** A generated meter: measured series (with noise) and the noise-free truth. */
export interface SyntheticMeter {
  profile: MeterProfile;
  series: IntervalSeries;
  /** Noise-free expected energy per hour (same length as series.values). */
  expected: Float64Array;
}

/**
 * The local calendar of every hour in [startDate, startDate + days) in `zone` (DST-aware: 23- and
 * 25-hour days included).
 * @example localHours("2013-01-01", 1, "America/Los_Angeles").length // 24
 */
export function localHours(startDate: string, days: number, zone: string): LocalHour[] {
  const start = DateTime.fromISO(startDate, { zone });
  if (!start.isValid) throw new Error(`bad start date ${startDate} or zone ${zone}`);
  const endMs = start.plus({ days }).toMillis();
  const out: LocalHour[] = [];
  let holidayDate = "";
  let holiday = false;
  for (let ms = start.toMillis(); ms < endMs; ms += HOUR_MS) {
    const t = DateTime.fromMillis(ms, { zone });
    const isoDate = t.toISODate()!;
    if (isoDate !== holidayDate) {
      holidayDate = isoDate;
      holiday = isUsFederalHoliday(isoDate);
    }
    out.push({ hourStartMs: ms, isoDate, month: t.month, day: t.day, weekday: t.weekday, hour: t.hour, holiday });
  }
  return out;
}

/** Standard normal from two uniforms (Box–Muller). */
function gaussian(next: () => number): number {
  const u = Math.max(next(), 1e-12);
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * next());
}

/** Mean temperature of the 4 hours ending at `ms` (fewer near the grid start); NaN when none. */
function laggedTempC(weather: WeatherSeries, ms: number): number {
  const i = Math.round((ms - weather.startMs) / HOUR_MS);
  let s = 0;
  let n = 0;
  for (let k = Math.max(0, i - 3); k <= i && k < weather.tempC.length; k++) {
    const t = weather.tempC[k]!;
    if (Number.isFinite(t)) {
      s += t;
      n++;
    }
  }
  return n > 0 ? s / n : Number.NaN;
}

/**
 * Noise-free energy of one hour for a profile at occupancy `occ` and lagged temperature `tC`
 * (the physics stated in the module header).
 * @example expectedEnergy({ base: 10, occupiedLoad: 20, hvac: [{ mode: "heating", slopePerK: 2, balanceOccupiedC: 15, balanceUnoccupiedC: 10 }] }, 1, 5) // 10 + 20 + 2·10 = 50
 */
export function expectedEnergy(p: Pick<MeterProfile, "base" | "occupiedLoad" | "hvac">, occ: number, tC: number): number {
  let e = p.base + p.occupiedLoad * occ;
  for (const h of p.hvac) {
    const balance = occ > 0 ? h.balanceOccupiedC : h.balanceUnoccupiedC;
    const dK = h.mode === "heating" ? balance - tC : tC - balance;
    e += h.slopePerK * Math.max(0, dK);
  }
  return e;
}

/**
 * Generates one meter's hourly series over `hours` (from {@link localHours}) with the
 * profile's physics and seeded noise. Hours without a temperature get NaN values (the
 * models' hourly table counts them as non-finite).
 */
export function generateMeter(profile: MeterProfile, weather: WeatherSeries, hours: readonly LocalHour[]): SyntheticMeter {
  const next = mulberry32(profile.seed);
  const n = hours.length;
  const startMs = new Float64Array(n);
  const values = new Float64Array(n);
  const expected = new Float64Array(n);
  let day = "";
  let dayFactor = 1;
  for (let i = 0; i < n; i++) {
    const h = hours[i]!;
    if (h.isoDate !== day) {
      day = h.isoDate;
      dayFactor = 1 + profile.dailyNoiseSd * gaussian(next);
    }
    const hourFactor = 1 + profile.hourlyNoiseSd * gaussian(next);
    startMs[i] = h.hourStartMs;
    const e = expectedEnergy(profile, profile.occupancy(h), laggedTempC(weather, h.hourStartMs));
    expected[i] = e;
    values[i] = Number.isFinite(e) ? Math.max(0, e * dayFactor * hourFactor) : Number.NaN;
  }
  return { profile, series: { meterId: profile.meterId, intervalMinutes: 60, startMs, values }, expected };
}

// --- Schedules -------------------------------------------------------------------------------

/** Office: weekdays except federal holidays, 08–17 full, half an hour either side (07, 18). */
export function officeOccupancy(h: LocalHour): number {
  if (h.weekday > 5 || h.holiday) return 0;
  if (h.hour >= 8 && h.hour <= 17) return 1;
  return h.hour === 7 || h.hour === 18 ? 0.5 : 0;
}

/**
 * School term calendar (month/day ranges, the same every year): out of term from 15 June to
 * 31 August, from 21 December to 3 January, and 25–29 March (spring break).
 */
export function inSchoolTerm(month: number, day: number): boolean {
  const md = month * 100 + day;
  if (md >= 615 && md <= 831) return false;
  if (md >= 1221 || md <= 103) return false;
  if (md >= 325 && md <= 329) return false;
  return true;
}

/** School: term weekdays 07–14 full, 15–16 at 40 %; out of term, weekday staff at 15 % (08–15). */
export function schoolOccupancy(h: LocalHour): number {
  if (h.weekday > 5 || h.holiday) return 0;
  if (inSchoolTerm(h.month, h.day)) {
    if (h.hour >= 7 && h.hour <= 14) return 1;
    return h.hour === 15 || h.hour === 16 ? 0.4 : 0;
  }
  return h.hour >= 8 && h.hour <= 15 ? 0.15 : 0;
}

/** Shop: Mon–Sat 09–20 full (08 at half for stocking), Sunday 10–17; closed Thanksgiving and Christmas Day. */
export function retailOccupancy(h: LocalHour): number {
  const md = h.month * 100 + h.day;
  if (md === 1225 || (h.holiday && h.month === 11)) return 0;
  if (h.weekday === 7) return h.hour >= 10 && h.hour <= 17 ? 1 : 0;
  if (h.hour >= 9 && h.hour <= 20) return 1;
  return h.hour === 8 ? 0.5 : 0;
}

/** Warehouse: two shifts Mon–Fri 06–21, Saturday morning shift 06–13 at 60 %; holidays off. */
export function warehouseOccupancy(h: LocalHour): number {
  if (h.holiday || h.weekday === 7) return 0;
  if (h.weekday === 6) return h.hour >= 6 && h.hour <= 13 ? 0.6 : 0;
  return h.hour >= 6 && h.hour <= 21 ? 1 : 0;
}

const OFF = 99;

/** The benchmark portfolio: four fictional buildings, five meters (the office has electricity and gas). */
export const BENCH_PROFILES: readonly MeterProfile[] = [
  {
    meterId: "BENCH-OFFICE-E", buildingId: "BENCH-OFFICE", buildingName: "Bench Office", useType: "office", floorAreaM2: 6000,
    commodity: "electricity", unit: "kWh", base: 30, occupiedLoad: 90, occupancy: officeOccupancy,
    hvac: [{ mode: "cooling", slopePerK: 6, balanceOccupiedC: 16, balanceUnoccupiedC: OFF }],
    dailyNoiseSd: 0.05, hourlyNoiseSd: 0.08, seed: 101,
  },
  {
    meterId: "BENCH-OFFICE-G", buildingId: "BENCH-OFFICE", buildingName: "Bench Office", useType: "office", floorAreaM2: 6000,
    commodity: "gas", unit: "therm", base: 0.3, occupiedLoad: 0.6, occupancy: officeOccupancy,
    hvac: [{ mode: "heating", slopePerK: 0.25, balanceOccupiedC: 15, balanceUnoccupiedC: 10 }],
    dailyNoiseSd: 0.06, hourlyNoiseSd: 0.1, seed: 102,
  },
  {
    meterId: "BENCH-SCHOOL-E", buildingId: "BENCH-SCHOOL", buildingName: "Bench School", useType: "school", floorAreaM2: 8000,
    commodity: "electricity", unit: "kWh", base: 15, occupiedLoad: 60, occupancy: schoolOccupancy,
    hvac: [
      { mode: "heating", slopePerK: 3, balanceOccupiedC: 14, balanceUnoccupiedC: 8 },
      { mode: "cooling", slopePerK: 2, balanceOccupiedC: 20, balanceUnoccupiedC: OFF },
    ],
    dailyNoiseSd: 0.05, hourlyNoiseSd: 0.08, seed: 103,
  },
  {
    meterId: "BENCH-RETAIL-E", buildingId: "BENCH-RETAIL", buildingName: "Bench Store", useType: "retail", floorAreaM2: 2500,
    commodity: "electricity", unit: "kWh", base: 20, occupiedLoad: 50, occupancy: retailOccupancy,
    hvac: [
      { mode: "cooling", slopePerK: 5, balanceOccupiedC: 14, balanceUnoccupiedC: 20 },
      { mode: "heating", slopePerK: 2, balanceOccupiedC: 10, balanceUnoccupiedC: -OFF },
    ],
    dailyNoiseSd: 0.04, hourlyNoiseSd: 0.06, seed: 104,
  },
  {
    meterId: "BENCH-WAREHOUSE-E", buildingId: "BENCH-WAREHOUSE", buildingName: "Bench Warehouse", useType: "warehouse", floorAreaM2: 12000,
    commodity: "electricity", unit: "kWh", base: 10, occupiedLoad: 35, occupancy: warehouseOccupancy,
    hvac: [{ mode: "heating", slopePerK: 4, balanceOccupiedC: 10, balanceUnoccupiedC: 5 }],
    dailyNoiseSd: 0.06, hourlyNoiseSd: 0.1, seed: 105,
  },
];

// --- Naive baselines and scoring -------------------------------------------------------------

/** Local wall-clock label `yyyy-MM-dd HH` of an instant in `zone`. */
function localHourKey(t: DateTime): string {
  return t.toFormat("yyyy-LL-dd HH");
}

/**
 * Naive baseline 1: the value at the same local clock hour `lagDays` days earlier (364 = the
 * same weekday of the same week last year), matched on local wall time so a DST change between
 * the two years does not shift the daily profile by an hour. Where that hour is not in the
 * history (e.g. the last day of a 365-day year), the hour one week further back
 * (`lagDays` + 7) is used; NaN when neither exists.
 * @example sameHourLastYear([0, 3600000], [5, 7], [364 * 86400000 + 3600000], "UTC") // [7]
 */
export function sameHourLastYear(
  historyMs: ArrayLike<number>,
  historyValues: ArrayLike<number>,
  targetMs: ArrayLike<number>,
  zone: string,
  lagDays = 364,
): Float64Array {
  const byKey = new Map<string, number>();
  for (let i = 0; i < historyMs.length; i++) byKey.set(localHourKey(DateTime.fromMillis(historyMs[i]!, { zone })), historyValues[i]!);
  return Float64Array.from({ length: targetMs.length }, (_, i) => {
    const t = DateTime.fromMillis(targetMs[i]!, { zone });
    return byKey.get(localHourKey(t.minus({ days: lagDays }))) ?? byKey.get(localHourKey(t.minus({ days: lagDays + 7 }))) ?? Number.NaN;
  });
}

/**
 * Naive baseline 2: the mean of the history's finite values by hour of week (0–167). NaN for an
 * hour of week the history never saw.
 * @example hourOfWeekMean([0, 0, 1], [2, 4, 9], [0, 1, 2]) // [3, 9, NaN]
 */
export function hourOfWeekMean(historyHow: ArrayLike<number>, historyValues: ArrayLike<number>, targetHow: ArrayLike<number>): Float64Array {
  const sum = new Float64Array(168);
  const cnt = new Float64Array(168);
  for (let i = 0; i < historyHow.length; i++) {
    const v = historyValues[i]!;
    if (!Number.isFinite(v)) continue;
    sum[historyHow[i]!]! += v;
    cnt[historyHow[i]!]!++;
  }
  return Float64Array.from({ length: targetHow.length }, (_, i) => {
    const k = targetHow[i]!;
    return cnt[k]! > 0 ? sum[k]! / cnt[k]! : Number.NaN;
  });
}

/** Held-out accuracy: CV(RMSE) and NMBE in percent with p = 0 (nothing was fitted to these rows). */
export interface HeldOutScore {
  n: number;
  cvRmsePct: number;
  nmbePct: number;
}

/**
 * CV(RMSE) = 100·sqrt(Σ(y−ŷ)²/n)/ȳ and NMBE = 100·Σ(y−ŷ)/(n·ȳ) (ASHRAE Guideline 14 forms with
 * p = 0 for out-of-sample rows). Positive NMBE = the prediction is too low.
 * @example heldOutScore([10, 20], [12, 18]) // { n: 2, cvRmsePct: 13.33…, nmbePct: 0 }
 */
export function heldOutScore(y: ArrayLike<number>, yHat: ArrayLike<number>): HeldOutScore {
  if (y.length !== yHat.length) throw new Error("lengths differ");
  let se = 0;
  let e = 0;
  let s = 0;
  for (let i = 0; i < y.length; i++) {
    se += (y[i]! - yHat[i]!) ** 2;
    e += y[i]! - yHat[i]!;
    s += y[i]!;
  }
  const n = y.length;
  const m = s / n;
  return { n, cvRmsePct: (100 * Math.sqrt(se / n)) / m, nmbePct: (100 * e) / s };
}

/**
 * Share (0–1) of rows whose actual lies inside [lower, upper], inclusive.
 * @example bandCoverage([1, 5], [0, 0], [2, 2]) // 0.5
 */
export function bandCoverage(y: ArrayLike<number>, lower: ArrayLike<number>, upper: ArrayLike<number>): number {
  let inside = 0;
  for (let i = 0; i < y.length; i++) if (y[i]! >= lower[i]! && y[i]! <= upper[i]!) inside++;
  return y.length > 0 ? inside / y.length : Number.NaN;
}

/** First day of the month `k` months after `YYYY-MM`. */
function monthStart(firstMonth: string, k: number): string {
  const y = Number(firstMonth.slice(0, 4));
  const m = Number(firstMonth.slice(5, 7)) - 1 + k;
  const yy = y + Math.floor(m / 12);
  const mm = (m % 12) + 1;
  return `${yy}-${String(mm).padStart(2, "0")}-01`;
}

/**
 * Calendar-month bills (periodStart = 1st, periodEnd = 1st of next month, exclusive) from an
 * hourly series: usage = Σ of the hours whose start falls in the local month. A month with any
 * missing or non-finite hour is left out (and listed), never half-billed.
 */
export function monthlyBills(series: IntervalSeries, zone: string, firstMonth: string, months: number): { bills: Bill[]; incompleteMonths: string[] } {
  const bills: Bill[] = [];
  const incompleteMonths: string[] = [];
  let i = 0;
  for (let k = 0; k < months; k++) {
    const periodStart = monthStart(firstMonth, k);
    const periodEnd = monthStart(firstMonth, k + 1);
    const a = localMidnightMs(periodStart, zone);
    const b = localMidnightMs(periodEnd, zone);
    while (i < series.startMs.length && series.startMs[i]! < a) i++;
    let usage = 0;
    let hours = 0;
    let bad = false;
    for (; i < series.startMs.length && series.startMs[i]! < b; i++) {
      const v = series.values[i]!;
      if (Number.isFinite(v)) usage += v;
      else bad = true;
      hours++;
    }
    if (bad || hours !== Math.round((b - a) / HOUR_MS)) {
      incompleteMonths.push(periodStart.slice(0, 7));
      continue;
    }
    bills.push({
      billId: `${series.meterId}-${periodStart.slice(0, 7)}`, meterId: series.meterId, periodStart, periodEnd, usage,
      readType: "actual", demandKw: null, powerFactor: null, total: 0, statementDate: null, source: { file: "synthetic", line: k + 1 },
    });
  }
  return { bills, incompleteMonths };
}

/** Building and Meter records for a profile, as ingest would hand them to the bill-level models. */
export function domainRecords(p: MeterProfile, zone: string, stationId: string): { building: Building; meter: Meter } {
  const source = { file: "synthetic", line: 0 };
  return {
    building: {
      buildingId: p.buildingId, name: p.buildingName, floorArea: p.floorAreaM2, areaUnit: "m2", floorAreaM2: p.floorAreaM2,
      timezone: zone, weatherStation: stationId, useType: p.useType, tenantPage: false, source,
    },
    meter: { meterId: p.meterId, buildingId: p.buildingId, commodity: p.commodity, unit: p.unit, tariffId: "none", multiplier: 1, account: null, source },
  };
}
