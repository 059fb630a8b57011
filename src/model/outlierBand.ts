/**
 * An expected-usage band per bill that is honest about model error on NEW data.
 *
 * A least-squares prediction interval is built from in-sample residuals, which the fit has
 * already bent towards, and it assumes the model form is right; with ~36 monthly points and
 * searched bases both are optimistic, and a form that misfits the shoulder months puts clean
 * bills outside it. Here the band is set from leave-one-out prediction residuals
 * (the PRESS residuals of Allen 1974, Technometrics 16, with the model refitted — bases and
 * breakpoints searched again — without the bill):
 *
 *   rᵢ = yᵢ − ŷ₍₋ᵢ₎                     error of use per day on a bill the fit never saw
 *   s  = 1.4826 · median |rᵢ|           robust scale (MAD about zero: a biased model widens it)
 *   k  = t(1 − α/2, ν), ν = ⌊0.37·n⌋    α = 1 − level
 *   half-width = max(k·s·days, minRelativeHalfWidth · expected)
 *
 * Constants and why:
 * - residuals in use per day (default), not relative to the prediction: a relative scale was
 *   tried on the demo portfolio and flagged clean summer gas bills, whose use is small but
 *   whose deviations (holidays, setbacks) are not proportional to it; per-day residuals with
 *   the relative floor below behave better. The relative reading remains an option.
 * - 1.4826 = 1/Φ⁻¹(0.75) makes the MAD a consistent estimate of σ for normal errors (common
 *   practice); the median ignores the outliers the band is meant to find.
 * - ν: the MAD has about 37 % of the Gaussian efficiency of the standard deviation
 *   (Rousseeuw & Croux 1993, JASA 88; from memory), so s is about as uncertain as an SD from
 *   0.37·n values; using t with that many degrees of freedom keeps the false-alarm rate near α
 *   for clean normal bills (k ≈ 3.05 for n = 34 at level 0.99).
 * - level 0.99 (default): about 1 clean bill in 100 falls outside, i.e. roughly one false
 *   alarm per eight meter-years of monthly bills.
 * - minRelativeHalfWidth 0.10 (default): on very regular meters the residuals can be ~1 %, and a
 *   ±3 % band would flag ordinary operational changes (a week of extra occupancy) that are
 *   nobody's billing concern; ±10 % of expected use is a size a finance team would act on
 *   (common practice for a usage screen, not a standard). On the demo portfolio ±5 % adds one
 *   clean bill (LAB-W-2025-10) to the flags and ±0 % three (scripts/compare-monthly-baselines.ts).
 * - one rejection round (default): bills outside the first band are refitted out, so a leak
 *   does not pull the model (and its neighbours' predictions) towards itself.
 * Bills not used for fitting (estimated reads, duplicates) get a band from the final model.
 */
import { studentTQuantile } from "./studentT.ts";
import { ModelInputError } from "./errors.ts";
import { DegreeDayColumns, fitDegreeDayForm, fitDegreeDayModel } from "./degreeDayRegression.ts";
import type { DegreeDayFit, DegreeDayForm, DegreeDayPeriod, DegreeDaySelection, DegreeDaySelectionOptions } from "./degreeDayRegression.ts";

/** Anything that predicts use per day for a point. */
export interface BandModel<P> {
  predictPerDay(point: P): number;
}

export interface BandPoint<P> {
  id: string;
  point: P;
  /** Measured use per day. */
  usePerDay: number;
  /** Billing days (the band is for the bill's total use). */
  days: number;
}

export interface OutlierBandOptions {
  /** Share of clean bills meant to fall inside. Default 0.99. */
  level?: number;
  /** Smallest half-width as a share of expected use. Default 0.10. */
  minRelativeHalfWidth?: number;
  /** Residuals in use per day (default) or relative to the prediction. */
  residualScale?: "relative" | "absolute";
  /** Refits without the bills outside the band, this many times. Default 1. */
  rejectionRounds?: number;
  /** Share of the standard deviation's Gaussian efficiency that the MAD has. Default 0.37. */
  madEfficiency?: number;
}

