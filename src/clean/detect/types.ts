/**
 * What the cleaning stage found in meter or weather data. One `Detection` becomes one row of
 * OUT/data/data-quality.csv (see `detectionsToRows`), so the fields mirror its columns.
 */

/** Kinds of data problem, exactly the `kind` values of data-quality.csv. */
export type DetectionKind =
  | "zero-run"
  | "constant-run"
  | "spike"
  | "negative"
  | "duplicate"
  | "missing"
  | "reset"
  | "weather-gap";

/**
 * What was done about it, exactly the `action` values of data-quality.csv:
 * `excluded` = left in the record but not used for model training; `interpolated` = filled
 * (weather gaps); `kept` = reported only, still used; `corrected` = value or time changed.
 */
export type DetectionAction = "excluded" | "interpolated" | "kept" | "corrected";

export interface Detection {
  /** Meter the detection belongs to; null for weather detections. */
  meterId: string | null;
  /** Weather station, for `weather-gap` detections. */
  stationId?: string;
  kind: DetectionKind;
  /** First affected interval start, UTC epoch ms. */
  startMs: number;
  /** End of the last affected interval, UTC epoch ms (exclusive). */
  endMs: number;
  /** Number of intervals (or weather hours) affected. */
  intervals: number;
  action: DetectionAction;
  /** One plain-language sentence with the evidence (values, thresholds). */
  detail: string;
}

/** Result of running every interval detector on one meter. */
export interface DetectionResult {
  /** Sorted by start, then kind. */
  detections: Detection[];
  /** mask[i] = 1: interval i is excluded from model training (flagged, never deleted). */
  mask: Uint8Array;
}
