/**
 * Usage scenarios of one meter for the forecast months.
 *
 * With a change-point model (use per day vs mean temperature, fitted on bills weighted by
 * billing days), scenario s of month k:
 *
 *   usePerDay = ŷ(T_s,k) + c · λ_s · ( z0_s · SEmean(T) + z_s,k · sqrt(SEpred(T)² − SEmean(T)²) )
 *   usage     = max(0, usePerDay) · days in month
 *
 * (plus, when chosen, the calendar month's adjustment r_m of residual.ts inside the max).
 * T_s,k is the scenario temperature (weather year w = s mod W, see weatherYears.ts); SEpred and
 * SEmean come from the fit's prediction interval for a period of that many days; z0 (shared by
 * the scenario's months: the fitted line is uncertain as a whole) and z_s,k (each month's own
 * scatter) are standard normals; λ_s = sqrt(df/V), V ~ χ²(n − p), makes each month's error a
 * Student-t with n − p degrees of freedom scaled by SEpred — the model's own prediction
 * interval; c is the calibration factor (1 = as the model says).
 *
 * Without a model (too few bills, no weather, no typical year) the fallback is the same
 * calendar month's use per day averaged over the history (bills spread over months by days),
 * with a relative scatter estimated from how that month varied between years (pooled over
 * months; 10 % when no month was seen twice), drawn the same way.
 */
import type { Bill } from "../domain/types.ts";
import type { ChangePointFit } from "../model/index.ts";
import { spreadBillsByMonth } from "./months.ts";
import { standardNormal, studentScale, type Uniform } from "./random.ts";
import { type CalendarMonth } from "../core/time/index.ts";
import { scenarioMatrix, type ScenarioMatrix } from "./scenarioMatrix.ts";

/** Relative scatter assumed for the fallback when no calendar month appears in two years. */
const FALLBACK_DEFAULT_RELATIVE_SD = 0.1;

export type UsageMethod = "change-point" | "same-month-average";

export interface UsageScenarios {
  method: UsageMethod;
  /** Scenario s, forecast month k, meter unit. */
  usage: ScenarioMatrix;
  /** Weather year index used by each scenario (−1 without weather). */
  weatherIndex: Int32Array;
  /** Use per day at typical temperature (or the fallback average), per forecast month. */
  typicalUsePerDay: number[];
  /** Words for the page: how the noise was drawn. */
  note: string;
  /** The draws used (to pass back as `noise` for another calibration, basis or adjustment). */
  noise: ScenarioNoise;
}

export interface ModelUsageOptions {
  fit: ChangePointFit;
  /** Typical temperature per calendar month (index 0 = Jan), model unit. */
  typicalMonthlyTemp: readonly number[];
  /** Scenario temperature sets (each 12 monthly values), from scenarioTemperatures. */
  temperatureSets: readonly (readonly number[])[];
  months: readonly CalendarMonth[];
  scenarios: number;
  calibration: number;
  rng: Uniform;
  /** Calendar-month adjustment of use per day (index 0 = January; residual.ts); absent = none. */
  residualPerDay?: readonly number[] | null;
  /** Temperature set of scenario s; default s mod the number of sets. */
  setOfScenario?: (s: number) => number;
  /** The draws, when already made from the same generator state (drawScenarioNoise); default drawn from `rng`. */
  noise?: ScenarioNoise;
}

/**
 * The random draws of a meter's scenarios, in the order the generator gives them: for each
 * scenario λ_s (studentScale), then z0_s (model only), then z_s,k for each month. They depend
 * only on the seed, the degrees of freedom and the counts, not on temperatures, calibration or
 * adjustment, so the backtests draw them once per meter and origin and reuse them for every
 * weather basis, adjustment and noise factor: the same numbers as drawing anew each time.
 */
export interface ScenarioNoise {
  df: number;
  scenarios: number;
  months: number;
  lambda: Float64Array;
  /** Null for the fallback (no shared draw). */
  z0: Float64Array | null;
  /** z_s,k at s · months + k. */
  z: Float64Array;
}

