import type { IntervalSeries } from "../../domain/types.ts";
import { detectionForRun, fmt, followsDirectly } from "./seriesGrid.ts";
import type { Detection } from "./types.ts";

/** Settings for `detectResets` (portfolio.yaml `cleaning.reset`). */
export interface ResetConfig {
  /** A negative value at least this many typical levels deep is a reset (not a mere negative). Default 2. */
  negativeLevels: number;
  /** A positive value at least this many typical levels high right after zeros or a gap is a catch-up. Default 3. */
  catchUpLevels: number;
}

export const DEFAULT_RESET_CONFIG: Readonly<ResetConfig> = Object.freeze({ negativeLevels: 2, catchUpLevels: 3 });

/**
 * Meter resets, in the two shapes they leave in interval data (`level` = `typicalLevel`, the
 * 90th percentile of |value|):
 * 1. Register rollover or reset: one large negative value (≤ −negativeLevels × level) followed
 *    by a normal, non-negative reading (or the end of data). Small negatives, or several in a
 *    row, are left to `detectNegatives`.
 * 2. Catch-up: after a run of exact zeros or a gap (the meter or its link stopped), one value
 *    ≥ catchUpLevels × level that carries the usage of the silent period in a single interval.
 *    The zeros before it are reported separately by the zero-run detector when long enough.
 * Both are kind `reset`, action `excluded`; the catch-up's energy is real but misplaced in time.
 * @example level 50, values [40, -5000, 45] → reset at index 1
 * @example level 50, values [0, 0, 0, 600, 40] → reset (catch-up) at index 3
 */
export function detectResets(series: IntervalSeries, level: number, config: Partial<ResetConfig> = {}): Detection[] {
  const cfg = { ...DEFAULT_RESET_CONFIG, ...config };
  const v = series.values;
  const n = v.length;
  const out: Detection[] = [];
  if (!(level > 0)) return out;
  for (let i = 0; i < n; i++) {
    const x = v[i]!;
    if (!Number.isFinite(x)) continue;
    if (x <= -cfg.negativeLevels * level) {
      const next = i + 1 < n ? v[i + 1]! : 0;
      const prevNegative = i > 0 && v[i - 1]! < 0 && followsDirectly(series, i);
      if (next >= 0 && !prevNegative) {
        out.push(
          detectionForRun(series, i, i + 1, "reset", "excluded",
            `reading of ${fmt(x)} (${fmt(x / level)} × the typical level ${fmt(level)}) between normal readings: register reset or rollover`),
        );
      }
      continue;
    }
    if (x >= cfg.catchUpLevels * level && i > 0) {
      const afterGap = !followsDirectly(series, i);
      const afterZero = !afterGap && v[i - 1] === 0;
      if (afterGap || afterZero) {
        let zeros = 0;
        for (let j = i - 1; j >= 0 && v[j] === 0 && (j === i - 1 || followsDirectly(series, j + 1)); j--) zeros++;
        const why = afterGap ? "a gap in the data" : `${zeros} zero reading(s)`;
        out.push(
          detectionForRun(series, i, i + 1, "reset", "excluded",
            `catch-up reading of ${fmt(x)} (${fmt(x / level)} × the typical level ${fmt(level)}) right after ${why}`),
        );
      }
    }
  }
  return out;
}
