/**
 * Prediction band from out-of-sample residuals: empirical quantiles of (actual − predicted)
 * on the cross-validation blocks, by local hour of day (residuals of a working hour are
 * larger than those of a night hour), pooled over all hours where a group is thin.
 */
import { ModelInputError } from "../errors.ts";

/**
 * Quantile of sorted values by linear interpolation between order statistics
 * (Hyndman & Fan 1996 type 7, the default of R's quantile() and numpy.quantile).
 * @example quantileSorted([1, 2, 3, 4], 0.5) // 2.5
 */
export function quantileSorted(sorted: ArrayLike<number>, q: number): number {
  const n = sorted.length;
  if (n === 0) throw new ModelInputError("quantile of an empty array");
  if (!(q >= 0 && q <= 1)) throw new ModelInputError(`quantile must be in [0, 1], got ${q}`);
  const h = (n - 1) * q;
  const lo = Math.floor(h);
  const hi = Math.min(lo + 1, n - 1);
  return sorted[lo]! + (h - lo) * (sorted[hi]! - sorted[lo]!);
}

export interface ResidualBand {
  /** Central coverage of the band, e.g. 0.8. */
  level: number;
  /** Offsets added to the prediction, by local hour of day 0 … 23 (lower ≤ 0 ≤ upper usually). */
  lowerKwh: Float64Array;
  upperKwh: Float64Array;
  /** Residuals behind each hour's offsets (the pooled count where the hour fell back). */
  countByHour: Int32Array;
  /** Hours of day that used the pooled quantiles. */
  pooledHours: number[];
}

/**
 * Band offsets from residuals and each residual's local hour of day.
 * @param minPerHour a group with fewer residuals uses the quantiles of all residuals. Default 30.
 * @throws ModelInputError when there are no residuals or the level is not in (0, 1).
 * @example residualBand(resid, hod, 0.8).upperKwh[9] // 90th percentile of 9 am residuals
 */
export function residualBand(residuals: ArrayLike<number>, hourOfDay: ArrayLike<number>, level: number, minPerHour = 30): ResidualBand {
  if (!(level > 0 && level < 1)) throw new ModelInputError(`band level must be in (0, 1), got ${level}`);
  if (residuals.length === 0) throw new ModelInputError("no residuals to build a band from");
  const qLo = (1 - level) / 2;
  const qHi = 1 - qLo;
  const groups: number[][] = Array.from({ length: 24 }, () => []);
  for (let i = 0; i < residuals.length; i++) groups[hourOfDay[i]!]!.push(residuals[i]!);
  const all = Float64Array.from(residuals).sort();
  const lowerKwh = new Float64Array(24);
  const upperKwh = new Float64Array(24);
  const countByHour = new Int32Array(24);
  const pooledHours: number[] = [];
  for (let h = 0; h < 24; h++) {
    const g = groups[h]!;
    const src = g.length >= minPerHour ? Float64Array.from(g).sort() : all;
    if (src === all) pooledHours.push(h);
    lowerKwh[h] = quantileSorted(src, qLo);
    upperKwh[h] = quantileSorted(src, qHi);
    countByHour[h] = src.length;
  }
  return { level, lowerKwh, upperKwh, countByHour, pooledHours };
}
