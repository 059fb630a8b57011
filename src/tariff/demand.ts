/**
 * Maximum demand from interval energy (common practice; tariffs differ): each interval's
 * average power is kW = kWh × 60 / interval minutes, and billing demand is the highest
 * average over any `window_minutes` of consecutive intervals. A window is counted only when
 * its intervals are contiguous (no gap in the data) and, for a period demand, when all of them
 * start inside that period.
 */
import { PricingError } from "./errors.ts";

export interface WindowDemand {
  /** Highest window average in kW, or null when no complete window exists. */
  kw: number | null;
  /** Intervals per window actually used. */
  intervalsPerWindow: number;
}

/**
 * Number of intervals in a demand window. A window shorter than one interval uses one interval
 * (the finest the data can say).
 *
 * @throws PricingError when the window is longer than an interval but not a whole multiple of it.
 */
export function intervalsPerWindow(windowMinutes: number, intervalMinutes: number): number {
  if (windowMinutes <= intervalMinutes) return 1;
  const k = windowMinutes / intervalMinutes;
  if (!Number.isInteger(k)) {
    throw new PricingError(
      `a ${windowMinutes}-minute demand window is not a whole number of ${intervalMinutes}-minute intervals`,
    );
  }
  return k;
}

/**
 * Highest rolling-window average demand, kW.
 *
 * @param startMs interval starts (UTC ms), increasing
 * @param kwh energy per interval in kWh (multiplier applied)
 * @param periodIdx optional period index per interval; with `period`, only windows wholly inside it count
 * @example 15-minute data with a 25 kWh interval and a 15-minute window -> 100 kW
 */
export function maxWindowDemandKw(
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
export function maxWindowDemandByPeriodKw(
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
export function maxWindowDemandsKw(
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

/*
 * Which windows count depends only on the instants, the window and the periods, not on the
 * readings: a forecast prices the same month's instants hundreds of times with scaled readings,
 * so the answer is kept per instants array (and periods array). Neither array is mutated by the
 * pricing code once made (context.ts shares the instants' local times the same way).
 */
const endsWithoutPeriods = new WeakMap<ArrayBufferLike, Map<string, Int8Array>>();
/*
 * With periods, kept per periods array (each pricing state makes its own), so an entry lives as
 * long as that array and no longer: keyed by the instants' buffer instead, the entries of every
 * state that ever priced a slice of a meter's series stayed alive with the series (measured:
 * +1.5 GB in the forecast of a 1,000-building portfolio).
 */
const endsWithPeriods = new WeakMap<Int8Array, { startMs: Float64Array; key: string; ends: Int8Array }[]>();

/**
 * For each i, whether a window of `k` intervals ending at i counts: −1 when it does not (fewer
 * than k intervals so far, a gap in time, or — with periods — intervals in different periods),
 * else the window's period index (0 without periods).
 */
function windowEnds(startMs: Float64Array, stepMs: number, k: number, periodIdx: Int8Array | null): Int8Array {
  const key = `${startMs.byteOffset}|${startMs.length}|${stepMs}|${k}`;
  if (periodIdx === null) {
    let byKey = endsWithoutPeriods.get(startMs.buffer);
    if (byKey === undefined) endsWithoutPeriods.set(startMs.buffer, (byKey = new Map()));
    let ends = byKey.get(key);
    if (ends === undefined) byKey.set(key, (ends = computeWindowEnds(startMs, stepMs, k, null)));
    return ends;
  }
  let list = endsWithPeriods.get(periodIdx);
  if (list === undefined) endsWithPeriods.set(periodIdx, (list = []));
  for (const e of list) if (e.key === key && e.startMs.buffer === startMs.buffer) return e.ends;
  const ends = computeWindowEnds(startMs, stepMs, k, periodIdx);
  list.push({ startMs, key, ends });
  return ends;
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

/**
 * Billing demand after a ratchet and a minimum: max(measured, percent/100 × highest of the last
 * `months` previous billing demands, minimumKw).
 *
 * @example billingDemandKw(300, [500, 400], { percent: 80, months: 11 }, 10) // 400
 */
export function billingDemandKw(
  measuredKw: number,
  previousBillingDemandsKw: readonly number[],
  ratchet: { percent: number; months: number } | null,
  minimumKw: number | null,
): { kw: number; by: "measured" | "ratchet" | "minimum"; ratchetKw: number | null } {
  let kw = measuredKw;
  let by: "measured" | "ratchet" | "minimum" = "measured";
  let ratchetKw: number | null = null;
  if (ratchet !== null && previousBillingDemandsKw.length > 0) {
    const recent = previousBillingDemandsKw.slice(-ratchet.months);
    ratchetKw = (Math.max(...recent) * ratchet.percent) / 100;
    if (ratchetKw > kw) {
      kw = ratchetKw;
      by = "ratchet";
    }
  }
  if (minimumKw !== null && minimumKw > kw) {
    kw = minimumKw;
    by = "minimum";
  }
  return { kw, by, ratchetKw };
}
