/**
 * Local-time calendars for the demo: every local day of the simulated span in one IANA zone,
 * and a 15-minute UTC grid whose intervals know their local day and clock minute. DST days
 * therefore have 92 or 100 intervals, exactly as an interval meter records them.
 */
import { DateTime } from "luxon";

export const INTERVAL_MS = 15 * 60 * 1000;

export interface LocalDay {
  /** `YYYY-MM-DD` in the zone. */
  date: string;
  year: number;
  /** 1..12 */
  month: number;
  /** 1 = Monday … 7 = Sunday (ISO). */
  weekday: number;
  /** Day of year, 1-based. */
  dayOfYear: number;
  /** UTC epoch ms of local midnight. */
  midnightMs: number;
  /** Index of the first 15-minute interval of this day in the zone grid. */
  firstInterval: number;
  /** 96 normally, 92 on the spring DST day, 100 on the autumn one. */
  intervalCount: number;
  holiday: boolean;
}

export interface ZoneCalendar {
  zone: string;
  days: LocalDay[];
  /** Index of a date string in `days`. */
  dayIndex: Map<string, number>;
  /** 15-minute interval starts, UTC epoch ms. */
  startMs: Float64Array;
  /** Day index of each interval. */
  intervalDay: Int32Array;
  /** Local wall-clock minute of the day of each interval (repeats in the autumn DST hour). */
  clockMinute: Int16Array;
  /** UTC offset in minutes of each interval (e.g. -300 for EST). */
  offsetMinutes: Int16Array;
}

/**
 * Builds the calendar of `zone` for local dates [firstDate, endDate).
 * @example buildZoneCalendar("America/Chicago", "2024-11-03", "2024-11-04", new Set()).days[0].intervalCount // 100
 */
export function buildZoneCalendar(
  zone: string,
  firstDate: string,
  endDate: string,
  holidays: ReadonlySet<string>,
): ZoneCalendar {
  const days: LocalDay[] = [];
  let day = DateTime.fromISO(firstDate, { zone });
  const stop = DateTime.fromISO(endDate, { zone });
  let intervalTotal = 0;
  while (day < stop) {
    const next = day.plus({ days: 1 });
    const count = Math.round((next.toMillis() - day.toMillis()) / INTERVAL_MS);
    const date = day.toISODate() as string;
    days.push({
      date,
      year: day.year,
      month: day.month,
      weekday: day.weekday,
      dayOfYear: day.ordinal,
      midnightMs: day.toMillis(),
      firstInterval: intervalTotal,
      intervalCount: count,
      holiday: holidays.has(date),
    });
    intervalTotal += count;
    day = next;
  }
  const startMs = new Float64Array(intervalTotal);
  const intervalDay = new Int32Array(intervalTotal);
  const clockMinute = new Int16Array(intervalTotal);
  const offsetMinutes = new Int16Array(intervalTotal);
  days.forEach((d, di) => {
    const midnightOffset = DateTime.fromMillis(d.midnightMs, { zone }).offset;
    const endOffset = DateTime.fromMillis(d.midnightMs + d.intervalCount * INTERVAL_MS - 1, { zone }).offset;
    for (let k = 0; k < d.intervalCount; k++) {
      const i = d.firstInterval + k;
      const ms = d.midnightMs + k * INTERVAL_MS;
      // Only DST days need a per-interval zone lookup; other days keep midnight's offset.
      const offset = midnightOffset === endOffset ? midnightOffset : DateTime.fromMillis(ms, { zone }).offset;
      startMs[i] = ms;
      intervalDay[i] = di;
      offsetMinutes[i] = offset;
      clockMinute[i] = Math.round((ms + offset * 60000 - (d.midnightMs + midnightOffset * 60000)) / 60000);
    }
  });
  const dayIndex = new Map(days.map((d, i) => [d.date, i] as const));
  return { zone, days, dayIndex, startMs, intervalDay, clockMinute, offsetMinutes };
}

/** Adds whole days to an ISO date (calendar arithmetic, no zone). */
export function addDays(date: string, n: number): string {
  return DateTime.fromISO(date, { zone: "UTC" }).plus({ days: n }).toISODate() as string;
}

/** Whole days from `a` to `b` (b − a). */
export function daysBetween(a: string, b: string): number {
  return Math.round(
    (DateTime.fromISO(b, { zone: "UTC" }).toMillis() - DateTime.fromISO(a, { zone: "UTC" }).toMillis()) / 86400000,
  );
}

/** ISO weekday (1 = Monday) of a date. */
export function weekdayOf(date: string): number {
  return DateTime.fromISO(date, { zone: "UTC" }).weekday;
}

/** Formats local wall time with its UTC offset, e.g. `2025-03-09T03:00:00-05:00`. */
export function formatLocalWithOffset(date: string, clockMinute: number, offsetMinutes: number): string {
  return `${formatLocalClock(date, clockMinute)}${formatOffset(offsetMinutes)}`;
}

/** Formats local wall time without offset, e.g. `2024-11-03T01:15:00`. */
export function formatLocalClock(date: string, clockMinute: number): string {
  const h = Math.floor(clockMinute / 60);
  const m = clockMinute % 60;
  return `${date}T${pad2(h)}:${pad2(m)}:00`;
}

function formatOffset(offsetMinutes: number): string {
  const sign = offsetMinutes < 0 ? "-" : "+";
  const abs = Math.abs(offsetMinutes);
  return `${sign}${pad2(Math.floor(abs / 60))}:${pad2(abs % 60)}`;
}

function pad2(n: number): string {
  return n < 10 ? `0${n}` : String(n);
}

/**
 * U.S. federal holidays (5 U.S.C. 6103) as observed: Saturday → Friday, Sunday → Monday.
 * Used only to shape occupancy in the demo; the tariff engine keeps its own list.
 * @example usFederalHolidays(2025).includes("2025-07-04") // true
 */
export function usFederalHolidays(year: number): string[] {
  const fixed = (m: number, d: number) => observe(DateTime.fromObject({ year, month: m, day: d }, { zone: "UTC" }));
  const nth = (m: number, weekday: number, n: number) => {
    let d = DateTime.fromObject({ year, month: m, day: 1 }, { zone: "UTC" });
    while (d.weekday !== weekday) d = d.plus({ days: 1 });
    return d.plus({ weeks: n - 1 });
  };
  const last = (m: number, weekday: number) => {
    let d = DateTime.fromObject({ year, month: m, day: 1 }, { zone: "UTC" }).endOf("month").startOf("day");
    while (d.weekday !== weekday) d = d.minus({ days: 1 });
    return d;
  };
  const days = [
    fixed(1, 1),
    nth(1, 1, 3),
    nth(2, 1, 3),
    last(5, 1),
    fixed(6, 19),
    fixed(7, 4),
    nth(9, 1, 1),
    nth(10, 1, 2),
    fixed(11, 11),
    nth(11, 4, 4),
    fixed(12, 25),
  ];
  return days.map((d) => d.toISODate() as string);
}

function observe(d: DateTime): DateTime {
  if (d.weekday === 6) return d.minus({ days: 1 });
  if (d.weekday === 7) return d.plus({ days: 1 });
  return d;
}
