/**
 * Robust σ per (week, hour of week) for the spike detector (spikes.ts `hourOfWeekSigma`).
 */
import { MAD_TO_SIGMA, medianOfSorted } from "./robustStats.ts";

/**
 * σ for every (week, hour of week) key: 1.4826 × the median of the |r| in the hours of the week
 * h − 1, h, h + 1 (cyclic) over the weeks within ± `halfWindowWeeks`; NaN when fewer than 12.
 * The window of weeks slides: for each hour of the week one sorted window is kept and, at each
 * week, the week leaving is merged out and the week entering merged in (linear), instead of
 * gathering and sorting about 150 values again for each of the 52 × 168 keys. The median of a
 * multiset does not depend on how it was gathered, so the σ are the same numbers.
 * @param buckets |residuals| per key week · 168 + hour of week (Monday 00:00 = 0), finite
 * @example slidingWeekMedians(buckets, 52, 6)[10 * 168 + 9] // σ of Monday 09:00 in week 10
 */
export function slidingWeekMedians(buckets: readonly number[][], weeks: number, halfWindowWeeks: number): Float64Array {
  const out = new Float64Array(weeks * 168);
  // Whole weeks (a fractional setting used to index the wrong hours of the week).
  const h = Math.max(0, Math.floor(halfWindowWeeks));
  for (let how = 0; how < 168; how++) {
    // The three neighbouring hours of each week, sorted once.
    const perWeek: Float64Array[] = [];
    for (let w = 0; w < weeks; w++) {
      const a = buckets[w * 168 + ((how + 167) % 168)]!;
      const b = buckets[w * 168 + how]!;
      const c = buckets[w * 168 + ((how + 1) % 168)]!;
      const xs = new Float64Array(a.length + b.length + c.length);
      xs.set(a, 0);
      xs.set(b, a.length);
      xs.set(c, a.length + b.length);
      perWeek.push(xs.sort());
    }
    // Two buffers large enough for every week, swapped at each step (no allocation per week).
    let total = 0;
    for (const xs of perWeek) total += xs.length;
    let window = new Float64Array(total);
    let spare = new Float64Array(total);
    let size = 0;
    for (let w = 0; w <= Math.min(weeks - 1, h); w++) {
      size = mergeSorted(window, size, perWeek[w]!, EMPTY, spare);
      [window, spare] = [spare, window];
    }
    for (let w = 0; w < weeks; w++) {
      if (w > 0) {
        const leaving = w - h - 1 >= 0 ? perWeek[w - h - 1]! : EMPTY;
        const entering = w + h <= weeks - 1 ? perWeek[w + h]! : EMPTY;
        size = mergeSorted(window, size, entering, leaving, spare);
        [window, spare] = [spare, window];
      }
      out[w * 168 + how] = size >= 12 ? MAD_TO_SIGMA * medianOfSorted(window.subarray(0, size)) : NaN;
    }
  }
  return out;
}

const EMPTY = new Float64Array(0);

/**
 * Writes the first `size` entries of `sorted`, plus `add`, minus `remove`, ascending into `out`
 * and returns how many (all ascending; `remove` is contained in them as a multiset).
 */
function mergeSorted(sorted: Float64Array, size: number, add: Float64Array, remove: Float64Array, out: Float64Array): number {
  let i = 0;
  let j = 0;
  let r = 0;
  let k = 0;
  while (i < size || j < add.length) {
    if (i < size && r < remove.length && sorted[i] === remove[r]) {
      i++;
      r++;
    } else if (j >= add.length || (i < size && sorted[i]! <= add[j]!)) out[k++] = sorted[i++]!;
    else out[k++] = add[j++]!;
  }
  return k;
}