export interface BillBand {
  id: string;
  /** Expected use over the bill (use per day × days). */
  expected: number;
  low: number;
  high: number;
  /** Whether the minimum relative width, not the residual scale, set the width. */
  atMinimumWidth: boolean;
}

export interface OutlierBandResult<P> {
  bands: Map<string, BillBand>;
  /** The final model (fitted without rejected bills). */
  model: BandModel<P>;
  /** Leave-one-out residual of each training bill (relative or per day, see residualScale). */
  looResiduals: { id: string; residual: number }[];
  /** Robust scale s of the leave-one-out residuals. */
  scale: number;
  /** Multiplier k = t(1 − α/2, ν). */
  k: number;
  effectiveDf: number;
  /** Training bills left out of the final fit because they fell outside an earlier band. */
  rejected: string[];
  /** The band of any point from the final model: what it gets as one more target. */
  bandOf(pt: BandPoint<P>): BillBand;
}

const MAD_TO_SIGMA = 1.4826;

function ascending(a: number, b: number): number {
  return a - b;
}

function median(values: number[]): number {
  const s = [...values].sort(ascending);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}

// The helpers below are module-level functions rather than closures made per call, so V8 keeps
// their optimized code between meters.

/** The model fitted on the points of `pts`, without the one at `leaveOut` (−1: none); null when it cannot be fitted. */
function tryFit<P>(fit: (points: P[]) => BandModel<P> | null, pts: readonly BandPoint<P>[], leaveOut: number): BandModel<P> | null {
  const points: P[] = [];
  for (let j = 0; j < pts.length; j++) if (j !== leaveOut) points.push(pts[j]!.point);
  try {
    return fit(points);
  } catch (e) {
    if (e instanceof ModelInputError) return null;
    throw e;
  }
}

function residualOf<P>(pt: BandPoint<P>, predicted: number, relative: boolean): number {
  return relative ? (pt.usePerDay - predicted) / predicted : pt.usePerDay - predicted;
}

/**
 * Expected-usage bands from leave-one-out prediction errors (see the module comment).
 * @param train bills the model may learn from (actual reads, one per period).
 * @param fit fits the model on a subset of points; throw ModelInputError (or return null) when it cannot.
 * @param targets every bill that needs a band (training bills and those left out of the fit).
 * @returns null when the model cannot be fitted on the training bills or on each leave-one-out subset.
 * @throws ModelInputError on an invalid option.
 * @example outlierBand(train, (pts) => fitDegreeDayForm(pts.map(toPeriod), "HO"), allBills)
 */
