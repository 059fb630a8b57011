/**
 * Bill-level variable-base degree-day regression (the variable-base degree-day method, Fels 1986, Energy and
 * Buildings 9; the variable-base degree-day method of ASHRAE Handbook — Fundamentals):
 *
 *   constant: use/day = β₀
 *   HO:       use/day = β₀ + βH·HDD(τH)/day                      (heating only)
 *   CO:       use/day = β₀ + βC·CDD(τC)/day                      (cooling only)
 *   HC:       use/day = β₀ + βH·HDD(τH)/day + βC·CDD(τC)/day     (τH ≤ τC)
 *
 * Degree-days are integrated from hourly temperatures over each billing period, so a month
 * whose mean is above the balance point still counts the heating its cold nights need, which
 * a model on mean period temperature cannot see. The base temperatures τ are searched (a
 * coarse grid, then a fine grid around the best coarse optima) for the least weighted sum of
 * squared errors, with the physical constraints βH > 0, βC > 0 and τH ≤ τC; with the bases
 * fixed the rest is ordinary weighted least squares (src/model/ols.ts).
 *
 * Parameters p count the searched bases (HO: β₀, βH, τH → p = 3; HC: p = 5), so the
 * Guideline 14 statistics, the RMSE and the prediction interval use n − p. Slope t values come
 * from the fit with bases fixed (df n − k) and ignore the base search: they are optimistic.
 */
import { fitOls } from "./ols.ts";
import type { IntervalPrediction, OlsFit } from "./ols.ts";
import { guideline14Stats, mean } from "./stats.ts";
import type { Guideline14Stats } from "./stats.ts";
import { studentTQuantile } from "./studentT.ts";
import type { HourlyTemps } from "./degreeDays.ts";
import { ModelInputError } from "./errors.ts";

const HOUR_MS = 3_600_000;

/**
 * The hourly temperatures of one period in a form that gives degree-days for any base in
 * O(log h): temperatures sorted ascending with prefix sums of their hour weights and of
 * weight × temperature. HDD(τ)/day = Σ_{T<τ} w(τ − T) / Σw = (τ·W(<τ) − S(<τ)) / Σw.
 */
export interface TemperatureProfile {
  /** Covered hourly temperatures, ascending. */
  sortedTemps: Float64Array;
  /** cumHours[i] = Σ_{j<i} wⱼ (length h + 1); wⱼ is the share of hour j inside the period. */
  cumHours: Float64Array;
  /** cumHourTemps[i] = Σ_{j<i} wⱼ·Tⱼ (length h + 1). */
  cumHourTemps: Float64Array;
  /** Σw: hours of the period with a temperature. */
  hoursCovered: number;
  /** Hours of the period, covered or not. */
  hoursTotal: number;
}

/**
 * Build a profile from hourly temperatures, each standing for `weights[i]` hours (default 1).
 * Non-finite temperatures are skipped and counted as missing (hoursTotal − hoursCovered).
 * @example hddPerDay(temperatureProfileFromHourly([10, 20]), 15) // 2.5 (mean of 5 and 0)
 */
export function temperatureProfileFromHourly(temps: ArrayLike<number>, weights?: ArrayLike<number>): TemperatureProfile {
  if (weights && weights.length !== temps.length) throw new ModelInputError(`weights have ${weights.length} values but temps have ${temps.length}`);
  const idx: number[] = [];
  let hoursTotal = 0;
  for (let i = 0; i < temps.length; i++) {
    const w = weights ? weights[i] : 1;
    if (!(w >= 0 && Number.isFinite(w))) throw new ModelInputError(`hour weight ${i} must be finite and non-negative, got ${w}`);
    hoursTotal += w;
    if (Number.isFinite(temps[i]) && w > 0) idx.push(i);
  }
  return equalWeightProfile(temps, weights, idx, hoursTotal) ?? sortedProfile(temps, weights, idx, hoursTotal);
}

/**
 * temperatureProfileFromHourly's general path: the hours stably sorted by temperature. A
 * function of its own, so the rarely taken path does not deoptimize its caller.
 */
function sortedProfile(temps: ArrayLike<number>, weights: ArrayLike<number> | undefined, idx: number[], hoursTotal: number): TemperatureProfile {
  const h = idx.length;
  // A bound module-level comparator, not a closure: V8 keeps its optimized code between calls.
  idx.sort(compareTemperatures.bind(null, temps));
  const sortedTemps = new Float64Array(h);
  const cumHours = new Float64Array(h + 1);
  const cumHourTemps = new Float64Array(h + 1);
  for (let r = 0; r < h; r++) {
    const i = idx[r];
    const w = weights ? weights[i] : 1;
    sortedTemps[r] = temps[i];
    cumHours[r + 1] = cumHours[r] + w;
    cumHourTemps[r + 1] = cumHourTemps[r] + w * temps[i];
  }
  return { sortedTemps, cumHours, cumHourTemps, hoursCovered: cumHours[h], hoursTotal };
}

