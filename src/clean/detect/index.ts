/** Interval and weather data-quality detectors (issue 5). */
export type { Detection, DetectionAction, DetectionKind, DetectionResult } from "./types.ts";
export {
  DEFAULT_DETECT_CONFIG,
  parseCleaningConfig,
  resolveDetectConfig,
  type CleaningConfigIssue,
  type DetectConfig,
  type DetectConfigInput,
} from "./config.ts";
export { detectAnomalies, type DetectContext } from "./detectAnomalies.ts";
export { detectZeroRuns, DEFAULT_ZERO_RUN_CONFIG, type ZeroRunConfig } from "./zeroRuns.ts";
export { detectConstantRuns, DEFAULT_CONSTANT_RUN_CONFIG, type ConstantRunConfig } from "./constantRuns.ts";
export { detectSpikes, DEFAULT_SPIKE_CONFIG, type SpikeConfig } from "./spikes.ts";
export { detectNegatives, DEFAULT_NEGATIVE_CONFIG, type NegativeConfig } from "./negatives.ts";
export { detectMissing, DEFAULT_MISSING_CONFIG, type MissingConfig } from "./missing.ts";
export { detectResets, DEFAULT_RESET_CONFIG, type ResetConfig } from "./resets.ts";
export { detectWeatherGaps } from "./weatherGaps.ts";
export { maskFromDetections } from "./mask.ts";
export { typicalLevel } from "./typicalLevel.ts";
export { medianOf, madOf, quantileOf, rollingMedian, rollingMedianBounds, MAD_TO_SIGMA } from "./robustStats.ts";
export { detectionsToRows, DATA_QUALITY_COLUMNS, type DataQualityRow } from "./rows.ts";
