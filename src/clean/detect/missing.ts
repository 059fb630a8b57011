import type { IntervalSeries } from "../../domain/types.ts";
import { fmt, intervalMs } from "./seriesGrid.ts";
import type { Detection } from "./types.ts";

/** Settings for `detectMissing` (portfolio.yaml `cleaning.missing`). */
export interface MissingConfig {
  /** Report gaps of at least this many intervals. Default 1 (every gap). */
  minIntervals: number;
}

export const DEFAULT_MISSING_CONFIG: Readonly<MissingConfig> = Object.freeze({ minIntervals: 1 });

/**
 * Missing intervals: holes in the regular grid between consecutive timestamps.
 * A step of k × interval between two starts means k − 1 intervals are missing; the detection
 * covers [previous start + interval, next start). A step that is not a whole multiple of the
 * interval (timestamps off the grid) counts the whole intervals that fit, rounded down.
 * Only holes between the first and last reading are seen; the series' own ends are not guessed.
 * Action `excluded`: there is nothing to train on, and nothing is invented for these intervals.
 * @example 15-minute data with starts 00:00, 00:15, 01:00 → one detection, 00:30–01:00, 2 intervals
 */
export function detectMissing(series: IntervalSeries, config: Partial<MissingConfig> = {}): Detection[] {
  const cfg = { ...DEFAULT_MISSING_CONFIG, ...config };
  const stepMs = intervalMs(series);
  const out: Detection[] = [];
  const t = series.startMs;
  for (let i = 1; i < t.length; i++) {
    const dt = t[i]! - t[i - 1]!;
    if (dt <= stepMs) continue;
    const count = Math.floor(dt / stepMs + 1e-9) - 1;
    if (count < cfg.minIntervals) continue;
    out.push({
      meterId: series.meterId,
      kind: "missing",
      startMs: t[i - 1]! + stepMs,
      endMs: t[i]!,
      intervals: count,
      action: "excluded",
      detail: `${count} interval(s) missing (${fmt((count * series.intervalMinutes) / 60)} h) between two readings`,
    });
  }
  return out;
}
