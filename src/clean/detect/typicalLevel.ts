import type { IntervalSeries } from "../../domain/types.ts";
import { quantileOf } from "./robustStats.ts";

/**
 * A meter's typical high reading: the 90th percentile of |value| over finite values, ignoring
 * indices where `exclude[i]` is 1. Spike floors and reset sizes are stated as multiples of it,
 * so the thresholds need no unit and work for kWh, therms or gallons alike. Returns 0 for an
 * all-zero or empty series.
 * @example typicalLevel({ values: [0, 0, 10, 20, ...] }) // p90 of the absolute values
 */
export function typicalLevel(series: IntervalSeries, exclude?: Uint8Array): number {
  const abs = new Float64Array(series.values.length);
  for (let i = 0; i < abs.length; i++) {
    abs[i] = exclude && exclude[i] ? NaN : Math.abs(series.values[i]!);
  }
  const q = quantileOf(abs, 0.9);
  return Number.isFinite(q) ? q : 0;
}
