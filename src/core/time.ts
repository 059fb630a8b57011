import { DateTime } from "luxon";

/**
 * Shared time helpers. Bills are half-open local-day periods, so
 * [localMidnightMs(start, zone), localMidnightMs(end, zone)) is exactly a bill's service period,
 * whatever DST does inside it; interval series are sorted UTC instants searched by `lowerBound`.
 */

/**
 * UTC instant (epoch ms) of local midnight starting `isoDate` in `zone`. Luxon applies the zone
 * rules (a midnight that does not exist moves forward).
 * @throws RangeError when the date or zone is invalid.
 * @example localMidnightMs("2024-03-10", "America/New_York") // 2024-03-10T05:00:00Z
 */
export function localMidnightMs(isoDate: string, zone: string): number {
  const key = `${zone}|${isoDate}`;
  const hit = midnightCache.get(key);
  if (hit !== undefined) return hit;
  const dt = DateTime.fromISO(isoDate, { zone }).startOf("day");
  if (!dt.isValid) throw new RangeError(`invalid date '${isoDate}' in zone '${zone}': ${dt.invalidExplanation ?? ""}`);
  // Bills, forecasts and reconciliation ask for the same few thousand midnights again and again.
  if (midnightCache.size >= 100_000) midnightCache.clear();
  midnightCache.set(key, dt.toMillis());
  return dt.toMillis();
}

const midnightCache = new Map<string, number>();

/** First index i with sorted[i] >= value (binary search over a sorted array). */
export function lowerBound(sorted: ArrayLike<number>, value: number): number {
  let lo = 0;
  let hi = sorted.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (sorted[mid]! < value) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/** Whole days from `startIso` to `endIso` (calendar dates; DST does not matter). */
export function daysBetween(startIso: string, endIso: string): number {
  return Math.round((utcDay(endIso) - utcDay(startIso)) / 86_400_000);
}

/** Adds whole days to an ISO date. */
export function addDays(isoDate: string, days: number): string {
  return new Date(utcDay(isoDate) + days * 86_400_000).toISOString().slice(0, 10);
}

function utcDay(isoDate: string): number {
  return Date.UTC(+isoDate.slice(0, 4), +isoDate.slice(5, 7) - 1, +isoDate.slice(8, 10));
}
