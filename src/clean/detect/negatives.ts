import type { IntervalSeries } from "../../domain/types.ts";
import { detectionForRun, flaggedRuns, fmt } from "./seriesGrid.ts";
import type { Detection } from "./types.ts";

/** Settings for `detectNegatives` (portfolio.yaml `cleaning.negative`). */
export interface NegativeConfig {
  /** Values below −tolerance count as negative. Default 0 (any value below zero). */
  tolerance: number;
}

export const DEFAULT_NEGATIVE_CONFIG: Readonly<NegativeConfig> = Object.freeze({ tolerance: 0 });

/**
 * Negative readings: a consumption meter cannot use less than nothing, so runs of values
 * below −tolerance are reported and excluded. Indices with `skip[i]` = 1 (already explained,
 * e.g. a reset) are left out. Runs of adjacent negative intervals become one detection.
 * @example values [5, -2, 6] → one detection at index 1, 1 interval
 */
export function detectNegatives(
  series: IntervalSeries,
  config: Partial<NegativeConfig> = {},
  skip?: Uint8Array,
): Detection[] {
  const cfg = { ...DEFAULT_NEGATIVE_CONFIG, ...config };
  const v = series.values;
  const runs = flaggedRuns(series, (i) => !(skip && skip[i]) && v[i]! < -cfg.tolerance);
  return runs.map(([a, b]) => {
    let min = Infinity;
    for (let i = a; i < b; i++) min = Math.min(min, v[i]!);
    return detectionForRun(series, a, b, "negative", "excluded", `negative reading(s), lowest ${fmt(min)}`);
  });
}
