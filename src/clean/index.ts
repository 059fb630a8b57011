/** Cleaning primitives: smoothing/derivatives and time-of-week features. */
export { CleanInputError } from "./errors.ts";
export { savgolCoefficients, savgolFilter } from "./savitzkyGolay.ts";
export type { SavgolOptions } from "./savitzkyGolay.ts";
export { cleanSeries, withFlaggedAsMissing } from "./cleanSeries.ts";
export type { CleanedSeries } from "./cleanSeries.ts";
export { DEFAULT_TOWT_KNOTS_F, temperatureComponents } from "./timeOfWeek.ts";

// Used by other folders (see test/architecture/layers.test.ts).
export { assessIntervalMeters, weatherGapDetections } from "./assessMeters.ts";
export type { MeterQuality } from "./assessMeters.ts";
export { parseCleaningConfig } from "./detect/config.ts";
export { DATA_QUALITY_COLUMNS, detectionsToRows } from "./detect/rows.ts";
export type { DataQualityRow } from "./detect/rows.ts";
export type { Detection } from "./detect/types.ts";
