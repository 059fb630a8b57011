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
  const best = windowPeaks(kwh, k, ends, null, 0).best;
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
  const best = windowPeaks(kwh, k, null, ends, periodCount).bestIn!;
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
  const peaks = windowPeaks(kwh, k, ends, endsIn, periodCount);
  const best = peaks.best;
  const bestIn = peaks.bestIn!;
  return {
    whole: { kw: best === -Infinity ? null : best / hours, intervalsPerWindow: k },
    byPeriod: Array.from(bestIn, (b) => (b === -Infinity ? null : b / hours)),
  };
}

/**
 * The running window sums of `kwh` (add each reading, take off the one k back) and the highest
 * of them where a window counts: over the whole period (`ends[i] === 0`) and inside each period
 * (`endsIn[i]` = the period). The loop the three functions above shared, the same additions and
 * comparisons in the same order; after the first k readings it goes by runs of equal
 * eligibility (eligibilityRuns), with the current period's highest sum held in a local.
 */
function windowPeaks(kwh: Float64Array, k: number, ends: Int8Array | null, endsIn: Int8Array | null, periodCount: number): { best: number; bestIn: Float64Array | null } {
  let best = -Infinity;
  const bestIn = endsIn !== null ? new Float64Array(periodCount).fill(-Infinity) : null;
  let sum = 0;
  const head = Math.min(k, kwh.length);
  for (let i = 0; i < head; i++) {
    sum += kwh[i]!;
    if (ends !== null && ends[i] === 0 && sum > best) best = sum;
    if (endsIn !== null) {
      const p = endsIn[i]!;
      if (p >= 0 && sum > bestIn![p]!) bestIn![p] = sum;
    }
  }
  const runs = eligibilityRuns(ends, endsIn, head, kwh.length);
  for (let r = 0; r < runs.length; r += 4) {
    const whole = runs[r] === 1;
    const p = runs[r + 1]!;
    const end = runs[r + 3]!;
    let i = runs[r + 2]!;
    if (p >= 0) {
      let bp = bestIn![p]!;
      if (whole) {
        for (; i < end; i++) {
          sum += kwh[i]!;
          sum -= kwh[i - k]!;
          if (sum > best) best = sum;
          if (sum > bp) bp = sum;
        }
      } else {
        for (; i < end; i++) {
          sum += kwh[i]!;
          sum -= kwh[i - k]!;
          if (sum > bp) bp = sum;
        }
      }
      bestIn![p] = bp;
    } else if (whole) {
      for (; i < end; i++) {
        sum += kwh[i]!;
        sum -= kwh[i - k]!;
        if (sum > best) best = sum;
      }
    } else {
      for (; i < end; i++) {
        sum += kwh[i]!;
        sum -= kwh[i - k]!;
      }
    }
  }
  return { best, bestIn };
}

/*
 * Runs of equal eligibility from index `from` to `n`: [whole (1 when ends[i] === 0), period
 * (endsIn[i], −1 without), first, end) quadruples. They depend on the ends arrays alone, which
 * are made once per instants (windowEnds), so the runs are kept with them, weakly.
 */
const runsByEnds = new WeakMap<Int8Array, { other: Int8Array | null; from: number; n: number; runs: Int32Array }[]>();

function eligibilityRuns(ends: Int8Array | null, endsIn: Int8Array | null, from: number, n: number): Int32Array {
  // Kept with the per-period array when there is one (it lives no longer than the whole-period one).
  const key = endsIn ?? ends;
  if (key === null) return Int32Array.of(0, -1, from, n);
  const other = endsIn === null ? null : ends;
  let list = runsByEnds.get(key);
  if (list === undefined) runsByEnds.set(key, (list = []));
  for (const e of list) if (e.other === other && e.from === from && e.n === n) return e.runs;
  const out: number[] = [];
  const wholeAt = (i: number) => (ends !== null && ends[i] === 0 ? 1 : 0);
  const periodAt = (i: number) => (endsIn !== null ? endsIn[i]! : -1);
  for (let i = from; i < n; ) {
    const w = wholeAt(i);
    const p = periodAt(i);
    let j = i + 1;
    while (j < n && wholeAt(j) === w && periodAt(j) === p) j++;
    out.push(w, p, i, j);
    i = j;
  }
  const runs = Int32Array.from(out);
  list.push({ other, from, n, runs });
  return runs;
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
