/**
 * How likely a run of equal readings is by chance, on the meter's own history: at each hour of
 * the week, how often a reading equals the one before (given the one before is in the same
 * state: zero, or non-zero). A meter reading in 0.02 kWh steps on a quiet night repeats itself
 * most of the time, so four equal hours are ordinary there; in a busy afternoon they are not.
 */
import type { IntervalSeries } from "../../domain/types.ts";
import { followsDirectly } from "./seriesGrid.ts";

/**
 * Counts per (week, slot), flattened as week × slots + slot. A reading belongs to its own slot
 * and week. `readings`: finite readings; `inState`: of them in the state. `pairs`/`repeats`:
 * adjacent finite pairs whose earlier reading is in the state / of them, equal. `runs`/`stays`:
 * readings whose two predecessors are equal and in the state (already a repeat) / of them, also
 * equal to the one before.
 */
export interface RepeatCounts {
  slotOf: Int32Array;
  weekOf: Int32Array;
  slots: number;
  weeks: number;
  readings: Float64Array;
  inState: Float64Array;
  pairs: Float64Array;
  repeats: Float64Array;
  runs: Float64Array;
  stays: Float64Array;
}

/**
 * Counts readings, pairs and repeats per slot (`slotOf[i]` in 0 … slots − 1) and week
 * (`weekOf[i]`, 0 … weeks − 1) for `logChanceOfRun`.
 */
export function repeatCounts(
  series: IntervalSeries,
  slotOf: Int32Array,
  slots: number,
  weekOf: Int32Array,
  inState: (i: number) => boolean,
): RepeatCounts {
  const v = series.values;
  let weeks = 1;
  for (let i = 0; i < weekOf.length; i++) weeks = Math.max(weeks, weekOf[i]! + 1);
  const size = weeks * slots;
  const c = {
    readings: new Float64Array(size),
    inState: new Float64Array(size),
    pairs: new Float64Array(size),
    repeats: new Float64Array(size),
    runs: new Float64Array(size),
    stays: new Float64Array(size),
  };
  const linked = (i: number): boolean =>
    i > 0 && followsDirectly(series, i) && Number.isFinite(v[i - 1]!) && inState(i - 1);
  for (let i = 0; i < v.length; i++) {
    if (!Number.isFinite(v[i]!)) continue;
    const g = weekOf[i]! * slots + slotOf[i]!;
    c.readings[g]++;
    if (inState(i)) c.inState[g]++;
    if (!linked(i)) continue;
    c.pairs[g]++;
    const same = v[i] === v[i - 1];
    if (same) c.repeats[g]++;
    if (linked(i - 1) && v[i - 1] === v[i - 2]) {
      c.runs[g]++;
      if (same) c.stays[g]++;
    }
  }
  return { slotOf, weekOf, slots, weeks, ...c };
}

/**
 * Natural log of the chance of the run a … b − 1 on the meter's own history around it, read as a
 * chain: the first reading is in the state (its slot's share of in-state readings), the second
 * repeats it (its slot's share of repeats among in-state pairs), and each later one continues a
 * repeat (its slot's share of repeats that continue). Conditioning on "already repeating" is what
 * lets a quiet night explain itself: on a meter with 0.02 kWh steps, once a calm night starts
 * repeating it keeps repeating, while in a busy afternoon repeats seldom continue.
 * Counts come from the weeks within ±`halfWindowWeeks` of the run (summer nights compared with
 * summer nights) minus the run's own readings, as p = count / (total + 1): a habit the history
 * has not shown gives 0 (log P = −∞, nothing is explained), and a handful of observations cannot
 * give certainty. Returns the log probability and the mean continuation share (for the evidence).
 * @example other weeks always repeat at these hours → log P near 0; never → −∞
 */
export function logChanceOfRun(counts: RepeatCounts, a: number, b: number, halfWindowWeeks = 6): { logP: number; meanShare: number } {
  const w0 = counts.weekOf[a]!;
  const lo = Math.max(0, w0 - halfWindowWeeks);
  const hi = Math.min(counts.weeks - 1, w0 + halfWindowWeeks);
  const own = new Map<string, number>();
  const bump = (key: string): void => void own.set(key, (own.get(key) ?? 0) + 1);
  for (let i = a; i < b; i++) {
    const s = counts.slotOf[i]!;
    bump(`r${s}`);
    bump(`i${s}`);
    if (i > a) { bump(`p${s}`); bump(`q${s}`); }
    if (i > a + 1) { bump(`u${s}`); bump(`t${s}`); }
  }
  const share = (hits: Float64Array, total: Float64Array, s: number, hk: string, tk: string): number => {
    let h = 0;
    let t = 0;
    for (let w = lo; w <= hi; w++) {
      h += hits[w * counts.slots + s]!;
      t += total[w * counts.slots + s]!;
    }
    h = Math.max(0, h - (own.get(`${hk}${s}`) ?? 0));
    t = Math.max(0, t - (own.get(`${tk}${s}`) ?? 0));
    return Math.min(h, t) / (t + 1);
  };
  const sa = counts.slotOf[a]!;
  let logP = Math.log(share(counts.inState, counts.readings, sa, "i", "r"));
  if (b - a > 1) logP += Math.log(share(counts.repeats, counts.pairs, counts.slotOf[a + 1]!, "q", "p"));
  let shares = 0;
  const cache = new Map<number, number>();
  for (let i = a + 2; i < b; i++) {
    const s = counts.slotOf[i]!;
    let p = cache.get(s);
    if (p === undefined) cache.set(s, (p = share(counts.stays, counts.runs, s, "t", "u")));
    logP += Math.log(p);
    shares += p;
  }
  return { logP, meanShare: b - a > 2 ? shares / (b - a - 2) : 0 };
}
