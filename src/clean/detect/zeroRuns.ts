import type { IntervalSeries } from "../../domain/types.ts";
import { type FlatRunConfig, unusualFlatRuns } from "./flatRunCore.ts";
import type { Detection } from "./types.ts";

/** Settings for `detectZeroRuns` (portfolio.yaml `cleaning.zero_run`). */
export type ZeroRunConfig = FlatRunConfig;

/**
 * Defaults: runs of ≥ 4 h (and ≥ 4 intervals, so hourly data needs 4 readings) are checked;
 * a time slot is usual when ≥ 50 % of at least 2 other weeks read zero there too; a run is
 * reported when > 25 % of it is unusual; runs of a week or more are always reported (a weekend
 * closure is ~60 h and must stay unflagged when it repeats); weekly comparison from 3 weeks of
 * data, daily comparison below that.
 */
export const DEFAULT_ZERO_RUN_CONFIG: Readonly<ZeroRunConfig> = Object.freeze({
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
 * Runs of exact zeros that the meter's own history does not explain (communication outage,
 * dead meter). A zero run at hours of the week that read zero on most other weeks (a building
 * shut at night or at weekends) is not reported; the usual hours at the edges of a reported run
 * are trimmed off. `clockMs` (from `localClockMs`) compares by local clock instead of UTC. Kind `zero-run`, action `excluded`.
 * @example an office at 0 kWh every night → nothing; the same office at 0 one Tuesday 07:00–19:00 → one 12-h detection
 */
export function detectZeroRuns(series: IntervalSeries, config: Partial<ZeroRunConfig> = {}, skip?: Uint8Array, clockMs?: Float64Array): Detection[] {
  const cfg = { ...DEFAULT_ZERO_RUN_CONFIG, ...config };
  const v = series.values;
  return unusualFlatRuns(
    series,
    cfg,
    "zero-run",
    (i) => v[i] === 0,
    () => true,
    (i) => v[i] === 0,
    skip,
    clockMs,
  );
}
