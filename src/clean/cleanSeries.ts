import type { IntervalSeries } from "../domain/types.ts";
import { maskFromDetections } from "./detect/mask.ts";
import type { Detection } from "./detect/types.ts";

/** A meter's data in two views: as read, and with flagged intervals blanked. */
export interface CleanedSeries {
  /** The series exactly as ingest produced it (same object, never modified). */
  raw: IntervalSeries;
  /** Same length as raw.values; NaN where mask[i] = 1 (or the raw value was not finite). */
  cleanedValues: Float64Array;
  /** mask[i] = 1: interval i is excluded from model training. */
  mask: Uint8Array;
  /** Number of masked intervals. */
  excludedCount: number;
}

/**
 * Applies detections to a series without deleting anything: excluded intervals become NaN in
 * `cleanedValues`, the raw series is returned untouched beside it, so bills can be reconciled
 * against both the raw sum and the cleaned view (the page says which one it used). Only
 * detections of this meter with action `excluded` mask an interval.
 * @example cleanSeries(s, detectAnomalies(s).detections).cleanedValues // NaN at every flagged interval
 */
export function cleanSeries(series: IntervalSeries, detections: readonly Detection[]): CleanedSeries {
  const mask = maskFromDetections(series, detections);
  const cleanedValues = new Float64Array(series.values.length);
  let excludedCount = 0;
  for (let i = 0; i < cleanedValues.length; i++) {
    const v = series.values[i]!;
    if (!Number.isFinite(v)) mask[i] = 1;
    if (mask[i]) excludedCount++;
    cleanedValues[i] = mask[i] ? NaN : v;
  }
  return { raw: series, cleanedValues, mask, excludedCount };
}

/**
 * The series with every flagged reading (mask[i] = 1) replaced by NaN, timestamps unchanged: the
 * view that money is computed on. Every consumer of interval data already treats a non-finite
 * value as a missing interval, so a flagged reading lowers the period's coverage instead of
 * entering a sum or a peak. Returns the same object when nothing is flagged.
 * @throws RangeError when the mask and the series differ in length.
 * @example withFlaggedAsMissing({ ...s, values: [1, 99, 1] }, Uint8Array.of(0, 1, 0)).values // [1, NaN, 1]
 */
export function withFlaggedAsMissing(series: IntervalSeries, mask: Uint8Array | undefined): IntervalSeries {
  if (!mask) return series;
  if (mask.length !== series.values.length) {
    throw new RangeError(`mask of meter ${series.meterId} has ${mask.length} entries for ${series.values.length} readings`);
  }
  if (!mask.some((m) => m === 1)) return series;
  const values = Float64Array.from(series.values, (v, i) => (mask[i] ? NaN : v));
  return { ...series, values };
}
