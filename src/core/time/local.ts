/**
 * UTC instant → local wall clock in an IANA zone: local days, months, minutes and hour of week.
 * Every folder converts instants to local time through this module (see zone.ts for offsets).
 * On a 25-hour day the repeated hour gets the same wall-clock minutes twice; on a 23-hour day
 * the skipped hour never appears.
 */
import { assertValidZone, offsetAtMs, offsetSegments } from "./zone.ts";

const DAY_MS = 86_400_000;

export interface LocalDay {
  /** Local date `YYYY-MM-DD`. */
  date: string;
  year: number;
  /** 1 = January. */
  month: number;
  /** Day of month, 1–31. */
  day: number;
  /** 1 = Monday … 7 = Sunday. */
  isoWeekday: number;
  /** 1 = January 1st. */
  dayOfYear: number;
}

/** A local day with the wall-clock time of one instant. */
export interface LocalParts extends LocalDay {
  hour: number;
  minute: number;
}

export interface LocalTimes {
  /** Index into `days` for every instant. */
  dayIndex: Int32Array;
  /** Minutes after local midnight (wall clock) for every instant. */
  minuteOfDay: Int16Array;
  days: LocalDay[];
}

const CUMULATIVE_DAYS = [0, 31, 59, 90, 120, 151, 181, 212, 243, 273, 304, 334];

/** Civil date of a day number (days since 1970-01-01), after H. Hinnant's days_from_civil inverse. */
export function civilDay(dayNum: number): LocalDay {
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
  const leap = (y % 4 === 0 && y % 100 !== 0) || y % 400 === 0;
  const dayOfYear = CUMULATIVE_DAYS[m - 1]! + d + (leap && m > 2 ? 1 : 0);
  const date = `${String(y).padStart(4, "0")}-${String(m).padStart(2, "0")}-${String(d).padStart(2, "0")}`;
  return { date, year: y, month: m, day: d, isoWeekday, dayOfYear };
}

/**
 * Local wall-clock time of an instant as epoch-style ms (instant + the zone's UTC offset), so
 * `Math.floor(local / 86_400_000)` is the local day number and `local % 86_400_000` the time of day.
 * @throws TimeInputError on an unknown zone.
 */
export function localMs(instantMs: number, zone: string): number {
  return instantMs + offsetAtMs(zone, instantMs);
}

/**
 * Local wall-clock ms of each instant (see {@link localMs}). Schedules follow the local clock,
 * so comparing "the same hour on other days" must too, or every DST change would move a
 * building's nights by an hour. Without a zone (undefined), the instants are returned as UTC.
 * @throws TimeInputError on an unknown zone.
 * @example localClockMs([Date.UTC(2025, 5, 2, 12)], "America/New_York")[0] === Date.UTC(2025, 5, 2, 8)
 */
export function localClockMs(startMs: ArrayLike<number>, zone?: string): Float64Array {
  const out = Float64Array.from(startMs);
  if (zone === undefined || out.length === 0) return out;
  assertValidZone(zone);
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < out.length; i++) {
    if (out[i]! < lo) lo = out[i]!;
    if (out[i]! > hi) hi = out[i]!;
  }
  if (!Number.isFinite(lo)) {
    for (let i = 0; i < out.length; i++) if (Number.isFinite(out[i]!)) out[i] = localMs(out[i]!, zone);
    return out;
  }
  const segs = offsetSegments(zone, lo, hi);
  let seg = 0;
  for (let i = 0; i < out.length; i++) {
    const t = out[i]!;
    if (!Number.isFinite(t)) continue;
    if (t < segs[seg]!.startMs) seg = 0; // unsorted input: restart the scan
    while (seg + 1 < segs.length && t >= segs[seg + 1]!.startMs) seg++;
    out[i] = t + segs[seg]!.offsetMs;
  }
  return out;
}

/**
 * Local date and wall-clock time of one instant.
 * @throws TimeInputError on an unknown zone.
 * @example localPartsOf(Date.UTC(2025, 0, 1, 6), "America/Chicago") // { date: "2025-01-01", hour: 0, … }
 */
