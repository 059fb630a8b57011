/**
 * Local calendar for time-of-use pricing: which local day, month and wall-clock minute each
 * instant falls on in the tariff's zone, and which period applies. The zone's UTC offset is
 * piecewise constant, so it is looked up (through Luxon) a handful of times per bill, the DST
 * changes are located by bisection, and every instant is then placed by plain arithmetic:
 * a month of 15-minute data costs a few dozen zone look-ups, not thousands.
 */
import { IANAZone } from "luxon";
import { PricingError } from "./errors.ts";
import { usFederalHolidays } from "./holidays.ts";
import type { HolidayRule, Period, Season, TariffVersion } from "./model.ts";
import { localMidnightMs as coreLocalMidnightMs } from "../core/time.ts";

export interface LocalDay {
  /** Local date `YYYY-MM-DD`. */
  date: string;
  /** 1 = January. */
  month: number;
  /** 1 = Monday … 7 = Sunday. */
  isoWeekday: number;
}

export interface LocalTimes {
  /** Index into `days` for every instant. */
  dayIndex: Int32Array;
  /** Minutes after local midnight (wall clock) for every instant. */
  minuteOfDay: Int16Array;
  days: LocalDay[];
}

const DAY_MS = 86_400_000;
/** Offsets are re-checked at least this often; no zone changes its offset twice within a week. */
const PROBE_MS = 7 * DAY_MS;

/** Throws a PricingError unless `zone` is an IANA zone name Luxon knows. */
const knownZones = new Set<string>();

export function assertZone(zone: string): void {
  if (knownZones.has(zone)) return;
  if (IANAZone.isValidZone(zone)) {
    knownZones.add(zone);
  } else {
    throw new PricingError(`unknown time zone '${zone}' (use an IANA name such as America/New_York or UTC)`);
  }
}

/**
 * UTC instant (ms) of local midnight starting `date` in `zone`: the shared, cached helper of
 * src/core/time.ts, after the zone check that turns a bad zone into a PricingError.
 */
export function localMidnightMs(date: string, zone: string): number {
  assertZone(zone);
  return coreLocalMidnightMs(date, zone);
}

/** A stretch of time with one UTC offset. */
interface OffsetSegment {
  startMs: number;
  offsetMs: number;
}

const yearSegments = new Map<string, OffsetSegment[]>();

/**
 * Offset changes of `zone` during one UTC calendar year, cached: offsets probed weekly, each
 * change located to the second by bisection. The first segment starts at the year's start.
 */
function segmentsOfYear(zone: string, year: number): OffsetSegment[] {
  const key = `${zone}|${year}`;
  const hit = yearSegments.get(key);
  if (hit) return hit;
  const z = IANAZone.create(zone);
  const off = (t: number) => z.offset(t) * 60_000;
  const fromMs = Date.UTC(year, 0, 1);
  const toMs = Date.UTC(year + 1, 0, 1);
  let t = fromMs;
  let cur = off(t);
  const out: OffsetSegment[] = [{ startMs: fromMs, offsetMs: cur }];
  while (t < toMs) {
    const next = Math.min(t + PROBE_MS, toMs);
    const o = off(next);
    if (o !== cur) {
      let lo = t;
      let hi = next;
      while (hi - lo > 1000) {
        const mid = lo + Math.floor((hi - lo) / 2000) * 1000;
        if (off(mid) === cur) lo = mid;
        else hi = mid;
      }
      cur = off(hi);
      if (hi < toMs) out.push({ startMs: hi, offsetMs: cur });
      t = hi;
      continue;
    }
    t = next;
  }
  yearSegments.set(key, out);
  return out;
}

/** The offset segments of `zone` covering [fromMs, toMs]; the first one is open to the past. */
export function offsetSegments(zone: string, fromMs: number, toMs: number): OffsetSegment[] {
  const y0 = new Date(fromMs).getUTCFullYear();
  const y1 = new Date(toMs).getUTCFullYear();
  const out: OffsetSegment[] = [];
  for (let y = y0; y <= y1; y++) {
    for (const seg of segmentsOfYear(zone, y)) {
      if (out.length > 0 && out[out.length - 1].offsetMs === seg.offsetMs) continue;
      out.push(seg);
    }
  }
  out[0] = { startMs: Number.NEGATIVE_INFINITY, offsetMs: out[0].offsetMs };
  return out;
}

/** Civil date of a day number (days since 1970-01-01), after H. Hinnant's days_from_civil inverse. */
function civil(dayNum: number): LocalDay {
  const z = dayNum + 719468;
  const era = Math.floor(z / 146097);
  const doe = z - era * 146097;
  const yoe = Math.floor((doe - Math.floor(doe / 1460) + Math.floor(doe / 36524) - Math.floor(doe / 146096)) / 365);
  const doy = doe - (365 * yoe + Math.floor(yoe / 4) - Math.floor(yoe / 100));
  const mp = Math.floor((5 * doy + 2) / 153);
  const d = doy - Math.floor((153 * mp + 2) / 5) + 1;
  const m = mp < 10 ? mp + 3 : mp - 9;
  const y = yoe + era * 400 + (m <= 2 ? 1 : 0);
  const isoWeekday = ((((dayNum + 3) % 7) + 7) % 7) + 1; // 1970-01-01 was a Thursday (4)
  const date = `${String(y).padStart(4, "0")}-${String(m).padStart(2, "0")}-${String(d).padStart(2, "0")}`;
  return { date, month: m, isoWeekday };
}

