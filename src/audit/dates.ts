/** Audit-specific date rules on ISO `YYYY-MM-DD` strings; general calendar arithmetic is src/core/time. */
import { addDays, daysBetween } from "../core/time/index.ts";

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