/**
 * Draws the noise of `scenarios` × `months` (see ScenarioNoise), consuming `rng` exactly as
 * the scenario loops did.
 * @example drawScenarioNoise(scenarioUniforms(1), 10, 300, 12, true).z.length // 3600
 */
export function drawScenarioNoise(rng: Uniform, df: number, scenarios: number, months: number, shared: boolean): ScenarioNoise {
  const lambda = new Float64Array(scenarios);
  const z0 = shared ? new Float64Array(scenarios) : null;
  const z = new Float64Array(scenarios * months);
  for (let s = 0; s < scenarios; s++) {
    lambda[s] = studentScale(rng, df);
    if (z0) z0[s] = standardNormal(rng);
    for (let k = 0; k < months; k++) z[s * months + k] = standardNormal(rng);
  }
  return { df, scenarios, months, lambda, z0, z };
}

function noiseFits(noise: ScenarioNoise | undefined, df: number, scenarios: number, months: number, shared: boolean): noise is ScenarioNoise {
  return noise !== undefined && noise.df === df && noise.scenarios === scenarios && noise.months === months && (noise.z0 !== null) === shared;
}

/**
 * A meter's scenarios prepared for any calibration factor: everything but c of the module
 * comment's formula is fixed (prediction intervals, adjustment, weather years, draws), so the
 * backtests that try a grid of factors prepare once and call `at(c)` for each.
 */
export interface ScenarioSetup {
  method: UsageMethod;
  noise: ScenarioNoise;
  weatherIndex: Int32Array;
  typicalUsePerDay: number[];
  /** The usage at calibration factor c (a new matrix). */
  at(calibration: number): ScenarioMatrix;
  /** Words for the page at factor c. */
  note(calibration: number): string;
}

/** The scenarios of a setup at one factor. */
export function scenariosAt(setup: ScenarioSetup, calibration: number): UsageScenarios {
  return {
    method: setup.method,
    usage: setup.at(calibration),
    noise: setup.noise,
    weatherIndex: setup.weatherIndex,
    typicalUsePerDay: setup.typicalUsePerDay,
    note: setup.note(calibration),
  };
}

/** Usage scenarios from a change-point model (see the module comment for the formula). */
export function modelUsageScenarios(o: ModelUsageOptions): UsageScenarios {
  return scenariosAt(modelScenarioSetup(o), o.calibration);
}

/** The change-point scenarios of `o`, for any factor (`o.calibration` is not read). */
export function modelScenarioSetup(o: Omit<ModelUsageOptions, "calibration">): ScenarioSetup {
  const { fit, months } = o;
  const df = Math.max(1, fit.stats.n - fit.parameterCount);
  const weatherIndex = new Int32Array(o.scenarios);
  // Each month sees only as many temperatures as there are weather years: compute the
  // prediction interval once per (weather year, month).
  const bands = o.temperatureSets.map((temps) =>
    months.map((m) => {
      const band = fit.predictWithInterval(temps[m.calendarMonth - 1]!, 0.8, m.days);
      return { fit: band.fit, seMean: band.seMean, own: Math.sqrt(Math.max(0, band.sePrediction ** 2 - band.seMean ** 2)) };
    }),
  );
  const K = months.length;
  const S = o.scenarios;
  const noise = noiseFits(o.noise, df, S, K, true) ? o.noise : drawScenarioNoise(o.rng, df, S, K, true);
  const residual = months.map((m) => o.residualPerDay?.[m.calendarMonth - 1] ?? 0);
  for (let s = 0; s < S; s++) weatherIndex[s] = o.setOfScenario ? o.setOfScenario(s) : s % o.temperatureSets.length;
  return {
    method: "change-point",
    noise,
    weatherIndex,
    typicalUsePerDay: months.map((m) => fit.predict(o.typicalMonthlyTemp[m.calendarMonth - 1]!) + (o.residualPerDay?.[m.calendarMonth - 1] ?? 0)),
    at(calibration) {
      const usage = scenarioMatrix(S, K);
      for (let s = 0; s < S; s++) {
        const lambda = noise.lambda[s]!;
        const z0 = noise.z0![s]!;
        const row = bands[weatherIndex[s]!]!;
        for (let k = 0; k < K; k++) {
          const band = row[k]!;
          const z = noise.z[s * K + k]!;
          const perDay = band.fit + residual[k]! + calibration * lambda * (z0 * band.seMean + z * band.own);
          usage.values[s * K + k] = Math.max(0, perDay) * months[k]!.days;
        }
      }
      return usage;
    },
    note: (calibration) => `${fit.kind} change-point model at ${o.temperatureSets.length} weather year(s); prediction noise Student-t with ${df} df × calibration ${calibration}`,
  };
}

