/**
 * The window-demand loops of src/tariff/demand.ts as they were before they went by runs of
 * equal eligibility (verbatim, commit 4872877), with the window ends made here, uncached: the
 * reference the new loops must match to the bit (test/tariff/windowRuns.test.ts).
 */
import { intervalsPerWindow, type WindowDemand } from "../../../src/tariff/demand.ts";

/**
 * Highest rolling-window average demand, kW.
 *
 * @param startMs interval starts (UTC ms), increasing
 * @param kwh energy per interval in kWh (multiplier applied)
 * @param periodIdx optional period index per interval; with `period`, only windows wholly inside it count
 * @example 15-minute data with a 25 kWh interval and a 15-minute window -> 100 kW
 */
export function formerMaxWindowDemandKw(
  startMs: Float64Array,
  kwh: Float64Array,
  intervalMinutes: number,
  windowMinutes: number,
  periodIdx: Int8Array | null = null,
  period = -1,
): WindowDemand {
  const k = intervalsPerWindow(windowMinutes, intervalMinutes);
  const hours = (k * intervalMinutes) / 60;
  if (periodIdx !== null) return { kw: maxWindowInPeriodKw(startMs, kwh, intervalMinutes, k, periodIdx, period), intervalsPerWindow: k };
  const ends = windowEnds(startMs, intervalMinutes * 60_000, k, null);
  // The highest window sum, divided once: x ↦ x / hours never decreases, so max(sum) / hours is
  // the largest window average, the same number as dividing every sum and keeping the largest.
  let best = -Infinity;
  let sum = 0;
  for (let i = 0; i < kwh.length; i++) {
    sum += kwh[i];
    if (i >= k) sum -= kwh[i - k];
    if (ends[i] === 0 && sum > best) best = sum;
  }
  return { kw: best === -Infinity ? null : best / hours, intervalsPerWindow: k };
}

/** `maxWindowDemandKw` inside one period: windows whose instants span k intervals and all start in `period`. */
function maxWindowInPeriodKw(startMs: Float64Array, kwh: Float64Array, intervalMinutes: number, k: number, periodIdx: Int8Array, period: number): number | null {
  const spanMs = (k - 1) * intervalMinutes * 60_000;
  const hours = (k * intervalMinutes) / 60;
  let best = -Infinity;
  let sum = 0;
  let inside = 0; // intervals of the current window inside the period
  for (let i = 0; i < kwh.length; i++) {
    sum += kwh[i];
    if (periodIdx[i] === period) inside++;
    if (i >= k) {
      sum -= kwh[i - k];
      if (periodIdx[i - k] === period) inside--;
    }
    if (i < k - 1) continue;
    if (startMs[i] - startMs[i - k + 1] !== spanMs) continue;
    if (inside !== k) continue;
    const kw = sum / hours;
    if (kw > best) best = kw;
  }
  return best === -Infinity ? null : best;
}

/**
 * Highest rolling-window average demand inside each period, kW, in one pass: a window counts for
 * period p only when its intervals are contiguous and all start in p.
 *
 * @returns one value per period index; null where no complete window lies inside the period
 * @example periods [0,0,1,1] with 15-minute kWh [5,5,30,30] and a 30-minute window -> [20, 120]
 */
export function formerMaxWindowDemandByPeriodKw(
  startMs: Float64Array,
  kwh: Float64Array,
  intervalMinutes: number,
  windowMinutes: number,
  periodIdx: Int8Array,
  periodCount: number,
): (number | null)[] {
  const k = intervalsPerWindow(windowMinutes, intervalMinutes);
  const hours = (k * intervalMinutes) / 60;
  const ends = windowEnds(startMs, intervalMinutes * 60_000, k, periodIdx);
  const best = new Float64Array(periodCount).fill(-Infinity);
  let sum = 0;
  for (let i = 0; i < kwh.length; i++) {
    sum += kwh[i];
    if (i >= k) sum -= kwh[i - k];
    const p = ends[i];
    if (p >= 0 && sum > best[p]) best[p] = sum;
  }
  return Array.from(best, (b) => (b === -Infinity ? null : b / hours));
}

/**
 * `maxWindowDemandKw` (whole period) and `maxWindowDemandByPeriodKw` together, in one pass: both
 * keep the highest of the same running window sums, so they give the same numbers as the two
 * calls (a tariff with a whole-period and a time-of-use demand charge on the same window).
 * @example periods [0,0,1,1], 15-minute kWh [5,5,30,30], 30-minute window -> { kw: 120, byPeriod: [20, 120] }
 */
export function formerMaxWindowDemandsKw(
  startMs: Float64Array,
  kwh: Float64Array,
  intervalMinutes: number,
  windowMinutes: number,
  periodIdx: Int8Array,
  periodCount: number,
): { whole: WindowDemand; byPeriod: (number | null)[] } {
  const k = intervalsPerWindow(windowMinutes, intervalMinutes);
  const hours = (k * intervalMinutes) / 60;
  const stepMs = intervalMinutes * 60_000;
  const ends = windowEnds(startMs, stepMs, k, null);
  const endsIn = windowEnds(startMs, stepMs, k, periodIdx);
  let best = -Infinity;
  const bestIn = new Float64Array(periodCount).fill(-Infinity);
  let sum = 0;
  for (let i = 0; i < kwh.length; i++) {
    sum += kwh[i];
    if (i >= k) sum -= kwh[i - k];
    if (ends[i] === 0 && sum > best) best = sum;
    const p = endsIn[i];
    if (p >= 0 && sum > bestIn[p]) bestIn[p] = sum;
  }
  return {
    whole: { kw: best === -Infinity ? null : best / hours, intervalsPerWindow: k },
    byPeriod: Array.from(bestIn, (b) => (b === -Infinity ? null : b / hours)),
  };
}

function windowEnds(startMs: Float64Array, stepMs: number, k: number, periodIdx: Int8Array | null): Int8Array {
  return computeWindowEnds(startMs, stepMs, k, periodIdx);
}

function computeWindowEnds(startMs: Float64Array, stepMs: number, k: number, periodIdx: Int8Array | null): Int8Array {
  const n = startMs.length;
  const ends = new Int8Array(n).fill(-1);
  const spanMs = (k - 1) * stepMs;
  let run = 0; // consecutive contiguous intervals in the same period, ending at i
  for (let i = 0; i < n; i++) {
    if (periodIdx === null) {
      if (i >= k - 1 && startMs[i] - startMs[i - k + 1] === spanMs) ends[i] = 0;
    } else {
      run = i > 0 && periodIdx[i] === periodIdx[i - 1] && startMs[i] - startMs[i - 1] === stepMs ? run + 1 : 1;
      if (run >= k) ends[i] = periodIdx[i];
    }
  }
  return ends;
}
