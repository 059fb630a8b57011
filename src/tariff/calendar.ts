/**
 * Local calendar for time-of-use pricing: which local day, month and minute each instant falls
 * on in the tariff's zone, and which period applies. Luxon is consulted once per local day (and
 * per instant only on the two DST-change days of a year); everything else is array lookups, so
 * a month of 15-minute data costs a few dozen time-zone conversions, not thousands.
 */
import { DateTime, IANAZone } from "luxon";
import { PricingError } from "./errors.ts";
import { usFederalHolidays } from "./holidays.ts";
import type { HolidayRule, Period, Season, TariffVersion } from "./model.ts";

export interface LocalDay {
  /** Local date `YYYY-MM-DD`. */
  date: string;
  /** 1 = January. */
  month: number;
  /** 1 = Monday … 7 = Sunday. */
  isoWeekday: number;
  startMs: number;
  endMs: number;
}

export interface LocalTimes {
  /** Index into `days` for every instant. */
  dayIndex: Int32Array;
  /** Minutes after local midnight (wall clock) for every instant. */
  minuteOfDay: Int16Array;
  days: LocalDay[];
}

const DAY_MS = 86_400_000;

/** Throws a PricingError unless `zone` is an IANA zone name Luxon knows. */
export function assertZone(zone: string): void {
  if (!IANAZone.isValidZone(zone)) {
    throw new PricingError(`unknown time zone '${zone}' (use an IANA name such as America/New_York or UTC)`);
  }
}

/** UTC instant (ms) of local midnight starting `date` in `zone`. */
export function localMidnightMs(date: string, zone: string): number {
  assertZone(zone);
  return DateTime.fromISO(date, { zone }).startOf("day").toMillis();
}

function dayOf(t: number, zone: string): LocalDay {
  const local = DateTime.fromMillis(t, { zone });
  const start = local.startOf("day");
  const next = start.plus({ days: 1 }).startOf("day");
  return {
    date: start.toISODate() as string,
    month: start.month,
    isoWeekday: start.weekday,
    startMs: start.toMillis(),
    endMs: next.toMillis(),
  };
}

/**
 * Local day and wall-clock minute of each instant. Instants should be sorted (then one Luxon
 * call per day); unsorted input is still correct, only slower.
 */
export function localTimes(startMs: Float64Array, zone: string): LocalTimes {
  assertZone(zone);
  const n = startMs.length;
  const dayIndex = new Int32Array(n);
  const minuteOfDay = new Int16Array(n);
  const days: LocalDay[] = [];
  const byDate = new Map<string, number>();
  let cur: LocalDay | null = null;
  let curIdx = -1;
  let regular = true;
  for (let i = 0; i < n; i++) {
    const t = startMs[i];
    if (cur === null || t < cur.startMs || t >= cur.endMs) {
      const day = dayOf(t, zone);
      let idx = byDate.get(day.date);
      if (idx === undefined) {
        idx = days.length;
        days.push(day);
        byDate.set(day.date, idx);
      }
      cur = days[idx];
      curIdx = idx;
      regular = cur.endMs - cur.startMs === DAY_MS;
    }
    dayIndex[i] = curIdx;
    if (regular) {
      minuteOfDay[i] = Math.floor((t - cur.startMs) / 60_000);
    } else {
      // A 23- or 25-hour day: the wall clock jumps, so ask Luxon for this instant.
      const local = DateTime.fromMillis(t, { zone });
      minuteOfDay[i] = local.hour * 60 + local.minute;
    }
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
