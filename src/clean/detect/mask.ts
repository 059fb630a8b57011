import type { IntervalSeries } from "../../domain/types.ts";
import type { Detection } from "./types.ts";
import { lowerBound } from "../../core/sorted.ts";

/**
 * Training mask from detections: mask[i] = 1 when interval i of `series` starts inside
 * [startMs, endMs) of a detection for this meter whose action is `excluded`. Detections of
 * other meters, weather detections and `missing` runs (no interval to mark) change nothing.
 * @example one excluded spike at the 10th interval → mask has a single 1 at index 9
 */
export function maskFromDetections(series: IntervalSeries, detections: readonly Detection[]): Uint8Array {
  const mask = new Uint8Array(series.values.length);
  for (const d of detections) {
    if (d.action !== "excluded" || d.meterId !== series.meterId) continue;
    let i = lowerBound(series.startMs, d.startMs);
    while (i < series.startMs.length && series.startMs[i]! < d.endMs) mask[i++] = 1;
  }
  return mask;
}

