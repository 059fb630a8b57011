/**
 * The gradient-boosted tree model as an hourly baseline: feature columns from the hourly
 * table, early stopping on the latest weeks of the training window, then a refit on all of it.
 */
import { fitGbdt } from "./gbdt.ts";
import type { GbdtBinCache, GbdtModel, GbdtOptions } from "./gbdt.ts";
import type { FittedHourlyModel, HourlyFeatures, HourlyFrame, HourlyModelSpec } from "./types.ts";

/** Names of the tree features, in column order (buildingIndex only in pooled models). */
export const GBDT_FEATURE_NAMES = [
  "hourOfWeek",
  "hourOfDay",
  "dayOfWeek",
  "holiday",
  "tempC",
  "tempSmoothC",
  "tempSlopeCPerHour",
  "tempLagC",
  "tempRollingMeanC",
  "dayOfYear",
] as const;

/**
 * Feature columns for the trees. Hour of day and day of week are given beside hour of week
 * so a shallow tree can split "working hours" across all days at once. The local day of the
 * year (last, unless `calendar` is false) lets the trees learn seasonal schedules — a school's
 * summer break, a shop's holiday season — from the calendar alone, so it is known for future
 * hours; without it the trees can only guess the season from the rolling temperature, which
 * does not repeat from one year to the next.
 * @example gbdtFeatureColumns(frame).length // 10 (11 with a building index, 9 without the calendar)
 */
export function gbdtFeatureColumns(f: HourlyFeatures, calendar = true): Float64Array[] {
  const n = f.tempC.length;
  const hod = new Float64Array(n);
  const dow = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    hod[i] = f.hourOfWeek[i]! % 24;
    dow[i] = Math.floor(f.hourOfWeek[i]! / 24);
  }
  const cols = [
    Float64Array.from(f.hourOfWeek),
    hod,
    dow,
    Float64Array.from(f.holiday),
    f.tempC,
    f.tempSmoothC,
    f.tempSlopeCPerHour,
    f.tempLagC,
    f.tempRollingMeanC,
  ];
  if (calendar) cols.push(Float64Array.from(f.dayOfYear));
  if (f.buildingIndex) cols.push(Float64Array.from(f.buildingIndex));
  return cols;
}

export interface GbdtHourlyOptions extends Omit<GbdtOptions, "earlyStopping"> {
  /** Hours at the end of the training window held out for early stopping. Default 2 weeks (336); 0 = none. */
  validationHours?: number;
  /** Rounds without improvement before stopping. Default 20. */
  patience?: number;
  /** Give the trees the local day of the year as a feature. Default true. */
  calendar?: boolean;
  /**
   * Which training hours early stopping holds out: "latest" (the last `validationHours`) or
   * "spread" (whole days, `validationHours / 24` of them, evenly spaced over the window).
   * Default "spread" with the calendar feature, else "latest": the latest days' day-of-year
   * values lie beyond every training value, so with the calendar they would judge the trees
   * on a season they could not have learned and stop boosting far too early. With "spread"
   * the trees are not refitted on the held-out days (their neighbours on both sides are in the
   * fit; skipping the refit halves the fit time at no loss on the hourly benchmark); with
   * "latest" they are, as the latest weeks carry information the rest does not.
   */
  stoppingRows?: "latest" | "spread";
}

export interface GbdtHourlyModel extends FittedHourlyModel {
  readonly kind: "gbdt";
  gbdt: GbdtModel;
}

/**
 * Hourly GBDT model spec. Defaults: 300 rounds at most, learning rate 0.1, depth 6, 20 rows
 * per leaf, 64 bins, the day-of-year feature, early stopping on 14 whole days spread over the
 * window (kept only when the window is at least 3 times longer than the held-out hours); with
 * `calendar: false` the previous behaviour: early stopping on the last 2 weeks, then a refit
 * on all rows with the best number of trees.
 * p (for the Guideline 14 statistics) is the number of features: trees have no coefficient
 * count, and the page states this convention.
 * @example gbdtSpec().fit(frame).predict(frame)
 */
export function gbdtSpec(options: GbdtHourlyOptions = {}): HourlyModelSpec {
  return new GbdtHourlySpec(options);
}

/**
 * The spec {@link gbdtSpec} returns. A class, so that its `fit` is one function for the whole
 * process (a spec object with its own `fit` closure per call would lose V8's optimized code
 * whenever the spec is collected).
 */
class GbdtHourlySpec implements HourlyModelSpec {
  readonly kind = "gbdt";
  private readonly validationHours: number;
  private readonly patience: number;
  private readonly calendar: boolean;
  private readonly stoppingRows: "latest" | "spread";
  private readonly gbdtOptions: Omit<GbdtHourlyOptions, "validationHours" | "patience" | "calendar" | "stoppingRows">;

  constructor(options: GbdtHourlyOptions) {
    const { validationHours = 336, patience = 20, calendar = true, stoppingRows = calendar ? "spread" : "latest", ...gbdtOptions } = options;
    this.validationHours = validationHours;
    this.patience = patience;
    this.calendar = calendar;
    this.stoppingRows = stoppingRows;
    this.gbdtOptions = gbdtOptions;
  }

