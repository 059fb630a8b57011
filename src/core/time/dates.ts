/**
 * Calendar-date arithmetic on ISO dates (`YYYY-MM-DD`) with no zone: a bill's dates are
 * calendar days, so DST does not enter. Day numbers count days since 1970-01-01.
 */

/** Whole days from `startIso` to `endIso` (calendar dates; DST does not matter). */
import { TimeInputError } from "../errors.ts";
export function daysBetween(startIso: string, endIso: string): number {
  return Math.round((utcDay(endIso) - utcDay(startIso)) / 86_400_000);
}

/** Adds whole days to an ISO date. */
export function addDays(isoDate: string, days: number): string {
  return new Date(utcDay(isoDate) + days * 86_400_000).toISOString().slice(0, 10);
}

/** Two-digit zero padding for dates and times. @example pad2(7) // "07" */
export function pad2(n: number): string {
  return String(n).padStart(2, "0");
}

function utcDay(isoDate: string): number {
  return Date.UTC(+isoDate.slice(0, 4), +isoDate.slice(5, 7) - 1, +isoDate.slice(8, 10));
}

/** Days since 1970-01-01 of an ISO calendar date. @throws TimeInputError on a malformed date. */
export function isoDateToDayNumber(isoDate: string): number {
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(isoDate);
  if (!m) throw new TimeInputError(`not an ISO date (YYYY-MM-DD): ${isoDate}`);
  return Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3])) / 86_400_000;
}

/** ISO calendar date of a day number (inverse of {@link isoDateToDayNumber}). */
export function dayNumberToIsoDate(day: number): string {
  return new Date(day * 86_400_000).toISOString().slice(0, 10);
}

/** True when `s` is a real calendar date written `YYYY-MM-DD` (so 2025-02-30 is not). */
export function isIsoDate(s: string): boolean {
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(s);
  if (!m) return false;
  const d = new Date(Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3])));
  return d.getUTCFullYear() === Number(m[1]) && d.getUTCMonth() === Number(m[2]) - 1 && d.getUTCDate() === Number(m[3]);
}
