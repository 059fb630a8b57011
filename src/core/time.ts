import { DateTime } from "luxon";

/**
 * UTC instant (epoch ms) of local midnight starting `isoDate` in `zone`.
 * Bills are half-open local-day periods, so [startOfLocalDayMs(start), startOfLocalDayMs(end))
 * is exactly the bill's service period, whatever DST does inside it.
 */
export function startOfLocalDayMs(isoDate: string, zone: string): number {
  const dt = DateTime.fromISO(isoDate, { zone }).startOf("day");
  if (!dt.isValid) throw new RangeError(`invalid date '${isoDate}' in zone '${zone}'`);
  return dt.toMillis();
}

/** Whole days from `startIso` to `endIso` (calendar dates; DST does not matter). */
export function daysBetween(startIso: string, endIso: string): number {
  const a = Date.UTC(+startIso.slice(0, 4), +startIso.slice(5, 7) - 1, +startIso.slice(8, 10));
  const b = Date.UTC(+endIso.slice(0, 4), +endIso.slice(5, 7) - 1, +endIso.slice(8, 10));
  return Math.round((b - a) / 86_400_000);
}

/** Adds whole days to an ISO date. */
export function addDays(isoDate: string, days: number): string {
  const t = Date.UTC(+isoDate.slice(0, 4), +isoDate.slice(5, 7) - 1, +isoDate.slice(8, 10)) + days * 86_400_000;
  return new Date(t).toISOString().slice(0, 10);
}
