/**
 * Small robust-statistics primitives used by the detectors. All skip NaN (the cleaning
 * layer's missing-value policy: NaN means "no usable value" and is never counted).
 */

/** Normal-consistency constant: 1.4826 × MAD estimates σ for Gaussian data (1 / Φ⁻¹(0.75)). */
export const MAD_TO_SIGMA = 1.4826;

/**
 * Median of the finite entries of `values` (NaN skipped); NaN when there are none.
 * Does not modify its input.
 * @example medianOf([3, 1, NaN, 2]) // 2
 * @example medianOf([4, 1, 3, 2]) // 2.5 (mean of the two middle values)
 */
export function medianOf(values: ArrayLike<number>): number {
  return medianOfSorted(finiteSorted(values));
}

/**
 * Median absolute deviation from the median, unscaled: median(|x − median(x)|). NaN skipped.
 * Multiply by `MAD_TO_SIGMA` for a robust σ.
 * @example madOf([1, 2, 3, 4, 100]) // 1 (median 3; deviations 2,1,0,1,97 → median 1)
 */
export function madOf(values: ArrayLike<number>): number {
  const sorted = finiteSorted(values);
  const m = medianOfSorted(sorted);
  if (Number.isNaN(m)) return NaN;
  for (let i = 0; i < sorted.length; i++) sorted[i] = Math.abs(sorted[i]! - m);
  return medianOfSorted(sorted.sort());
}

/**
 * Quantile `q` (0…1) of the finite entries, by linear interpolation between order statistics
 * (the "type 7" definition, R's and numpy's default). NaN when there are no finite entries.
 * @example quantileOf([1, 2, 3, 4, 5], 0.9) // 4.6
 */
export function quantileOf(values: ArrayLike<number>, q: number): number {
  const sorted = finiteSorted(values);
  if (sorted.length === 0) return NaN;
  const pos = (sorted.length - 1) * Math.min(1, Math.max(0, q));
  const lo = Math.floor(pos);
  const hi = Math.ceil(pos);
  return sorted[lo]! + (sorted[hi]! - sorted[lo]!) * (pos - lo);
}

/**
 * Rolling median with a centred window of `2 × halfWindow + 1` positions, truncated at the
 * ends; NaN entries inside a window are skipped, and a window with no finite entry gives NaN.
 * Positions are array positions (the caller makes sure neighbours are neighbours in time).
 * A median keeps steps sharp (a morning ramp-up is followed, not smeared), which is why spikes
 * are measured against it rather than against a rolling mean.
 * @example rollingMedian([1, 9, 2, 3, 100, 4], 1) // [5, 2, 3, 3, 4, 52]
 */
export function rollingMedian(values: ArrayLike<number>, halfWindow: number): Float64Array {
  const { lo, hi } = rollingMedianBounds(values, halfWindow);
  const out = new Float64Array(lo.length);
  for (let i = 0; i < out.length; i++) out[i] = (lo[i]! + hi[i]!) / 2;
  return out;
}

/**
 * The two middle order statistics of each rolling window (equal when the window holds an odd
 * number of finite values). Any value in [lo, hi] is a median of the window. When NaNs or a
 * series end leave an even count at a step (four night readings, four day readings), the
 * midpoint would sit halfway up the step; measuring a reading against the nearer bound
 * instead keeps an ordinary step from looking like a spike.
 * @example rollingMedianBounds([1, 9, 2, 3, 100, 4], 1).lo // [1, 2, 3, 3, 4, 4]
 */
export function rollingMedianBounds(values: ArrayLike<number>, halfWindow: number): { lo: Float64Array; hi: Float64Array } {
  const n = values.length;
  const lo = new Float64Array(n);
  const hi = new Float64Array(n);
  const h = Math.max(0, Math.floor(halfWindow));
  const buf = new Float64Array(2 * h + 1);
  for (let i = 0; i < n; i++) {
    let m = 0;
    const to = Math.min(n - 1, i + h);
    for (let j = Math.max(0, i - h); j <= to; j++) {
      const v = values[j]!;
      if (!Number.isFinite(v)) continue;
      // Insertion sort: windows are small (9 for 15-minute data), so this beats a general sort.
      let k = m++;
      while (k > 0 && buf[k - 1]! > v) {
        buf[k] = buf[k - 1]!;
        k--;
      }
      buf[k] = v;
    }
    if (m === 0) {
      lo[i] = NaN;
      hi[i] = NaN;
    } else if (m % 2 === 1) {
      lo[i] = hi[i] = buf[m >> 1]!;
    } else {
      lo[i] = buf[(m >> 1) - 1]!;
      hi[i] = buf[m >> 1]!;
    }
  }
  return { lo, hi };
}

/** The finite entries, sorted ascending, as a new typed array (numeric sort, no comparator). */
function finiteSorted(values: ArrayLike<number>): Float64Array {
  const out = new Float64Array(values.length);
  let m = 0;
  for (let i = 0; i < values.length; i++) {
    const v = values[i]!;
    if (Number.isFinite(v)) out[m++] = v;
  }
  return out.subarray(0, m).sort();
}

/** Median of an ascending array (NaN when empty). */
export function medianOfSorted(xs: Float64Array): number {
  const n = xs.length;
  if (n === 0) return NaN;
  const mid = n >> 1;
  return n % 2 === 1 ? xs[mid]! : (xs[mid - 1]! + xs[mid]!) / 2;
}
