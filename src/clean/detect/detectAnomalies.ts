import type { IntervalSeries } from "../../domain/types.ts";
import { type DetectConfigInput, resolveDetectConfig } from "./config.ts";
import { detectConstantRuns } from "./constantRuns.ts";
import { maskFromDetections } from "./mask.ts";
import { detectMissing } from "./missing.ts";
import { detectNegatives } from "./negatives.ts";
import { detectResets } from "./resets.ts";
import { detectSpikes } from "./spikes.ts";
import { typicalLevel } from "./typicalLevel.ts";
import type { Detection, DetectionResult } from "./types.ts";
import { detectZeroRuns } from "./zeroRuns.ts";
import { localClockMs } from "../../core/time/index.ts";

/** Facts about the meter that are not settings. */
export interface DetectContext {
  /** IANA zone of the building: "same hour on other days" is then read on its local clock. */
  timezone?: string;
}

/**
 * Runs every interval detector on one meter and returns the detections (sorted by start) and
 * the training mask (mask[i] = 1: excluded; the readings themselves are never changed).
 * Order matters, so each interval is reported under one kind: missing (timestamps only) →
 * resets → negatives → zero runs → constant runs → spikes; a later detector skips intervals an
 * earlier one already excluded, and spikes are measured with those intervals left out of the
 * rolling median. The typical level (p90 of |value|) is taken with resets and negatives left out.
 * Non-finite values are treated as unusable: masked, never reported as a kind of their own.
 * With `context.timezone`, time-of-day and time-of-week comparisons use the building's local
 * clock (a schedule does not move at DST changes); without it, UTC.
 * @throws RangeError when `context.timezone` is not a valid IANA zone.
 * @example detectAnomalies(series).detections.filter(d => d.kind === "spike")
 */
export function detectAnomalies(
  series: IntervalSeries,
  config: DetectConfigInput = {},
  context: DetectContext = {},
): DetectionResult {
  const cfg = resolveDetectConfig(config);
  const clockMs = context.timezone === undefined ? undefined : localClockMs(series.startMs, context.timezone);
  const n = series.values.length;
  const taken = new Uint8Array(n);
  const detections: Detection[] = [];
  const take = (found: Detection[]): void => {
    const m = maskFromDetections(series, found);
    for (let i = 0; i < n; i++) if (m[i]) taken[i] = 1;
    detections.push(...found);
  };

  detections.push(...detectMissing(series, cfg.missing));
  const firstLevel = typicalLevel(series);
  take(detectResets(series, firstLevel, cfg.reset));
  take(detectNegatives(series, cfg.negative, taken));
  const level = typicalLevel(series, taken);
  take(detectZeroRuns(series, cfg.zeroRun, taken, clockMs));
  take(detectConstantRuns(series, cfg.constantRun, taken, clockMs));
  take(detectSpikes(series, level, cfg.spike, taken, clockMs));

  detections.sort((a, b) => a.startMs - b.startMs || a.kind.localeCompare(b.kind));
  const mask = maskFromDetections(series, detections);
  for (let i = 0; i < n; i++) if (!Number.isFinite(series.values[i]!)) mask[i] = 1;
  return { detections, mask };
}