/** Orders hour indices by their temperatures. */
function compareTemperatures(temps: ArrayLike<number>, a: number, b: number): number {
  return temps[a] - temps[b];
}

/**
 * temperatureProfileFromHourly when every used hour has the same weight (whole hours of a bill
 * that starts on the hour): equal temperatures then add equal terms, so the order among them —
 * which the general path takes from a stable sort of the hours — does not change any sum, and
 * a typed-array sort of the values gives the same profile. A −0 would sort apart from a +0 it
 * ties with (and might land elsewhere in sortedTemps), so then the general path is taken (null).
 */
function equalWeightProfile(temps: ArrayLike<number>, weights: ArrayLike<number> | undefined, idx: readonly number[], hoursTotal: number): TemperatureProfile | null {
  const h = idx.length;
  const w = weights && h > 0 ? weights[idx[0]] : 1;
  const sortedTemps = new Float64Array(h);
  for (let r = 0; r < h; r++) {
    const i = idx[r];
    if (weights && weights[i] !== w) return null;
    const t = temps[i];
    if (Object.is(t, -0)) return null;
    sortedTemps[r] = t;
  }
  sortedTemps.sort();
  const cumHours = new Float64Array(h + 1);
  const cumHourTemps = new Float64Array(h + 1);
  for (let r = 0; r < h; r++) {
    cumHours[r + 1] = cumHours[r] + w;
    cumHourTemps[r + 1] = cumHourTemps[r] + w * sortedTemps[r];
  }
  return { sortedTemps, cumHours, cumHourTemps, hoursCovered: cumHours[h], hoursTotal };
}

/**
 * The profile of the period [startMs, endMs) of an hourly series; hours straddling an edge
 * count by their overlap, as in degreeDaysForPeriod (src/model/degreeDays.ts).
 *
 * `blockHours` = 24 averages each run of 24 hours from the period start first (daily means,
 * the temperatures of the mean-temperature method and of the variable-base degree-day method, Fels 1986), so degree-days
 * become Σ over days of (τ − daily mean)⁺; the default 1 integrates hourly values. A block's
 * weight is its covered hours; a block with none is skipped. Bills start at local midnight, so
 * the blocks are local days except after a DST change inside the period (off by one hour).
 * @throws ModelInputError when endMs ≤ startMs or blockHours is not a positive integer.
 * @example temperatureProfileForPeriod({ startMs, temps }, billStartMs, billEndMs)
 */
export function temperatureProfileForPeriod(series: HourlyTemps, startMs: number, endMs: number, options: { blockHours?: number } = {}): TemperatureProfile {
  if (!(endMs > startMs)) throw new ModelInputError(`period end must be after its start (${startMs} … ${endMs})`);
  const blockHours = options.blockHours ?? 1;
  if (!(Number.isInteger(blockHours) && blockHours >= 1)) throw new ModelInputError(`blockHours must be a positive integer, got ${blockHours}`);
  const first = Math.max(0, Math.floor((startMs - series.startMs) / HOUR_MS));
  const last = Math.min(series.temps.length - 1, Math.ceil((endMs - series.startMs) / HOUR_MS) - 1);
  const temps: number[] = [];
  const weights: number[] = [];
  let blockIndex = -1;
  let blockW = 0;
  let blockWT = 0;
  const flush = (): void => {
    if (blockW > 0) {
      temps.push(blockWT / blockW);
      weights.push(blockW);
    }
    blockW = 0;
    blockWT = 0;
  };
  for (let i = first; i <= last; i++) {
    const h0 = series.startMs + i * HOUR_MS;
    const overlap = (Math.min(h0 + HOUR_MS, endMs) - Math.max(h0, startMs)) / HOUR_MS;
    if (overlap <= 0) continue;
    const t = series.temps[i];
    if (blockHours === 1) {
      temps.push(t);
      weights.push(overlap);
      continue;
    }
    const b = Math.floor((Math.max(h0, startMs) - startMs) / (blockHours * HOUR_MS));
    if (b !== blockIndex) {
      flush();
      blockIndex = b;
    }
    if (Number.isFinite(t)) {
      blockW += overlap;
      blockWT += overlap * t;
    }
  }
  flush();
  const profile = temperatureProfileFromHourly(temps, weights);
  // Hours beyond the series are missing too.
  return { ...profile, hoursTotal: (endMs - startMs) / HOUR_MS };
}