export function outlierBand<P>(
  train: readonly BandPoint<P>[],
  fit: (points: P[]) => BandModel<P> | null,
  targets: readonly BandPoint<P>[],
  options: OutlierBandOptions = {},
): OutlierBandResult<P> | null {
  const level = options.level ?? 0.99;
  const minRel = options.minRelativeHalfWidth ?? 0.1;
  const relative = (options.residualScale ?? "absolute") === "relative";
  const rounds = options.rejectionRounds ?? 1;
  const efficiency = options.madEfficiency ?? 0.37;
  if (!(level > 0 && level < 1)) throw new ModelInputError(`band level must be in (0, 1), got ${level}`);
  if (!(minRel >= 0)) throw new ModelInputError(`minimum relative half-width must be ≥ 0, got ${minRel}`);
  if (!(efficiency > 0 && efficiency <= 1)) throw new ModelInputError(`MAD efficiency must be in (0, 1], got ${efficiency}`);

  let kept = [...train];
  const rejected: string[] = [];
  for (let round = 0; ; round++) {
    const model = tryFit(fit, kept, -1);
    if (model === null) return null;
    const loo: { id: string; residual: number }[] = [];
    for (let i = 0; i < kept.length; i++) {
      const m = tryFit(fit, kept, i);
      if (m === null) return null;
      const r = residualOf(kept[i], m.predictPerDay(kept[i].point), relative);
      if (!Number.isFinite(r)) return null;
      loo.push({ id: kept[i].id, residual: r });
    }
    const sizes: number[] = [];
    for (const l of loo) sizes.push(Math.abs(l.residual));
    const scale = MAD_TO_SIGMA * median(sizes);
    const effectiveDf = Math.max(1, Math.floor(efficiency * loo.length));
    const k = studentTQuantile(1 - (1 - level) / 2, effectiveDf);
    const bandFor = (pt: BandPoint<P>): BillBand => {
      const perDay = model.predictPerDay(pt.point);
      const expected = perDay * pt.days;
      const spread = relative ? k * scale * Math.abs(expected) : k * scale * pt.days;
      const minimum = minRel * Math.abs(expected);
      const half = Math.max(spread, minimum);
      return { id: pt.id, expected, low: Math.max(0, expected - half), high: expected + half, atMinimumWidth: minimum >= spread };
    };
    const outside: BandPoint<P>[] = [];
    for (const pt of kept) {
      const b = bandFor(pt);
      const used = pt.usePerDay * pt.days;
      if (used < b.low || used > b.high) outside.push(pt);
    }
    if (round < rounds && outside.length > 0 && kept.length - outside.length > 0) {
      const drop = new Set(outside.map((o) => o.id));
      rejected.push(...drop);
      kept = kept.filter((pt) => !drop.has(pt.id));
      continue;
    }
    const bands = new Map<string, BillBand>();
    for (const t of targets) bands.set(t.id, bandFor(t));
    return { bands, model, looResiduals: loo, scale, k, effectiveDf, rejected, bandOf: bandFor };
  }
}

/** A bill for {@link degreeDayOutlierBand}: its period and an id. */
export interface DegreeDayBandBill extends DegreeDayPeriod {
  id: string;
}

export interface DegreeDayOutlierBand {
  /** The model chosen on the training bills left after rejection; null when none could be fitted. */
  fit: DegreeDayFit | null;
  /** Every form tried in that final selection. */
  tried: DegreeDaySelection["tried"];
  /** Bands for every target bill (empty when no model or too few bills for leave-one-out). */
  bands: Map<string, BillBand>;
  /** Training bills refitted out, in the order they were dropped (e.g. a leak). */
  rejected: string[];
  /** Leave-one-out statistics of the final band; null when no band. */
  band: Pick<OutlierBandResult<DegreeDayPeriod>, "looResiduals" | "scale" | "k" | "effectiveDf"> | null;
  /**
   * The band of a further bill that is not trained on (an estimated read, a stretch nobody
   * billed), from the final model: what it would get as one more target. Null when no band.
   */
  bandOf(bill: DegreeDayBandBill): BillBand | null;
}

export interface DegreeDayOutlierBandOptions extends DegreeDaySelectionOptions, Omit<OutlierBandOptions, "rejectionRounds"> {
  /** Most training bills refitted out, as a share of them (at least one). Default 0.1. */
  maxRejectedShare?: number;
}

function asBand(b: DegreeDayBandBill): BandPoint<DegreeDayPeriod> {
  return { id: b.id, point: b, usePerDay: b.usePerDay, days: b.days };
}

/** Refits one degree-day form on subsets of the training bills (a class: V8 keeps its methods' optimized code). */
class FormRefit {
  constructor(
    private readonly form: DegreeDayForm,
    private readonly options: DegreeDayOutlierBandOptions,
    private readonly columns: DegreeDayColumns,
  ) {}
  fit(pts: DegreeDayPeriod[]): BandModel<DegreeDayPeriod> {
    return new PeriodModel(fitDegreeDayForm(pts, this.form, this.options, this.columns));
  }
}

