/**
 * Time-of-use periods: which period of a tariff version applies to each instant, from the
 * local day and wall-clock minute that src/core/time's `localTimes` gives (a few dozen zone
 * look-ups per month of 15-minute data, then plain arithmetic).
 */
import { PricingError } from "./errors.ts";
import type { HolidayRule, Period, Season, TariffVersion } from "./model.ts";
import { isValidZone, usFederalHolidays, localMidnightMs as coreLocalMidnightMs, type LocalDay, type LocalTimes } from "../core/time/index.ts";

/** Throws a PricingError unless `zone` is an IANA zone name. */
export function assertZone(zone: string): void {
  if (!isValidZone(zone)) {
    throw new PricingError(`unknown time zone '${zone}' (use an IANA name such as America/New_York or UTC)`);
  }
}

/**
 * UTC instant (ms) of local midnight starting `date` in `zone`: the shared, cached helper of
 * src/core/time, after the zone check that turns a bad zone into a PricingError.
 */
export function localMidnightMs(date: string, zone: string): number {
  assertZone(zone);
  return coreLocalMidnightMs(date, zone);
}

/** True when the local date is a working day under the rule: Monday–Friday and not a holiday. */
function isWorkday(day: LocalDay, holidays: HolidayRule): boolean {
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
function periodTable(version: TariffVersion): Int8Array {
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

const indicesByTimes = new WeakMap<LocalTimes, WeakMap<TariffVersion, Int8Array>>();

/**
 * Period index (into `version.periods`) of every instant described by `lt`; cached per (local
 * times, version), as the same month is priced once per forecast scenario. Callers must not mutate it.
 */
export function periodIndices(lt: LocalTimes, version: TariffVersion): Int8Array {
  let byVersion = indicesByTimes.get(lt);
  if (byVersion === undefined) indicesByTimes.set(lt, (byVersion = new WeakMap()));
  let out = byVersion.get(version);
  if (out === undefined) byVersion.set(version, (out = computePeriodIndices(lt, version)));
  return out;
}

function computePeriodIndices(lt: LocalTimes, version: TariffVersion): Int8Array {
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