export function localPartsOf(instantMs: number, zone: string): LocalParts {
  const local = localMs(instantMs, zone);
  const dayNum = Math.floor(local / DAY_MS);
  const minute = Math.floor((local - dayNum * DAY_MS) / 60_000);
  return { ...civilDay(dayNum), hour: Math.floor(minute / 60), minute: minute % 60 };
}

/** Local calendar date `YYYY-MM-DD` of an instant. @throws TimeInputError on an unknown zone. */
export function localDateOf(instantMs: number, zone: string): string {
  return civilDay(Math.floor(localMs(instantMs, zone) / DAY_MS)).date;
}

/**
 * Local day and wall-clock minute of each instant in `zone`, with each local day described once.
 * @throws TimeInputError on an unknown zone.
 */
export function localTimes(startMs: ArrayLike<number>, zone: string): LocalTimes {
  assertValidZone(zone);
  const n = startMs.length;
  const dayIndex = new Int32Array(n);
  const minuteOfDay = new Int16Array(n);
  const days: LocalDay[] = [];
  if (n === 0) return { dayIndex, minuteOfDay, days };
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < n; i++) {
    if (startMs[i]! < lo) lo = startMs[i]!;
    if (startMs[i]! > hi) hi = startMs[i]!;
  }
  const segs = offsetSegments(zone, lo, hi);
  const byDay = new Map<number, number>();
  let seg = 0;
  let lastDayNum = Number.NaN;
  let lastIdx = -1;
  for (let i = 0; i < n; i++) {
    const t = startMs[i]!;
    if (t < segs[seg]!.startMs) seg = 0; // unsorted input: restart the scan
    while (seg + 1 < segs.length && t >= segs[seg + 1]!.startMs) seg++;
    const local = t + segs[seg]!.offsetMs;
    const dayNum = Math.floor(local / DAY_MS);
    if (dayNum !== lastDayNum) {
      let idx = byDay.get(dayNum);
      if (idx === undefined) {
        idx = days.length;
        days.push(civilDay(dayNum));
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

/** Hour of week (0 = Monday 00:00 … 167 = Sunday 23:00, local) of every instant described by `lt`. */
export function hoursOfWeek(lt: LocalTimes): Uint8Array {
  const out = new Uint8Array(lt.dayIndex.length);
  for (let i = 0; i < out.length; i++) {
    out[i] = (lt.days[lt.dayIndex[i]!]!.isoWeekday - 1) * 24 + Math.floor(lt.minuteOfDay[i]! / 60);
  }
  return out;
}

/**
 * Index of the interval of the local week containing an instant: Monday 00:00 local starts
 * interval 0. With 60-minute intervals this is the hour of week 0 … 167.
 * @throws TimeInputError on an unknown zone; RangeError on a non-finite instant or an interval that does not divide a day.
 * @example intervalOfWeek(Date.UTC(2024, 0, 1, 14), "America/New_York") // Monday 09:00 EST → 9
 */
export function intervalOfWeek(utcMs: number, zone: string, intervalMinutes = 60): number {
  if (!Number.isFinite(utcMs)) throw new RangeError(`instant must be a finite epoch time, got ${utcMs}`);
  if (!(Number.isInteger(intervalMinutes) && intervalMinutes > 0 && 1440 % intervalMinutes === 0)) {
    throw new RangeError(`interval must be a whole number of minutes dividing a day, got ${intervalMinutes}`);
  }
  const local = localMs(utcMs, zone);
  const dayNum = Math.floor(local / DAY_MS);
  const isoWeekday = ((((dayNum + 3) % 7) + 7) % 7) + 1;
  const minuteOfWeek = (isoWeekday - 1) * 1440 + Math.floor((local - dayNum * DAY_MS) / 60_000);
  return Math.floor(minuteOfWeek / intervalMinutes);
}

/** Hour of the local week, 0 (Monday 00:00–00:59) … 167. See {@link intervalOfWeek}. */
export function hourOfWeek(utcMs: number, zone: string): number {
  return intervalOfWeek(utcMs, zone, 60);
}
