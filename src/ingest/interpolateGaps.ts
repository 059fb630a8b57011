/**
 * Linear interpolation across runs of missing values (NaN) in a regular series, up to a
 * maximum run length. Pure; the input is not modified.
 */

export interface GapRun {
  /** Index of the first missing value. */
  start: number;
  /** Number of consecutive missing values. */
  length: number;
  /** `interpolated` when filled, `kept` when left missing (too long, or not enclosed by data). */
  action: "interpolated" | "kept";
}

export interface InterpolationResult {
  values: Float64Array;
  /** 1 where a value was filled here, else 0. */
  filled: Uint8Array;
  gaps: GapRun[];
}

/**
 * Fills each run of NaN of length ≤ `maxGap` that has a value on both sides by the straight
 * line between those neighbours: for a run of L values between a (index s−1) and b (index s+L),
 * value[s+k] = a + (b − a)·(k + 1)/(L + 1). Longer runs and runs at either end stay NaN.
 * Example: [10, NaN, NaN, 16] with maxGap 2 → [10, 12, 14, 16]; with maxGap 1 → unchanged.
 */
export function interpolateGaps(values: ArrayLike<number>, maxGap: number): InterpolationResult {
  const n = values.length;
  const out = Float64Array.from(values);
  const filled = new Uint8Array(n);
  const gaps: GapRun[] = [];
  let k = 0;
  while (k < n) {
    if (!Number.isNaN(out[k])) {
      k++;
      continue;
    }
    const start = k;
    while (k < n && Number.isNaN(out[k])) k++;
    const length = k - start;
    const enclosed = start > 0 && k < n;
    if (enclosed && length <= maxGap) {
      const a = out[start - 1];
      const b = out[k];
      for (let j = 0; j < length; j++) {
        out[start + j] = a + ((b - a) * (j + 1)) / (length + 1);
        filled[start + j] = 1;
      }
      gaps.push({ start, length, action: "interpolated" });
    } else gaps.push({ start, length, action: "kept" });
  }
  return { values: out, filled, gaps };
}