/**
 * Local day and wall-clock minute of each instant in `zone`. On a 25-hour day the repeated hour
 * gets the same minutes twice; on a 23-hour day the skipped hour never appears.
 */
export function localTimes(startMs: Float64Array, zone: string): LocalTimes {
  assertZone(zone);
  const n = startMs.length;
  const dayIndex = new Int32Array(n);
  const minuteOfDay = new Int16Array(n);
  const days: LocalDay[] = [];
  if (n === 0) return { dayIndex, minuteOfDay, days };
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < n; i++) {
    if (startMs[i] < lo) lo = startMs[i];
    if (startMs[i] > hi) hi = startMs[i];
  }
  const segs = offsetSegments(zone, lo, hi);
  const byDay = new Map<number, number>();
  let seg = 0;
  let lastDayNum = Number.NaN;
  let lastIdx = -1;
  for (let i = 0; i < n; i++) {
    const t = startMs[i];
    if (t < segs[seg].startMs) seg = 0; // unsorted input: restart the scan
    while (seg + 1 < segs.length && t >= segs[seg + 1].startMs) seg++;
    const local = t + segs[seg].offsetMs;
    const dayNum = Math.floor(local / DAY_MS);
    if (dayNum !== lastDayNum) {
      let idx = byDay.get(dayNum);
      if (idx === undefined) {
        idx = days.length;
        days.push(civil(dayNum));
        byDay.set(dayNum, idx);
      }
      lastDayNum = dayNum;
      lastIdx = idx;
    }
    dayIndex[i] = lastIdx;
    minuteOfDay[i] = Math.floor((local - dayNum * DAY_MS) / 60_000);
  }
  return { dayIndex, minuteOfDay, days };
}

/** True when the local date is a working day under the rule: Monday–Friday and not a holiday. */
export function isWorkday(day: LocalDay, holidays: HolidayRule): boolean {
  if (day.isoWeekday >= 6) return false;
  if (holidays === null) return true;
  if (holidays.kind === "us-federal") return !usFederalHolidays(Number(day.date.slice(0, 4))).has(day.date);
  return !holidays.dates.includes(day.date);
}

function inHours(period: Period, minute: number): boolean {
  if (period.hours === null) return true;
  for (const r of period.hours) {
    if (r.startMin < r.endMin) {
      if (minute >= r.startMin && minute < r.endMin) return true;
    } else if (minute >= r.startMin || minute < r.endMin) {
      return true;
    }
  }
  return false;
}

/**
 * Index of the first period matching (month, working day, minute), or -1 when none does
 * (only possible when the version has no periods).
 */
export function matchPeriod(periods: readonly Period[], seasons: readonly Season[], month: number, workday: boolean, minute: number): number {
  for (let p = 0; p < periods.length; p++) {
    const period = periods[p];
    if (period.season !== null) {
      const season = seasons.find((s) => s.name === period.season);
      if (!season || !season.months.includes(month)) continue;
    }
    if (period.days === "weekdays" && !workday) continue;
    if (period.days === "weekends" && workday) continue;
    if (inHours(period, minute)) return p;
  }
  return -1;
}

const tables = new WeakMap<TariffVersion, Int8Array>();

/**
 * Lookup table of period indices for a version: entry ((month − 1) × 2 + workday) × 1440 + minute.
 * Built once per version (35 KB) and cached.
 */
export function periodTable(version: TariffVersion): Int8Array {
  let table = tables.get(version);
  if (table) return table;
  table = new Int8Array(12 * 2 * 1440);
  for (let month = 1; month <= 12; month++) {
    for (let w = 0; w < 2; w++) {
      const base = ((month - 1) * 2 + w) * 1440;
      for (let m = 0; m < 1440; m++) {
        table[base + m] = matchPeriod(version.periods, version.seasons, month, w === 1, m);
      }
    }
  }
  tables.set(version, table);
  return table;
}

/** Period index (into `version.periods`) of every instant described by `lt`. */
export function periodIndices(lt: LocalTimes, version: TariffVersion): Int8Array {
  const table = periodTable(version);
  const dayBase = new Int32Array(lt.days.length);
  for (let d = 0; d < lt.days.length; d++) {
    const day = lt.days[d];
    dayBase[d] = ((day.month - 1) * 2 + (isWorkday(day, version.holidays) ? 1 : 0)) * 1440;
  }
  const out = new Int8Array(lt.dayIndex.length);
  for (let i = 0; i < out.length; i++) {
    out[i] = table[dayBase[lt.dayIndex[i]] + lt.minuteOfDay[i]];
  }
  return out;
}

/** Hour of week (0 = Monday 00:00 … 167 = Sunday 23:00, local) of every instant described by `lt`. */
export function hourOfWeek(lt: LocalTimes): Uint8Array {
  const out = new Uint8Array(lt.dayIndex.length);
  for (let i = 0; i < out.length; i++) {
    out[i] = (lt.days[lt.dayIndex[i]].isoWeekday - 1) * 24 + Math.floor(lt.minuteOfDay[i] / 60);
  }
  return out;
}
