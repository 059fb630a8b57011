/** Cleaning primitives: smoothing/derivatives and time-of-week features. */
export { CleanInputError } from "./errors.ts";
export { savgolCoefficients, savgolFilter } from "./savitzkyGolay.ts";
export type { SavgolOptions } from "./savitzkyGolay.ts";
export { DEFAULT_TOWT_KNOTS_F, temperatureComponents, intervalOfWeek, hourOfWeek } from "./timeOfWeek.ts";
