/**
 * P10 / P50 / P90 of a set of scenario outcomes.
 *
 * Definition: simple-statistics `quantile` (v7.12), which sorts and interpolates linearly
 * between order statistics at index (n − 1)·p — Hyndman & Fan (1996) type 7, the default of
 * R's `quantile` and numpy's `percentile`. With 300 scenarios, P10 sits at index 29.9.
 */
import { quantile } from "simple-statistics";
import { ForecastInputError } from "./errors.ts";

export interface Band {
  p10: number;
  p50: number;
  p90: number;
}

/**
 * P10, P50 and P90 of `values` (type-7 quantiles, see the module comment).
 * @throws ForecastInputError on an empty sample or a non-finite value.
 * @example bandOf([1, 2, 3, 4, 5]) // { p10: 1.4, p50: 3, p90: 4.6 }
 */
export function bandOf(values: ArrayLike<number>): Band {
  if (values.length === 0) throw new ForecastInputError("no scenarios to take quantiles of");
  // simple-statistics selects in place on a copy (`slice`), which a Float64Array supports: no copy into an array first.
  const xs = values instanceof Float64Array ? values : Float64Array.from(values);
  for (let i = 0; i < xs.length; i++) if (!Number.isFinite(xs[i]!)) throw new ForecastInputError(`scenario value ${xs[i]} is not a finite number`);
  const [p10, p50, p90] = quantile(xs as unknown as number[], [0.1, 0.5, 0.9]) as number[];
  return { p10: p10!, p50: p50!, p90: p90! };
}

/**
 * P50 of `values` alone: the same number as `bandOf(values).p50` (the same order statistics,
 * selected without the four that P10 and P90 need), for callers that read only the median.
 * @throws ForecastInputError as bandOf.
 * @example p50Of([1, 2, 3, 4, 5]) // 3
 */
export function p50Of(values: ArrayLike<number>): number {
  if (values.length === 0) throw new ForecastInputError("no scenarios to take quantiles of");
  const xs = values instanceof Float64Array ? values : Float64Array.from(values);
  for (let i = 0; i < xs.length; i++) if (!Number.isFinite(xs[i]!)) throw new ForecastInputError(`scenario value ${xs[i]} is not a finite number`);
  return quantile(xs as unknown as number[], 0.5) as number;
}