export interface FallbackUsageOptions {
  bills: readonly Bill[];
  months: readonly CalendarMonth[];
  scenarios: number;
  calibration: number;
  rng: Uniform;
  /** As in ModelUsageOptions. */
  noise?: ScenarioNoise;
}

/**
 * Same-calendar-month average use per day, with relative noise (see the module comment).
 * Returns null when the meter has no usable bills at all.
 */
export function fallbackUsageScenarios(o: FallbackUsageOptions): UsageScenarios | null {
  const setup = fallbackScenarioSetup(o);
  return setup ? scenariosAt(setup, o.calibration) : null;
}

/** The fallback scenarios of `o`, for any factor (`o.calibration` is not read); null without usable bills. */
export function fallbackScenarioSetup(o: Omit<FallbackUsageOptions, "calibration">): ScenarioSetup | null {
  const spread = [...spreadBillsByMonth(o.bills, (b) => b.usage).values()].filter((m) => m.coveredDays >= 0.9 * m.days);
  if (spread.length === 0) return null;
  const byCalendar = new Map<number, number[]>();
  for (const m of spread) {
    const cm = Number(m.month.slice(5, 7));
    const perDay = m.amount / m.coveredDays;
    byCalendar.set(cm, [...(byCalendar.get(cm) ?? []), perDay]);
  }
  const all = spread.map((m) => m.amount / m.coveredDays);
  const overall = all.reduce((a, b) => a + b, 0) / all.length;
  const meanOf = (cm: number): number => {
    const xs = byCalendar.get(cm);
    return xs && xs.length > 0 ? xs.reduce((a, b) => a + b, 0) / xs.length : overall;
  };
  // Pooled relative deviation from each calendar month's mean, with one df lost per month mean.
  let ss = 0;
  let count = 0;
  let groups = 0;
  for (const [cm, xs] of byCalendar) {
    if (xs.length < 2) continue;
    groups++;
    const mu = meanOf(cm);
    for (const x of xs) {
      if (mu > 0) {
        ss += (x / mu - 1) ** 2;
        count++;
      }
    }
  }
  const df = count - groups;
  const relSd = df >= 1 ? Math.sqrt(ss / df) : FALLBACK_DEFAULT_RELATIVE_SD;
  // studentScale returns 1 without a draw for df < 1, as the fallback wants.
  const K = o.months.length;
  const S = o.scenarios;
  const noise = noiseFits(o.noise, df, S, K, false) ? o.noise : drawScenarioNoise(o.rng, df, S, K, false);
  const means = o.months.map((m) => meanOf(m.calendarMonth));
  return {
    method: "same-month-average",
    noise,
    weatherIndex: new Int32Array(S).fill(-1),
    typicalUsePerDay: means,
    at(calibration) {
      const usage = scenarioMatrix(S, K);
      for (let s = 0; s < S; s++) {
        const lambda = noise.lambda[s]!;
        for (let k = 0; k < K; k++) {
          usage.values[s * K + k] = Math.max(0, means[k]! * (1 + calibration * lambda * relSd * noise.z[s * K + k]!)) * o.months[k]!.days;
        }
      }
      return usage;
    },
    note: (calibration) =>
      `no weather model: same calendar month's use per day averaged over the history; relative scatter ${(relSd * 100).toFixed(1)} %${df >= 1 ? ` (Student-t, ${df} df)` : " (assumed)"} × calibration ${calibration}`,
  };
}
