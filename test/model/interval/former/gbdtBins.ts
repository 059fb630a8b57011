/**
 * src/model/interval/gbdtBins.ts as it was before small whole-number columns were sorted by
 * counting (commit 8b374f5), kept only so that test/model/interval/gbdtBinsSameAsBefore.test.ts
 * can show that the current code cuts the same bins bit for bit. Not for use outside that test.
 */
/**
 * Feature binning for histogram-based gradient boosting: each feature's values are cut at
 * up to maxBins − 1 quantile cut points, so a split search scans bins instead of sorted
 * values (histogram gradient boosting, Ke et al. 2017).
 */
import { ModelInputError } from "../../../../src/model/errors.ts";
import { lowerBound } from "../../../../src/core/sorted.ts";

/** Cut points of one feature: bin(x) = number of cuts c with x > c; NaN goes to the last bin. */
export interface FeatureBins {
  cuts: Float64Array;
}

/**
 * Cut points from training values. With at most maxBins distinct values every value gets its
 * own bin (cuts at midpoints); otherwise cuts at the k/maxBins quantiles (k = 1 … maxBins − 1),
 * duplicates removed. Non-finite values are ignored. Only the first `length` values are read
 * (default all: a training window that is a prefix of the columns needs no copy).
 * @throws ModelInputError when maxBins is not an integer in 2 … 255.
 * @example binCuts([1, 2, 3], 64).cuts // [1.5, 2.5]
 */
export function binCuts(values: ArrayLike<number>, maxBins: number, length = values.length): FeatureBins {
  if (!(Number.isInteger(maxBins) && maxBins >= 2 && maxBins <= 255)) throw new ModelInputError(`maxBins must be an integer in 2 … 255, got ${maxBins}`);
  // a typed copy of the finite values (a generic filter over a typed array is several times slower)
  const finite = new Float64Array(length);
  let m = 0;
  for (let i = 0; i < length; i++) {
    const v = values[i]!;
    if (Number.isFinite(v)) finite[m++] = v;
  }
  const sorted = finite.subarray(0, m).sort();
  const distinct: number[] = [];
  for (let i = 0; i < sorted.length; i++) if (i === 0 || sorted[i] !== sorted[i - 1]) distinct.push(sorted[i]!);
  const cuts: number[] = [];
  if (distinct.length <= maxBins) {
    for (let i = 1; i < distinct.length; i++) cuts.push((distinct[i - 1]! + distinct[i]!) / 2);
  } else {
    for (let k = 1; k < maxBins; k++) {
      const c = sorted[Math.floor((k * sorted.length) / maxBins) - 1]!;
      if (cuts.length === 0 || c > cuts[cuts.length - 1]!) cuts.push(c);
    }
    // the largest value must not be a cut, or its bin would be empty
    while (cuts.length && cuts[cuts.length - 1]! >= sorted[sorted.length - 1]!) cuts.pop();
  }
  return { cuts: Float64Array.from(cuts) };
}

/**
 * Bin index of a value: the number of cuts strictly below it (binary search); NaN → cuts.length.
 * So bin(x) ≤ b exactly when x ≤ cuts[b], which lets trees store raw thresholds.
 * @example binOf({ cuts: Float64Array.of(1.5, 2.5) }, 2) // 1
 */
export function binOf(bins: FeatureBins, x: number): number {
  if (Number.isNaN(x)) return bins.cuts.length;
  return lowerBound(bins.cuts, x);
}

/** Bin a whole column. */
export function binColumn(bins: FeatureBins, values: ArrayLike<number>): Uint8Array {
  const out = new Uint8Array(values.length);
  for (let i = 0; i < values.length; i++) out[i] = binOf(bins, values[i]!);
  return out;
}
