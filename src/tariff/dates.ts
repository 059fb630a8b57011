/** Plain calendar-date arithmetic on `YYYY-MM-DD` strings (no time zone involved). */

const ISO_DATE = /^(\d{4})-(\d{2})-(\d{2})$/;

/** True when `s` is a real calendar date written `YYYY-MM-DD`. */
export function isIsoDate(s: string): boolean {
  const m = ISO_DATE.exec(s);
  if (!m) return false;
  const d = new Date(Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3])));
  return d.getUTCFullYear() === Number(m[1]) && d.getUTCMonth() === Number(m[2]) - 1 && d.getUTCDate() === Number(m[3]);
}

/** Day number since 1970-01-01 of a `YYYY-MM-DD` date. */
export function dayNumber(date: string): number {
  return Date.UTC(Number(date.slice(0, 4)), Number(date.slice(5, 7)) - 1, Number(date.slice(8, 10))) / 86_400_000;
}

/** Whole-day differences and additions are shared with the other stages. */
export { addDays, daysBetween } from "../core/time.ts";
