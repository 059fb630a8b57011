/**
 * Shared shapes of the interval (hourly) baseline models: a columnar table of hourly
 * features, the same table with the hourly energy target, and the one small interface every
 * model implements (fit on a training table, predict for any feature table).
 */

/** Hourly feature columns, one entry per UTC hour (all arrays the same length). */
export interface HourlyFeatures {
  /** Start of each hour, UTC epoch ms (top of an hour). */
  hourStartMs: Float64Array;
  /** Local hour of week 0 … 167 (Monday 00:00 local = 0), DST-aware. */
  hourOfWeek: Uint8Array;
  /** 1 when the local date is an observed U.S. federal holiday. */
  holiday: Uint8Array;
  /**
   * Local day of the year, 1 … 366 (the calendar position: lets a model learn seasonal
   * occupancy such as a school's terms from a year of history; known for any future hour).
   */
  dayOfYear: Uint16Array;
  /** Local calendar month, 1 … 12 (for month-segmented models). */
  month: Uint8Array;
  /** Outdoor temperature, °C. */
  tempC: Float64Array;
  /** Savitzky–Golay smoothed temperature, °C. */
  tempSmoothC: Float64Array;
  /** First derivative of the Savitzky–Golay fit, °C per hour. */
  tempSlopeCPerHour: Float64Array;
  /** Temperature `lagHours` earlier, °C. */
  tempLagC: Float64Array;
  /** Mean temperature of the trailing `rollingHours` hours (this hour included), °C. */
  tempRollingMeanC: Float64Array;
  /** Index of the building in a pooled (portfolio) model; absent for single-meter models. */
  buildingIndex?: Uint16Array;
}

/** Why hours inside the meter's span were left out of training (each hour counted once). */
export interface HourlyExclusions {
  /** At least one interval of the hour was masked by cleaning. */
  masked: number;
  /** An interval value was not a finite number. */
  nonFinite: number;
  /** Fewer intervals than the hour should hold (missing data). */
  incomplete: number;
  /** No temperature for the hour (outside the weather grid or a gap left unfilled). */
  noWeather: number;
}

/** Row accounting of {@link HourlyFrame}: hoursUsed + Σ excluded = hoursSpanned. */
export interface HourlyAccounting {
  intervalsRead: number;
  /** Intervals that ended up in a used hour. */
  intervalsUsed: number;
  /** Hours from the first to the last interval's hour, inclusive. */
  hoursSpanned: number;
  hoursUsed: number;
  excluded: HourlyExclusions;
  /** Used hours whose smoothed/lagged/rolling temperature was undefined and fell back to tempC. */
  derivedFeatureFallbacks: number;
}

/** Hourly training table: features plus the hourly energy target. */
export interface HourlyFrame extends HourlyFeatures {
  /** Energy in the hour, meter unit × multiplier (kWh for electricity). */
  kwh: Float64Array;
  accounting: HourlyAccounting;
}

/** A fitted hourly model. */
export interface FittedHourlyModel {
  readonly kind: string;
  /**
   * Parameter count p for the Guideline 14 statistics: regression coefficients for TOWT;
   * for tree models (which have no such count) the number of input features, as stated there.
   */
  readonly parameterCount: number;
  /** Predicted hourly energy for every row of `features`. */
  predict(features: HourlyFeatures): Float64Array;
  /**
   * When the model has them at no cost: its predictions for the table it was fitted on, in that
   * table's row order — the same numbers `predict(train)` returns. Read only.
   */
  readonly fitted?: Float64Array;
}

/** Something that can be fitted to an hourly table: the unit of model comparison. */
export interface HourlyModelSpec {
  readonly kind: string;
  fit(train: HourlyFrame): FittedHourlyModel;
}
