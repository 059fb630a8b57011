import type { IntervalSeries } from "../../domain/types.ts";
import { type FlatRunConfig, unusualFlatRuns } from "./flatRunCore.ts";
import { followsDirectly } from "./seriesGrid.ts";
import type { Detection } from "./types.ts";

/** Settings for `detectConstantRuns` (portfolio.yaml `cleaning.constant_run`). */
export type ConstantRunConfig = FlatRunConfig;

/** Defaults: as for zero runs (see `DEFAULT_ZERO_RUN_CONFIG`). */
export const DEFAULT_CONSTANT_RUN_CONFIG: Readonly<ConstantRunConfig> = Object.freeze({
  minRunHours: 4,
  minRunIntervals: 4,
  usualShare: 0.5,
  minComparisons: 2,
  maxUnexplainedShare: 0.25,
  alwaysFlagHours: 168,
  minWeeksForWeekly: 3,
  maxChanceRuns: 0.001,
});

/**
 * Runs of one repeated non-zero value (a stuck register or a gateway repeating its last
 * reading). Real load wanders; the same exact reading for hours is rare unless the meter's
 * resolution is coarse and the building idles — so, as for zeros, hours of the week where
 * other weeks also repeat readings are not reported (by local clock when `clockMs` is given). Kind `constant-run`, action `excluded`.
 * @example 12.5 kWh every 15 min for 10 h in the middle of a working day → one detection, 40 intervals
 */
export function detectConstantRuns(
  series: IntervalSeries,
  config: Partial<ConstantRunConfig> = {},
  skip?: Uint8Array,
  clockMs?: Float64Array,
): Detection[] {
  const cfg = { ...DEFAULT_CONSTANT_RUN_CONFIG, ...config };
  const v = series.values;
  const n = v.length;
  const repeats = (i: number): boolean =>
    (i > 0 && followsDirectly(series, i) && v[i] === v[i - 1]) ||
    (i + 1 < n && followsDirectly(series, i + 1) && v[i] === v[i + 1]);
  return unusualFlatRuns(
    series,
    cfg,
    "constant-run",
    (i) => v[i] !== 0 && Number.isFinite(v[i]!),
    (i) => v[i] === v[i - 1],
    (i) => v[i] !== 0 && repeats(i),
    skip,
    clockMs,
  );
}
