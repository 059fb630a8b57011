/**
 * Weighted power (generalized, Hölder) mean M_p(x; w) = (Σ wᵢ xᵢ^p / Σ wᵢ)^(1/p), with the
 * limit p → 0 the weighted geometric mean exp(Σ wᵢ ln xᵢ / Σ wᵢ) (Hardy, Littlewood & Pólya,
 * "Inequalities", ch. II). p = 1 is the arithmetic mean, p = −1 the harmonic mean.
 */
import { ModelInputError } from "../errors.ts";

/** |p| below this is treated as the geometric-mean limit. */
export const GEOMETRIC_EPS = 1e-12;

/**
 * Weighted power mean of positive values (any real values when p = 1).
 * Weights must be ≥ 0 with a positive sum; they are normalized by their sum.
 * @throws ModelInputError on length mismatch, negative weights, zero weight sum, or a
 *   non-positive value when p ≠ 1.
 * @example generalizedWeightedMean([1, 4], [0.5, 0.5], 1) // 2.5
 * @example generalizedWeightedMean([1, 4], [0.5, 0.5], 2) // √8.5
 * @example generalizedWeightedMean([1, 4], [0.5, 0.5], 0) // 2 (geometric)
 */
export function generalizedWeightedMean(values: ArrayLike<number>, weights: ArrayLike<number>, p: number): number {
  if (values.length !== weights.length) throw new ModelInputError(`${values.length} values but ${weights.length} weights`);
  if (!Number.isFinite(p)) throw new ModelInputError(`exponent must be finite, got ${p}`);
  let wSum = 0;
  for (let i = 0; i < weights.length; i++) {
    if (!(weights[i]! >= 0)) throw new ModelInputError(`weights must be ≥ 0, got ${weights[i]}`);
    wSum += weights[i]!;
  }
  if (!(wSum > 0)) throw new ModelInputError("weights must not all be 0");
  if (p === 1) {
    let s = 0;
    for (let i = 0; i < values.length; i++) s += weights[i]! * values[i]!;
    return s / wSum;
  }
  for (let i = 0; i < values.length; i++) {
    if (weights[i]! > 0 && !(values[i]! > 0)) throw new ModelInputError(`power mean with p = ${p} needs positive values, got ${values[i]}`);
  }
  if (Math.abs(p) < GEOMETRIC_EPS) {
    let s = 0;
    for (let i = 0; i < values.length; i++) if (weights[i]! > 0) s += weights[i]! * Math.log(values[i]!);
    return Math.exp(s / wSum);
  }
  let s = 0;
  for (let i = 0; i < values.length; i++) if (weights[i]! > 0) s += weights[i]! * values[i]! ** p;
  return (s / wSum) ** (1 / p);
}