  fit(train: HourlyFrame): GbdtHourlyModel {
    const { validationHours, patience, calendar, stoppingRows, gbdtOptions } = this;
    const n = train.kwh.length;
    const useStop = validationHours > 0 && n >= 3 * validationHours;
    const order = useStop && stoppingRows === "spread" ? spreadHoldoutOrder(n, validationHours) : null;
    // fitGbdt holds out the last rows: with "spread" the chosen days are moved there (the refit uses every row).
    const { cols, binCache } = preparedColumns(train, calendar, order, `${calendar}/${order ? validationHours : 0}`);
    const y = order ? permuted(train.kwh, order) : train.kwh;
    const gbdt = fitGbdt(
      cols,
      y,
      {
        nTrees: 300,
        ...gbdtOptions,
        ...(useStop ? { earlyStopping: { validationRows: validationHours, patience, refit: stoppingRows === "latest" } } : {}),
      },
      binCache,
    );
    // the trees' predictions for the training rows, back in the table's order
    let fitted: Float64Array | undefined;
    if (gbdt.fitted.length === n) {
      fitted = order ? new Float64Array(n) : gbdt.fitted;
      if (order) for (let k = 0; k < n; k++) fitted[order[k]!] = gbdt.fitted[k]!;
    }
    return {
      kind: "gbdt",
      parameterCount: cols.length,
      gbdt,
      fitted,
      predict: (f) => gbdt.predict(gbdtFeatureColumns(f, calendar)),
    };
  }
}

/**
 * Row order that puts `holdoutRows` rows at the end, taken as blocks of (up to) 24 consecutive
 * rows centred in equal parts of the window (never at its edges, whose day of year is the
 * least covered); every other row keeps its order in front.
 * @example spreadHoldoutOrder(100, 48).slice(-48) // rows 13 … 36 and 63 … 86
 */
export function spreadHoldoutOrder(n: number, holdoutRows: number): Int32Array {
  const blocks = Math.max(1, Math.round(holdoutRows / 24));
  const held = new Uint8Array(n);
  let left = Math.min(holdoutRows, n - 1);
  for (let j = 0; j < blocks && left > 0; j++) {
    const len = j === blocks - 1 ? left : Math.min(24, left);
    const from = Math.max(0, Math.floor(((j + 0.5) * n) / blocks - len / 2));
    for (let i = from; i < Math.min(n, from + len); i++) {
      if (!held[i] && left > 0) {
        held[i] = 1;
        left--;
      }
    }
  }
  const out = new Int32Array(n);
  let k = 0;
  for (let i = 0; i < n; i++) if (!held[i]) out[k++] = i;
  for (let i = 0; i < n; i++) if (held[i]) out[k++] = i;
  return out;
}

function permuted(a: ArrayLike<number>, order: Int32Array): Float64Array {
  const out = new Float64Array(order.length);
  for (let k = 0; k < order.length; k++) out[k] = a[order[k]!]!;
  return out;
}

interface Prepared {
  /** The feature arrays the entry was built from (a table with other arrays is another entry). */
  source: HourlyFeatures;
  byKey: Map<string, { cols: Float64Array[]; binCache: GbdtBinCache }>;
}

/**
 * Tree feature columns (in training order) and their bins, per training table. Fits on the same
 * feature rows with another target — the log1p variant beside the plain one — find them here
 * instead of building and binning them again; the bins depend on the features only, so the
 * results are the same as without the cache. Keyed by the table's temperature array, and
 * checked against its other feature arrays, so a table is recognised however it is wrapped.
 */
const preparedCache = new WeakMap<Float64Array, Prepared>();

const FEATURE_KEYS = ["hourOfWeek", "holiday", "dayOfYear", "tempC", "tempSmoothC", "tempSlopeCPerHour", "tempLagC", "tempRollingMeanC", "buildingIndex"] as const;

/** Whether two tables hold the same feature arrays (a loop, not a callback made per call). */
function sameFeatureArrays(a: HourlyFeatures, b: HourlyFeatures): boolean {
  for (const k of FEATURE_KEYS) if (a[k] !== b[k]) return false;
  return true;
}

function preparedColumns(train: HourlyFeatures, calendar: boolean, order: Int32Array | null, key: string): { cols: Float64Array[]; binCache: GbdtBinCache } {
  let entry = preparedCache.get(train.tempC);
  if (!entry || !sameFeatureArrays(entry.source, train)) {
    entry = { source: { ...train }, byKey: new Map() };
    preparedCache.set(train.tempC, entry);
  }
  let hit = entry.byKey.get(key);
  if (!hit) {
    const base = gbdtFeatureColumns(train, calendar);
    let cols = base;
    if (order) {
      cols = [];
      for (const c of base) cols.push(permuted(c, order));
    }
    hit = { cols, binCache: new Map() };
    entry.byKey.set(key, hit);
  }
  return hit;
}
