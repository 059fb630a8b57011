/**
 * Helpers that read an `IntervalSeries` as a regular time grid: which neighbours are really
 * adjacent in time, how long an interval is, and index runs → detections.
 */
import type { IntervalSeries } from "../../domain/types.ts";
import type { Detection, DetectionAction, DetectionKind } from "./types.ts";

/** Interval length in ms. */
export function intervalMs(series: IntervalSeries): number {
  return series.intervalMinutes * 60_000;
}

/**
 * True when interval i − 1 ends exactly where interval i starts (no missing interval between).
 * Runs of equal values and rolling windows never bridge a gap.
 */
export function followsDirectly(series: IntervalSeries, i: number): boolean {
  if (i <= 0 || i >= series.startMs.length) return false;
  return series.startMs[i]! - series.startMs[i - 1]! === intervalMs(series);
}

/** Number of intervals needed to cover `hours` (at least `minIntervals`). */
export function intervalsForHours(series: IntervalSeries, hours: number, minIntervals = 1): number {
  return Math.max(minIntervals, Math.ceil((hours * 60) / series.intervalMinutes - 1e-9));
}

/** Builds the detection for the index run [from, to) of `series`. */
export function detectionForRun(
  series: IntervalSeries,
  from: number,
  to: number,
  kind: DetectionKind,
  action: DetectionAction,
  detail: string,
): Detection {
  return {
    meterId: series.meterId,
    kind,
    startMs: series.startMs[from]!,
    endMs: series.startMs[to - 1]! + intervalMs(series),
    intervals: to - from,
    action,
    detail,
  };
}

/**
 * Splits the indices where `isFlagged(i)` holds into maximal runs [from, to) of intervals that
 * are adjacent in time.
 * @example flaggedRuns(series, i => values[i] < 0) // [[4, 6]] when only 4 and 5 are negative
 */
export function flaggedRuns(series: IntervalSeries, isFlagged: (i: number) => boolean): Array<[number, number]> {
  const runs: Array<[number, number]> = [];
  const n = series.startMs.length;
  let i = 0;
  while (i < n) {
    if (!isFlagged(i)) {
      i++;
      continue;
    }
    let j = i + 1;
    while (j < n && isFlagged(j) && followsDirectly(series, j)) j++;
    runs.push([i, j]);
    i = j;
  }
  return runs;
}


/** Shortens a number for detail text (at most 4 significant digits, no exponent for usual sizes). */
export function fmt(x: number): string {
  if (!Number.isFinite(x)) return String(x);
  const a = Math.abs(x);
  if (a >= 1000) return x.toFixed(0);
  return Number(x.toPrecision(4)).toString();
}
