/**
 * How likely a run of equal readings is by chance, on the meter's own history: at each hour of
 * the week, how often a reading equals the one before (given the one before is in the same
 * state: zero, or non-zero). A meter reading in 0.02 kWh steps on a quiet night repeats itself
 * most of the time, so four equal hours are ordinary there; in a busy afternoon they are not.
 */
import type { IntervalSeries } from "../../domain/types.ts";
import { followsDirectly } from "./seriesGrid.ts";

/** Pseudo-observations with which a slot's own share is pulled towards the meter's overall share. */
const PRIOR_WEIGHT = 1;

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

/** A step's share at reading i: in the state, repeating the one before, continuing a repeat. */
interface StepShares {
  inStateAt(i: number): number;
  repeatAt(i: number): number;
  stayAt(i: number): number;
}

/**
 * Shares of one slot system over the weeks lo … hi with the run a … b − 1 taken out, each shrunk
 * with PRIOR_WEIGHT pseudo-observations towards `parent` (a coarser slot system) or, at the top,
 * towards the window's share over all slots. A step's prior is also capped by the slot's own
 * share of being in the state (at the top, of the step before): a slot seldom in the state (an
 * office's Tuesday noon reading zero) cannot borrow a high share from the coarser view (where
 * weekend noons read zero).
 */
function stepShares(counts: RepeatCounts, a: number, b: number, lo: number, hi: number, parent: StepShares | null): StepShares {
  const ownBy = (pick: (i: number) => boolean): Map<number, number> => {
    const m = new Map<number, number>();
    for (let i = a; i < b; i++) if (pick(i)) m.set(counts.slotOf[i]!, (m.get(counts.slotOf[i]!) ?? 0) + 1);
    return m;
  };
  const ownReadings = ownBy(() => true);
  const ownPairs = ownBy((i) => i > a);
  const ownRuns = ownBy((i) => i > a + 1);
  const windowSum = (arr: Float64Array, s: number): number => {
    let t = 0;
    for (let w = lo; w <= hi; w++) t += arr[w * counts.slots + s]!;
    return t;
  };
  const pooled = (hits: Float64Array, total: Float64Array, own: Map<number, number>): number => {
    let h = 0;
    let t = 0;
    for (let s = 0; s < counts.slots; s++) {
      h += windowSum(hits, s);
      t += windowSum(total, s);
    }
    for (const c of own.values()) {
      h -= c;
      t -= c;
    }
    return Math.min(Math.max(0, h), Math.max(0, t)) / (Math.max(0, t) + 1);
  };
  const top = parent ? null : {
    inState: pooled(counts.inState, counts.readings, ownReadings),
    repeat: pooled(counts.repeats, counts.pairs, ownPairs),
    stay: pooled(counts.stays, counts.runs, ownRuns),
  };
  const memo = new Map<string, number>();
  const shrunk = (key: string, hits: Float64Array, total: Float64Array, own: Map<number, number>, s: number, prior: number): number => {
    const k = `${key}${s}`;
    let p = memo.get(k);
    if (p !== undefined) return p;
    const o = own.get(s) ?? 0;
    const t = Math.max(0, windowSum(total, s) - o);
    const h = Math.min(t, Math.max(0, windowSum(hits, s) - o));
    memo.set(k, (p = (h + PRIOR_WEIGHT * prior) / (t + PRIOR_WEIGHT)));
    return p;
  };
  const self: StepShares = {
    inStateAt: (i) => shrunk("i", counts.inState, counts.readings, ownReadings, counts.slotOf[i]!, parent ? parent.inStateAt(i) : top!.inState),
    repeatAt: (i) => shrunk("r", counts.repeats, counts.pairs, ownPairs, counts.slotOf[i]!, Math.min(parent ? parent.repeatAt(i) : top!.repeat, self.inStateAt(i))),
    stayAt: (i) => shrunk("s", counts.stays, counts.runs, ownRuns, counts.slotOf[i]!, parent ? Math.min(parent.stayAt(i), self.inStateAt(i)) : Math.min(top!.stay, self.repeatAt(i))),
  };
  return self;
}

/**
 * Natural log of the chance of the run a … b − 1 on the meter's own history around it, read as a
 * chain: the first reading is in the state (its slot's share of in-state readings), the second
 * repeats it (its slot's share of repeats among in-state pairs), and each later one continues a
 * repeat (its slot's share of repeats that continue). Conditioning on "already repeating" is what
 * lets a quiet night explain itself: on a meter with 0.02 kWh steps, once a calm night starts
 * repeating it keeps repeating, while in a busy afternoon repeats seldom continue.
 * Counts come from the weeks within ±`halfWindowWeeks` of the run (summer nights compared with
 * summer nights) minus the run's own readings. Each slot's share is shrunk with one
 * pseudo-observation, p = (count + prior) / (total + 1), towards the same step in `coarse` (e.g.
 * hour of the day under hour of the week) and that in turn towards the meter's share over all
 * slots, capped by the slot's share of the step before (`stepShares`). A slot
 * seen only a few times thus leans on the coarser view, a habit the meter never shows gives 0
 * (log P = −∞, nothing is explained), and no estimate reaches 1.
 * Returns the log probability and the mean continuation share (for the evidence text).
 * @example other weeks always repeat at these hours → log P near 0; never anywhere → −∞
 */
export function logChanceOfRun(counts: RepeatCounts, a: number, b: number, halfWindowWeeks = 6, coarse?: RepeatCounts): { logP: number; meanShare: number } {
  const w0 = counts.weekOf[a]!;
  const lo = Math.max(0, w0 - halfWindowWeeks);
  const hi = Math.min(counts.weeks - 1, w0 + halfWindowWeeks);
  const parent = coarse ? stepShares(coarse, a, b, lo, hi, null) : null;
  const shares = stepShares(counts, a, b, lo, hi, parent);
  let logP = Math.log(shares.inStateAt(a));
  if (b - a > 1) logP += Math.log(shares.repeatAt(a + 1));
  let sum = 0;
  for (let i = a + 2; i < b; i++) {
    const p = shares.stayAt(i);
    logP += Math.log(p);
    sum += p;
  }
  return { logP, meanShare: b - a > 2 ? sum / (b - a - 2) : 0 };
}