/** Number of sorted temperatures strictly below `base` (binary search). */
function countBelow(sorted: Float64Array, base: number): number {
  let lo = 0;
  let hi = sorted.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (sorted[mid] < base) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/**
 * Heating degree-days per day at `base` over the covered hours: mean of (base − T)⁺.
 * Missing hours are treated as having the covered hours' mean (the "scaled" reading of
 * degreeDaysForPeriod). NaN when no hour is covered.
 * @example hddPerDay(temperatureProfileFromHourly([...Array(12).fill(60), ...Array(12).fill(70)]), 65) // 2.5
 */
export function hddPerDay(profile: TemperatureProfile, base: number): number {
  const i = countBelow(profile.sortedTemps, base);
  return (base * profile.cumHours[i] - profile.cumHourTemps[i]) / profile.hoursCovered;
}

/**
 * Cooling degree-days per day at `base`: mean of (T − base)⁺ over the covered hours.
 * @example cddPerDay(temperatureProfileFromHourly([...Array(12).fill(60), ...Array(12).fill(70)]), 65) // 2.5
 */
export function cddPerDay(profile: TemperatureProfile, base: number): number {
  const i = countBelow(profile.sortedTemps, base);
  const h = profile.sortedTemps.length;
  return (profile.cumHourTemps[h] - profile.cumHourTemps[i] - base * (profile.cumHours[h] - profile.cumHours[i])) / profile.hoursCovered;
}

export type DegreeDayForm = "constant" | "HO" | "CO" | "HC";

const DEGREE_DAY_FORMS: readonly DegreeDayForm[] = ["constant", "HO", "CO", "HC"];

/** p for each form: intercept + slopes + searched bases. */
const DEGREE_DAY_PARAMETER_COUNT: Record<DegreeDayForm, number> = { constant: 1, HO: 3, CO: 3, HC: 5 };

/** One billing period. */
export interface DegreeDayPeriod {
  profile: TemperatureProfile;
  /** Average use per day over the period (kWh/day, therm/day, …). */
  usePerDay: number;
  /** Billing days (the weight when weighting by days). */
  days: number;
}

/** Where bases are searched: a coarse grid [min, max] by `step`, then ±step around the best by `refineStep`. */
export interface BaseSearchRange {
  min: number;
  max: number;
  step: number;
  refineStep: number;
}

/**
 * Default search ranges. 5–25 °C spans the balance points of real buildings (heating balance
 * points of 10–18 °C and cooling ones of 12–24 °C are usual; Fels 1986 reports bases of
 * roughly 40–75 °F for houses); 0.5 °C steps keep the coarse grid at 41 values and the refine
 * step of 0.05 °C is well below what monthly data can resolve. °F: the same span, 41–77 °F.
 */
const DEFAULT_BASE_RANGE: Record<"C" | "F", BaseSearchRange> = {
  C: { min: 5, max: 25, step: 0.5, refineStep: 0.05 },
  F: { min: 41, max: 77, step: 1, refineStep: 0.1 },
};

export interface DegreeDayFitOptions {
  /** Temperature unit of the profiles; chooses the default base range. Default "C". */
  tempUnit?: "C" | "F";
  baseRange?: BaseSearchRange;
  /** Weighted least squares with billing days as weights. Default true. */
  weightByDays?: boolean;
  /** Guideline 14 limits to judge against. Default "monthly". */
  resolution?: "monthly" | "hourly";
}

export interface DegreeDaySlope {
  role: "heating" | "cooling";
  value: number;
  standardError: number;
  tValue: number;
}

export interface DegreeDayFit {
  form: DegreeDayForm;
  /** τH and τC (null when the form has none), temperature units. */
  heatingBase: number | null;
  coolingBase: number | null;
  /** β₀: use per day independent of weather. */
  intercept: number;
  slopes: DegreeDaySlope[];
  parameterCount: number;
  /** Guideline 14 statistics of use per day (unweighted), p = parameterCount. */
  stats: Guideline14Stats;
  /** sqrt(Σwᵢeᵢ² / (n − p)). */
  rmse: number;
  /** Least squares with the bases fixed (df n − k). */
  ols: OlsFit;
  /** Regressor row [HDD/day?, CDD/day?] of a period for this fit's bases. */
  regressors(profile: TemperatureProfile): number[];
  /** Predicted use per day for a period. */
  predictPerDay(profile: TemperatureProfile): number;
  /**
   * Prediction interval for a new period's use per day, bases fixed:
   *   ŷ ± t(1 − α/2, n − p) · RMSE · sqrt(1/w₀ + x₀ᵀ(XᵀWX)⁻¹x₀),
   * w₀ = the period's days when weighted (default: mean training days).
   */
  predictWithInterval(profile: TemperatureProfile, level: number, days?: number): IntervalPrediction;
}

function regressorRow(form: DegreeDayForm, tH: number | null, tC: number | null, profile: TemperatureProfile): number[] {
  switch (form) {
    case "constant":
      return [];
    case "HO":
      return [hddPerDay(profile, tH as number)];
    case "CO":
      return [cddPerDay(profile, tC as number)];
    case "HC":
      return [hddPerDay(profile, tH as number), cddPerDay(profile, tC as number)];
  }
}

function checkPeriods(periods: readonly DegreeDayPeriod[]): void {
  for (let i = 0; i < periods.length; i++) {
    const p = periods[i]!;
    if (!Number.isFinite(p.usePerDay)) throw new ModelInputError(`period ${i}: use per day is not a finite number`);
    if (!(p.days > 0 && Number.isFinite(p.days))) throw new ModelInputError(`period ${i}: billing days must be positive, got ${p.days}`);
    if (!(p.profile.hoursCovered > 0)) throw new ModelInputError(`period ${i}: no hour has a temperature`);
  }
}

const SLOPE_ROLES: Record<DegreeDayForm, readonly DegreeDaySlope["role"][]> = { constant: [], HO: ["heating"], CO: ["cooling"], HC: ["heating", "cooling"] };

const COLUMN_NAMES: Record<DegreeDayForm, readonly string[]> = {
  constant: [],
  HO: ["heating degree-days per day"],
  CO: ["cooling degree-days per day"],
  HC: ["heating degree-days per day", "cooling degree-days per day"],
};

/** DegreeDayFit.predictPerDay of a fit with these bases. */
function predictPerDayOf(ols: OlsFit, form: DegreeDayForm, tH: number | null, tC: number | null, profile: TemperatureProfile): number {
  return ols.predict(regressorRow(form, tH, tC, profile));
}

/**
 * Fit one form with its bases given (no search).
 * @throws ModelInputError on bad periods, a missing base, τH > τC, too few periods or a singular design.
 * @example fitDegreeDayFormAt(periods, "HO", { heatingBase: 15 })
 */
export function fitDegreeDayFormAt(
  periods: readonly DegreeDayPeriod[],
  form: DegreeDayForm,
  bases: { heatingBase?: number | null; coolingBase?: number | null },
  options: DegreeDayFitOptions = {},
): DegreeDayFit {
  checkPeriods(periods);
  const tH = form === "HO" || form === "HC" ? (bases.heatingBase ?? null) : null;
  const tC = form === "CO" || form === "HC" ? (bases.coolingBase ?? null) : null;
  if ((form === "HO" || form === "HC") && !Number.isFinite(tH)) throw new ModelInputError(`${form} needs a heating base`);
  if ((form === "CO" || form === "HC") && !Number.isFinite(tC)) throw new ModelInputError(`${form} needs a cooling base`);
  if (form === "HC" && !((tH as number) <= (tC as number))) throw new ModelInputError(`heating base ${tH} is above cooling base ${tC}`);
  const p = DEGREE_DAY_PARAMETER_COUNT[form];
  const n = periods.length;
  if (n <= p) throw new ModelInputError(`${form} needs more than ${p} periods, got ${n}`);
  const weightByDays = options.weightByDays ?? true;
  // Plain loops and module-level functions rather than closures made per fit: V8 keeps their
  // optimized code between fits (a closure's is dropped once every closure made with it has died).
  const x: number[][] = [];
  // y typed, as the interval models give theirs to the statistics below (one kind of array).
  const y = new Float64Array(periods.length);
  const weights: number[] | undefined = weightByDays ? [] : undefined;
  for (let i = 0; i < periods.length; i++) {
    const pd = periods[i]!;
    x.push(regressorRow(form, tH, tC, pd.profile));
    y[i] = pd.usePerDay;
    if (weights) weights.push(pd.days);
  }
  const roles = SLOPE_ROLES[form];
  const ols = fitOls(x, y, { weights, columnNames: COLUMN_NAMES[form] });
  const slopes: DegreeDaySlope[] = [];
  for (let j = 0; j < roles.length; j++) {
    slopes.push({ role: roles[j]!, value: ols.coefficients[j + 1], standardError: ols.standardErrors[j + 1], tValue: ols.tValues[j + 1] });
  }
  const rmse = Math.sqrt(ols.sse / (n - p));
  const stats = guideline14Stats(y, ols.fitted, p, options.resolution ?? "monthly");
  const meanDays = weights ? mean(weights) : 1;
  const regressors = regressorRow.bind(null, form, tH, tC);
  const predictPerDay = predictPerDayOf.bind(null, ols, form, tH, tC);
  const predictWithInterval = (profile: TemperatureProfile, level: number, days?: number): IntervalPrediction => {
    if (!(level > 0 && level < 1)) throw new ModelInputError(`interval level must be in (0, 1), got ${level}`);
    const w0 = weights ? (days ?? meanDays) : 1;
    if (!(w0 > 0)) throw new ModelInputError(`billing days must be positive, got ${days}`);
    const base = ols.predictWithInterval(regressors(profile), 0.5, w0);
    // From the least-squares residual SE (df n − k) to the model RMSE (df n − p, bases counted).
    const scale = ols.residualStdError === 0 ? 0 : rmse / ols.residualStdError;
    const sePrediction = base.sePrediction * scale;
    const tCrit = studentTQuantile(1 - (1 - level) / 2, n - p);
    return { fit: base.fit, lower: base.fit - tCrit * sePrediction, upper: base.fit + tCrit * sePrediction, sePrediction, seMean: base.seMean * scale };
  };
  return {
    form,
    heatingBase: tH,
    coolingBase: tC,
    intercept: ols.coefficients[0],
    slopes,
    parameterCount: p,
    stats,
    rmse,
    ols,
    regressors,
    predictPerDay,
    predictWithInterval,
  };
}

/** Weighted sums for a least-squares fit of y on an intercept and one or two regressors. */
class SearchData {
  readonly n: number;
  readonly w: Float64Array;
  readonly y: Float64Array;
  readonly sw: number;
  readonly yBar: number;
  readonly syy: number;
  constructor(periods: readonly DegreeDayPeriod[], weightByDays: boolean) {
    this.n = periods.length;
    this.w = new Float64Array(this.n);
    this.y = new Float64Array(this.n);
    for (let i = 0; i < this.n; i++) {
      this.w[i] = weightByDays ? periods[i]!.days : 1;
      this.y[i] = periods[i]!.usePerDay;
    }
    let sw = 0;
    let swy = 0;
    for (let i = 0; i < this.n; i++) {
      sw += this.w[i];
      swy += this.w[i] * this.y[i];
    }
    this.sw = sw;
    this.yBar = swy / sw;
    let syy = 0;
    for (let i = 0; i < this.n; i++) syy += this.w[i] * (this.y[i] - this.yBar) ** 2;
    this.syy = syy;
  }
  /**
   * The parts of a fit that depend on one column alone: its weighted mean, its centred values
   * and the weighted sums Σ w·d·d and Σ w·d·(y − ȳ), each added in row order exactly as the
   * fused loops of a fit added them. A base search pairs every heating column with every
   * cooling column, so each column's parts are worked out once instead of once per pair.
   */
  prepare(x: ColumnView): PreparedColumn {
    const d = new Float64Array(this.n);
    const { bar, sdd, sdy } = this.moments(x, d);
    return { bar, d, sdd, sdy };
  }
  /**
   * Weighted SSE of y on [1, x] and the slope, straight from the column: {@link prepare}'s sums
   * without keeping the centred values (only a pair of columns needs them).
   */
  oneAt(x: ColumnView): { sse: number; slope: number } {
    return this.one(this.moments(x, null));
  }
  /** The column's weighted mean and sums of {@link prepare}, writing the centred values into `d` when given. */
  private moments(x: ColumnView, d: Float64Array | null): Omit<PreparedColumn, "d"> {
    const { values, rows } = x;
    let sx = 0;
    for (let i = 0; i < this.n; i++) sx += this.w[i] * values[rows[i]];
    const bar = sx / this.sw;
    let sdd = 0;
    let sdy = 0;
    for (let i = 0; i < this.n; i++) {
      const dx = values[rows[i]] - bar;
      if (d !== null) d[i] = dx;
      sdd += this.w[i] * dx * dx;
      sdy += this.w[i] * dx * (this.y[i] - this.yBar);
    }
    return { bar, sdd, sdy };
  }
  /** Weighted SSE of y on [1, x] and the slope; slope NaN when x is constant. */
  one(x: Omit<PreparedColumn, "d">): { sse: number; slope: number } {
    const { bar: xBar, sdd: sxx, sdy: sxy } = x;
    if (!(sxx > 1e-12 * Math.max(1, xBar * xBar) * this.sw)) return { sse: Number.POSITIVE_INFINITY, slope: Number.NaN };
    const slope = sxy / sxx;
    return { sse: this.syy - slope * sxy, slope };
  }
  /** Weighted SSE of y on [1, a, b] and both slopes (centred 2 × 2 normal equations). */
  two(a: PreparedColumn, b: PreparedColumn): { sse: number; slopeA: number; slopeB: number } {
    const { sdd: saa, sdy: say } = a;
    const { sdd: sbb, sdy: sby } = b;
    const da = a.d;
    const db = b.d;
    let sab = 0;
    for (let i = 0; i < this.n; i++) sab += this.w[i] * da[i] * db[i];
    const det = saa * sbb - sab * sab;
    // Near-collinear HDD and CDD columns (e.g. both bases in a narrow band): no usable fit.
    if (!(saa > 0 && sbb > 0 && det > 1e-9 * saa * sbb)) return { sse: Number.POSITIVE_INFINITY, slopeA: Number.NaN, slopeB: Number.NaN };
    const slopeA = (sbb * say - sab * sby) / det;
    const slopeB = (saa * sby - sab * say) / det;
    return { sse: this.syy - slopeA * say - slopeB * sby, slopeA, slopeB };
  }
}

/** One column's share of a fit (SearchData.prepare). */
interface PreparedColumn {
  bar: number;
  /** x − mean, per row. */
  d: Float64Array;
  /** Σ w·d·d */
  sdd: number;
  /** Σ w·d·(y − ȳ) */
  sdy: number;
}

function gridOf(min: number, max: number, step: number): number[] {
  const out: number[] = [];
  const count = Math.round((max - min) / step);
  for (let i = 0; i <= count; i++) out.push(Math.min(max, min + i * step));
  return out;
}

function columnAt(periods: readonly DegreeDayPeriod[], kind: "h" | "c", base: number): Float64Array {
  // A plain loop: Float64Array.from with a mapping function goes through the iterator protocol,
  // and the base searches (refitted for every left-out bill) build hundreds of thousands of columns.
  const out = new Float64Array(periods.length);
  for (let i = 0; i < out.length; i++) out[i] = degreeDaysAt(periods[i]!.profile, kind, base);
  return out;
}

/**
 * A degree-day column of the periods a fit is given: period i's value is values[rows[i]]
 * (a longer list's column read at the fit's rows, so no copy is made per fit).
 */
interface ColumnView {
  values: Float64Array;
  rows: Int32Array;
}

/**
 * Degree-day columns of the periods a fit is given, by kind and base. Objects with a method
 * rather than closures, so V8 keeps the optimized code between fits.
 */
interface ColumnSource {
  column(kind: "h" | "c", base: number): ColumnView;
}

function identityRows(n: number): Int32Array {
  const rows = new Int32Array(n);
  for (let i = 0; i < n; i++) rows[i] = i;
  return rows;
}

/** The column source of periods on their own (no list kept). */
class OwnColumns implements ColumnSource {
  private readonly rows: Int32Array;
  constructor(private readonly periods: readonly DegreeDayPeriod[]) {
    this.rows = identityRows(periods.length);
  }
  column(kind: "h" | "c", base: number): ColumnView {
    return { values: columnAt(this.periods, kind, base), rows: this.rows };
  }
}

/** The columns of a subset of a DegreeDayColumns list (DegreeDayColumns.sourceFor). */
class SubsetColumns implements ColumnSource {
  private own: Int32Array | null = null;
  constructor(
    private readonly list: DegreeDayColumns,
    private readonly periods: readonly DegreeDayPeriod[],
    private readonly rows: Int32Array,
  ) {}
  column(kind: "h" | "c", base: number): ColumnView {
    // A Map takes −0 and 0 as one key; their degree-days may differ in the sign of a zero.
    if (Object.is(base, -0)) return { values: columnAt(this.periods, kind, base), rows: (this.own ??= identityRows(this.periods.length)) };
    return { values: this.list.fullColumn(kind, base), rows: this.rows };
  }
}

/**
 * Degree-day columns of a fixed list of periods, kept by base, so fits on subsets of the list
 * (the leave-one-out refits of an outlier band, the rejection rounds) take their columns from
 * it instead of looking every period's degree-days up again. The numbers are the same as
 * without it: a subset's column is the list's column at the subset's rows.
 * @example fitDegreeDayForm(periods.slice(1), "HO", {}, new DegreeDayColumns(periods))
 */
export class DegreeDayColumns {
  readonly periods: readonly DegreeDayPeriod[];
  private readonly rowOf = new Map<DegreeDayPeriod, number>();
  private readonly h = new Map<number, Float64Array>();
  private readonly c = new Map<number, Float64Array>();
  constructor(periods: readonly DegreeDayPeriod[]) {
    this.periods = periods;
    for (let i = 0; i < periods.length; i++) {
      if (!this.rowOf.has(periods[i]!)) this.rowOf.set(periods[i]!, i);
    }
  }
  /** The column source for `periods`, or null when one of them is not in the list. */
  sourceFor(periods: readonly DegreeDayPeriod[]): ColumnSource | null {
    const rows = new Int32Array(periods.length);
    for (let i = 0; i < periods.length; i++) {
      const r = this.rowOf.get(periods[i]!);
      if (r === undefined) return null;
      rows[i] = r;
    }
    return new SubsetColumns(this, periods, rows);
  }
  /** The whole list's column at `base` (not −0), kept by base. */
  fullColumn(kind: "h" | "c", base: number): Float64Array {
    const byBase = kind === "h" ? this.h : this.c;
    let full = byBase.get(base);
    if (full === undefined) {
      full = columnAt(this.periods, kind, base);
      if (byBase.size >= 4096) byBase.clear(); // a bound, not an eviction policy
      byBase.set(base, full);
    }
    return full;
  }
}

/*
 * Degree-days per day of one period at one base, kept per profile: the leave-one-out refits of
 * the outlier bands search the same bases over the same periods once per left-out bill, and
 * every form searches the same coarse grid.
 */
const degreeDaysByProfile = new WeakMap<TemperatureProfile, { h: Map<number, number>; c: Map<number, number> }>();

function degreeDaysAt(profile: TemperatureProfile, kind: "h" | "c", base: number): number {
  // A Map takes −0 and 0 as one key; their degree-days may differ in the sign of a zero.
  if (Object.is(base, -0)) return kind === "h" ? hddPerDay(profile, base) : cddPerDay(profile, base);
  let cached = degreeDaysByProfile.get(profile);
  if (cached === undefined) degreeDaysByProfile.set(profile, (cached = { h: new Map(), c: new Map() }));
  const byBase = kind === "h" ? cached.h : cached.c;
  let v = byBase.get(base);
  if (v === undefined) {
    v = kind === "h" ? hddPerDay(profile, base) : cddPerDay(profile, base);
    if (byBase.size >= 4096) byBase.clear(); // a bound, not an eviction policy
    byBase.set(base, v);
  }
  return v;
}

/** Indices of the best few local minima of a 1-D score array (the refine step starts from each). */
function bestLocalMinima(scores: readonly number[], count: number): number[] {
  const idx: number[] = [];
  for (let i = 0; i < scores.length; i++) {
    if (!Number.isFinite(scores[i])) continue;
    const left = i === 0 ? Number.POSITIVE_INFINITY : scores[i - 1];
    const right = i === scores.length - 1 ? Number.POSITIVE_INFINITY : scores[i + 1];
    if (scores[i] <= left && scores[i] <= right) idx.push(i);
  }
  return idx.sort((a, b) => scores[a] - scores[b]).slice(0, count);
}

/** Insert `s` into `top` (≤ 3 entries, ascending SSE) after every entry with an SSE ≤ its own. */
function keepBestThree(top: { h: number; c: number; sse: number }[], s: { h: number; c: number; sse: number }): void {
  let at = top.length;
  while (at > 0 && top[at - 1].sse > s.sse) at--;
  if (at >= 3) return;
  top.splice(at, 0, s);
  if (top.length > 3) top.pop();
}

/** Weighted SSE of a one-slope fit on the column at `base`; Infinity when its slope is not positive. */
function oneSlopeSse(data: SearchData, columns: ColumnSource, kind: "h" | "c", base: number): number {
  const r = data.oneAt(columns.column(kind, base));
  // Physical constraint: a heating (cooling) slope must be positive.
  return r.slope > 0 ? r.sse : Number.POSITIVE_INFINITY;
}

/** Weighted SSE of a two-slope fit; Infinity unless both slopes are positive. */
function pairSse(data: SearchData, a: PreparedColumn, b: PreparedColumn): number {
  const r = data.two(a, b);
  return r.slopeA > 0 && r.slopeB > 0 ? r.sse : Number.POSITIVE_INFINITY;
}

/** The prepared columns of `kind` at each base. */
function preparedColumns(data: SearchData, columns: ColumnSource, kind: "h" | "c", bases: readonly number[]): PreparedColumn[] {
  const out: PreparedColumn[] = [];
  for (const b of bases) out.push(data.prepare(columns.column(kind, b)));
  return out;
}

/**
 * Best admissible base(s) of one form, by coarse grid then local fine grids. Its helpers are
 * module-level functions, not closures, so V8 keeps their optimized code between searches.
 */
function searchBases(
  periods: readonly DegreeDayPeriod[],
  form: "HO" | "CO" | "HC",
  range: BaseSearchRange,
  weightByDays: boolean,
  columns: ColumnSource,
): { heatingBase: number | null; coolingBase: number | null } | null {
  const data = new SearchData(periods, weightByDays);
  if (form !== "HC") {
    const kind = form === "HO" ? "h" : "c";
    const coarse = gridOf(range.min, range.max, range.step);
    const scores: number[] = [];
    for (const b of coarse) scores.push(oneSlopeSse(data, columns, kind, b));
    let best: number | null = null;
    let bestSse = Number.POSITIVE_INFINITY;
    for (const i of bestLocalMinima(scores, 3)) {
      const lo = Math.max(range.min, coarse[i] - range.step);
      const hi = Math.min(range.max, coarse[i] + range.step);
      for (const b of gridOf(lo, hi, range.refineStep)) {
        const s = oneSlopeSse(data, columns, kind, b);
        if (s < bestSse) {
          bestSse = s;
          best = b;
        }
      }
    }
    if (best === null) return null;
    return form === "HO" ? { heatingBase: best, coolingBase: null } : { heatingBase: null, coolingBase: best };
  }
  const coarse = gridOf(range.min, range.max, range.step);
  const hCols = preparedColumns(data, columns, "h", coarse);
  const cCols = preparedColumns(data, columns, "c", coarse);
  // The three best admissible pairs in the order a stable sort by SSE would give them (equal
  // SSEs keep their grid order): only those start a fine search.
  const starts: { h: number; c: number; sse: number }[] = [];
  for (let i = 0; i < coarse.length; i++) {
    for (let j = i; j < coarse.length; j++) {
      const sse = pairSse(data, hCols[i], cCols[j]);
      if (Number.isFinite(sse)) keepBestThree(starts, { h: coarse[i], c: coarse[j], sse });
    }
  }
  if (starts.length === 0) return null;
  let best = starts[0];
  for (const s of starts) {
    const hs = gridOf(Math.max(range.min, s.h - range.step), Math.min(range.max, s.h + range.step), range.refineStep);
    const cs = gridOf(Math.max(range.min, s.c - range.step), Math.min(range.max, s.c + range.step), range.refineStep);
    const cColsFine = preparedColumns(data, columns, "c", cs);
    for (const h of hs) {
      const hCol = data.prepare(columns.column("h", h));
      for (let k = 0; k < cs.length; k++) {
        const c = cs[k];
        if (c < h) continue;
        const sse = pairSse(data, hCol, cColsFine[k]);
        if (sse < best.sse) best = { h, c, sse };
      }
    }
  }
  return { heatingBase: best.h, coolingBase: best.c };
}

/**
 * Fit one form, searching its base(s) for the least weighted SSE under βH > 0, βC > 0, τH ≤ τC.
 * Search: every base of the coarse grid (every admissible pair for HC), then a grid of
 * `refineStep` within ±step of the three best coarse optima.
 * @throws ModelInputError on bad periods, too few periods, or no admissible base.
 * @example fitDegreeDayForm(periods, "HO").heatingBase // ≈ 15
 */
export function fitDegreeDayForm(periods: readonly DegreeDayPeriod[], form: DegreeDayForm, options: DegreeDayFitOptions = {}, columns?: DegreeDayColumns): DegreeDayFit {
  checkPeriods(periods);
  if (form === "constant") return fitDegreeDayFormAt(periods, form, {}, options);
  const p = DEGREE_DAY_PARAMETER_COUNT[form];
  if (periods.length <= p) throw new ModelInputError(`${form} needs more than ${p} periods, got ${periods.length}`);
  const range = options.baseRange ?? DEFAULT_BASE_RANGE[options.tempUnit ?? "C"];
  if (!(range.min < range.max && range.step > 0 && range.refineStep > 0)) {
    throw new ModelInputError(`base search range must have min < max and positive steps, got ${JSON.stringify(range)}`);
  }
  const source = columns?.sourceFor(periods) ?? new OwnColumns(periods);
  const bases = searchBases(periods, form, range, options.weightByDays ?? true, source);
  if (bases === null) throw new ModelInputError(`${form}: no base in ${range.min}…${range.max} gives a positive ${form === "CO" ? "cooling" : "heating"} slope${form === "HC" ? " and a positive cooling slope" : ""}`);
  return fitDegreeDayFormAt(periods, form, bases, options);
}

export interface DegreeDaySelectionOptions extends DegreeDayFitOptions {
  /** Forms to try. Default all of DEGREE_DAY_FORMS. */
  forms?: readonly DegreeDayForm[];
  /** Minimum |t| on every slope. Default 2 (the change-point selection's rule). */
  minAbsT?: number;
}

export interface DegreeDayCandidate {
  form: DegreeDayForm;
  fit?: DegreeDayFit;
  accepted: boolean;
  reasons: string[];
  /**
   * Remarks that do not reject the form, e.g. a base on the edge of the search range: the
   * optimum may lie beyond it, and a base at the cold (hot) end makes CDD (HDD) per day almost
   * linear in temperature, i.e. the model behaves like a straight line in mean temperature.
   */
  notes: string[];
}

export interface DegreeDaySelection {
  /** The accepted form with the lowest CV(RMSE) (ties → fewer parameters); null if none. */
  chosen: DegreeDayFit | null;
  tried: DegreeDayCandidate[];
}

/**
 * Fit every form and choose one: slopes positive and |t| ≥ minAbsT on every slope; among the
 * accepted forms the lowest CV(RMSE) wins (it charges for parameters through n − p), ties
 * within 1e-9 go to fewer parameters. The constant model is always admissible as a fallback.
 * @example fitDegreeDayModel(periods, { tempUnit: "C" }).chosen?.form // "HO"
 */
export function fitDegreeDayModel(periods: readonly DegreeDayPeriod[], options: DegreeDaySelectionOptions = {}, columns?: DegreeDayColumns): DegreeDaySelection {
  const minAbsT = options.minAbsT ?? 2;
  const tried: DegreeDayCandidate[] = [];
  for (const form of options.forms ?? DEGREE_DAY_FORMS) {
    let fit: DegreeDayFit;
    try {
      fit = fitDegreeDayForm(periods, form, options, columns);
    } catch (e) {
      if (e instanceof ModelInputError) {
        tried.push({ form, accepted: false, reasons: [e.message], notes: [] });
        continue;
      }
      throw e;
    }
    const reasons: string[] = [];
    for (const s of fit.slopes) {
      if (!(s.value > 0)) reasons.push(`${s.role} slope ${s.value.toPrecision(4)} is not positive`);
      if (!(Math.abs(s.tValue) >= minAbsT)) reasons.push(`|t| of the ${s.role} slope is ${Math.abs(s.tValue).toFixed(2)} < ${minAbsT}`);
    }
    if (!Number.isFinite(fit.stats.cvRmsePct)) reasons.push("CV(RMSE) is not finite");
    const range = options.baseRange ?? DEFAULT_BASE_RANGE[options.tempUnit ?? "C"];
    const notes: string[] = [];
    for (const [label, base] of [["heating", fit.heatingBase], ["cooling", fit.coolingBase]] as const) {
      if (base !== null && (base <= range.min || base >= range.max)) notes.push(`${label} base ${base} is on the edge of the search range ${range.min}…${range.max}`);
    }
    tried.push({ form, fit, accepted: reasons.length === 0, reasons, notes });
  }
  let chosen: DegreeDayFit | null = null;
  for (const c of tried) {
    if (!c.accepted || !c.fit) continue;
    const cv = c.fit.stats.cvRmsePct;
    if (chosen === null || cv < chosen.stats.cvRmsePct - 1e-9 || (Math.abs(cv - chosen.stats.cvRmsePct) <= 1e-9 && c.fit.parameterCount < chosen.parameterCount)) {
      chosen = c.fit;
    }
  }
  return { chosen, tried };
}
