/**
 * U.S. federal holidays as observed, per 5 U.S.C. 6103: New Year's Day (Jan 1), Birthday of
 * Martin Luther King Jr. (3rd Monday of January, from 1986), Washington's Birthday (3rd Monday
 * of February), Memorial Day (last Monday of May), Juneteenth (June 19, from 2021),
 * Independence Day (July 4), Labor Day (1st Monday of September), Columbus Day (2nd Monday of
 * October), Veterans Day (Nov 11), Thanksgiving (4th Thursday of November), Christmas (Dec 25).
 * A fixed-date holiday on a Saturday is observed the Friday before, on a Sunday the Monday after
 * (Executive Order 11582 as applied under 6103(b)). The Monday rules date from 1971; earlier
 * years are computed with today's rules.
 */

const cache = new Map<number, ReadonlySet<string>>();

function iso(year: number, month: number, day: number): string {
  return `${year}-${String(month).padStart(2, "0")}-${String(day).padStart(2, "0")}`;
}

/** Day of week, 0 = Sunday … 6 = Saturday, for a proleptic Gregorian date. */
function weekday(year: number, month: number, day: number): number {
  return new Date(Date.UTC(year, month - 1, day)).getUTCDay();
}

/** Day of month of the n-th given weekday (0 = Sunday) of a month; n = -1 for the last one. */
function nthWeekday(year: number, month: number, dow: number, n: number): number {
  if (n > 0) {
    const first = weekday(year, month, 1);
    return 1 + ((dow - first + 7) % 7) + (n - 1) * 7;
  }
  const lastDay = new Date(Date.UTC(year, month, 0)).getUTCDate();
  const last = weekday(year, month, lastDay);
  return lastDay - ((last - dow + 7) % 7);
}

/** Observed date of a fixed-date holiday: Saturday -> Friday before, Sunday -> Monday after. */
function observed(year: number, month: number, day: number): string {
  const dow = weekday(year, month, day);
  const shift = dow === 6 ? -1 : dow === 0 ? 1 : 0;
  const d = new Date(Date.UTC(year, month - 1, day + shift));
  return iso(d.getUTCFullYear(), d.getUTCMonth() + 1, d.getUTCDate());
}

/**
 * Observed U.S. federal holidays falling in calendar year `year` (local dates, `YYYY-MM-DD`).
 * Includes Dec 31 when the next New Year's Day is a Saturday.
 *
 * @example usFederalHolidays(2021).has("2021-12-31") // true (New Year's Day 2022 is a Saturday)
 */
export function usFederalHolidays(year: number): ReadonlySet<string> {
  const hit = cache.get(year);
  if (hit) return hit;
  const dates: string[] = [];
  for (const y of [year, year + 1]) {
    dates.push(observed(y, 1, 1));
  }
  if (year >= 1986) dates.push(iso(year, 1, nthWeekday(year, 1, 1, 3)));
  dates.push(iso(year, 2, nthWeekday(year, 2, 1, 3)));
  dates.push(iso(year, 5, nthWeekday(year, 5, 1, -1)));
  if (year >= 2021) dates.push(observed(year, 6, 19));
  dates.push(observed(year, 7, 4));
  dates.push(iso(year, 9, nthWeekday(year, 9, 1, 1)));
  dates.push(iso(year, 10, nthWeekday(year, 10, 1, 2)));
  dates.push(observed(year, 11, 11));
  dates.push(iso(year, 11, nthWeekday(year, 11, 4, 4)));
  dates.push(observed(year, 12, 25));
  const set = new Set(dates.filter((d) => d.startsWith(`${year}-`)));
  cache.set(year, set);
  return set;
}

/** True when the local date `YYYY-MM-DD` is an observed U.S. federal holiday. */
export function isUsFederalHoliday(date: string): boolean {
  return usFederalHolidays(Number(date.slice(0, 4))).has(date);
}
