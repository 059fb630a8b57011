/** Calendar-day arithmetic on ISO `YYYY-MM-DD` strings (no time zone involved: whole days). */

const DAY_MS = 86_400_000;

function dayNumber(isoDate: string): number {
  const [y, m, d] = isoDate.split("-").map(Number);
  return Date.UTC(y, m - 1, d) / DAY_MS;
}

/** Days from `start` to `end` (end exclusive). @example daysBetween("2024-01-01","2024-02-01") // 31 */
export function daysBetween(start: string, end: string): number {
  return dayNumber(end) - dayNumber(start);
}

/** The date `days` after `isoDate`. @example addDays("2024-02-28", 2) // "2024-03-01" */
export function addDays(isoDate: string, days: number): string {
  return new Date((dayNumber(isoDate) + days) * DAY_MS).toISOString().slice(0, 10);
}

/** Later of two ISO dates. */
export function maxDate(a: string, b: string): string {
  return a > b ? a : b;
}

/** Earlier of two ISO dates. */
export function minDate(a: string, b: string): string {
  return a < b ? a : b;
}

/**
 * The bill's "bill month" as `YYYY-MM`: the month holding the middle day of the service period.
 * @example billMonth("2024-01-15","2024-02-14") // "2024-01" (middle day Jan 30)
 */
export function billMonth(start: string, end: string): string {
  const mid = addDays(start, Math.floor((daysBetween(start, end) - 1) / 2));
  return mid.slice(0, 7);
}
