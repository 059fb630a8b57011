/** Cleaning primitives: smoothing/derivatives and time-of-week features. */
export { CleanInputError } from "./errors.ts";
export { savgolCoefficients, savgolFilter } from "./savitzkyGolay.ts";
export type { SavgolOptions } from "./savitzkyGolay.ts";
export { cleanSeries, withFlaggedAsMissing } from "./cleanSeries.ts";
export type { CleanedSeries } from "./cleanSeries.ts";
export { DEFAULT_TOWT_KNOTS_F, temperatureComponents } from "./timeOfWeek.ts";