/** A degree-day fit as a band model of periods. */
class PeriodModel implements BandModel<DegreeDayPeriod> {
  constructor(private readonly fit: DegreeDayFit) {}
  predictPerDay(p: DegreeDayPeriod): number {
    return this.fit.predictPerDay(p.profile);
  }
}

/**
 * The recommended `usage-outlier` band: variable-base degree-day model (fitDegreeDayModel) with a
 * leave-one-out band (outlierBand), bases re-searched in every leave-one-out fit.
 * Rejection, one bill at a time: choose the form, band the training bills; if any falls
 * outside, drop the one furthest outside (relative to its half-width), choose the form again
 * and repeat, at most ⌈maxRejectedShare · n⌉ times. One at a time because a leak pulls the
 * fit towards itself: dropping everything outside the first band would also drop clean bills
 * the contaminated fit mispredicts (on the demo, all nine summer bills of ASH-W), and choosing
 * the form again keeps a summer leak from passing for cooling. Every target bill, including
 * estimated reads and duplicates left out of the fit, is banded from the final model.
 * @param train actual reads, one bill per period, with enough weather.
 * @param targets every bill that needs a band.
 * @example degreeDayOutlierBand(train, allBills, { tempUnit: "C" }).bands.get("ASH-W-2025-08")
 */
export function degreeDayOutlierBand(
  train: readonly DegreeDayBandBill[],
  targets: readonly DegreeDayBandBill[],
  options: DegreeDayOutlierBandOptions = {},
): DegreeDayOutlierBand {
  const maxShare = options.maxRejectedShare ?? 0.1;
  if (!(maxShare >= 0 && maxShare < 1)) throw new ModelInputError(`maxRejectedShare must be in [0, 1), got ${maxShare}`);
  const maxRejected = Math.max(1, Math.ceil(maxShare * train.length));
  // Every fit below is on a subset of the training bills: their columns are worked out once.
  const columns = new DegreeDayColumns(train);
  const bandOptions = { ...options, rejectionRounds: 0 };
  const rejected: string[] = [];
  let kept = [...train];
  for (;;) {
    const selection = fitDegreeDayModel(kept, options, columns);
    if (!selection.chosen) return { fit: null, tried: selection.tried, bands: new Map(), rejected, band: null, bandOf: () => null };
    // Band the kept bills (to find the worst) and the targets in one pass; ids are shared.
    const keptIds = new Set(kept.map((b) => b.id));
    const toBand = [...kept, ...targets.filter((t) => !keptIds.has(t.id))].map(asBand);
    const refit = new FormRefit(selection.chosen.form, options, columns);
    const res = outlierBand(kept.map(asBand), (pts) => refit.fit(pts), toBand, bandOptions);
    if (!res) return { fit: selection.chosen, tried: selection.tried, bands: new Map(), rejected, band: null, bandOf: () => null };
    let worst: { id: string; excess: number } | null = null;
    for (const b of kept) {
      const band = res.bands.get(b.id)!;
      const used = b.usePerDay * b.days;
      const half = (band.high - band.low) / 2 || Number.MIN_VALUE;
      const excess = used > band.high ? (used - band.high) / half : used < band.low ? (band.low - used) / half : 0;
      if (excess > 0 && (worst === null || excess > worst.excess)) worst = { id: b.id, excess };
    }
    if (worst === null || rejected.length >= maxRejected) {
      const bands = new Map<string, BillBand>();
      for (const t of targets) bands.set(t.id, res.bands.get(t.id)!);
      const { looResiduals, scale, k, effectiveDf } = res;
      const bandOf = (bill: DegreeDayBandBill): BillBand => res.bandOf(asBand(bill));
      return { fit: selection.chosen, tried: selection.tried, bands, rejected, band: { looResiduals, scale, k, effectiveDf }, bandOf };
    }
    rejected.push(worst.id);
    kept = kept.filter((b) => b.id !== worst!.id);
  }
}
