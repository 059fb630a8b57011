/**
 * Next months' usage and cost of one meter, with P10/P50/P90 from scenarios.
 *
 * Scenarios = weather years × model prediction noise (usageScenarios.ts). Every scenario is
 * priced month by month through the tariff (priceMonth.ts) — blocks, demand charges, ratchets
 * and minimum bills are not linear, so the mean usage is never priced in place of the
 * scenarios. Quantiles (quantiles.ts, type 7) are taken per month and, separately, over the
 * scenario totals (the P90 of a year is not the sum of twelve monthly P90s).
 */
import type { Bill, Commodity, IntervalSeries, Meter } from "../domain/types.ts";
import type { ChangePointFit } from "../model/index.ts";
import type { Tariff } from "../tariff/index.ts";
import { bandOf, type Band } from "./quantiles.ts";
import { escalationBase, escalationFactorForMonth } from "./escalation.ts";
import { scenarioTemperatures, scenarioYears, type WeatherYear } from "./weatherYears.ts";
import { fallbackScenarioSetup, modelScenarioSetup, scenariosAt, type ScenarioNoise, type ScenarioSetup, type UsageMethod, type UsageScenarios } from "./usageScenarios.ts";
import { monthColumn, scenarioMatrix, scenarioTotals, NO_SCENARIOS, type ScenarioMatrix } from "./scenarioMatrix.ts";
import { monthShapeFromIntervals, type MonthShape } from "./profile.ts";
import { priceForecastMonth, type MonthPricingContext } from "./priceMonth.ts";
import { kwPerUsePerDayByMonth, recentPowerFactor } from "./billFacts.ts";
import { scenarioUniforms, seedFromString } from "./random.ts";
import { residualByCalendarMonth, type MonthAdjustment } from "./residual.ts";
import { addDays, localMidnightMs, monthsAfter, type CalendarMonth } from "../core/time/index.ts";
import { expectedProblem } from "../core/errors.ts";

export const DEFAULT_SCENARIOS = 300;
export const DEFAULT_SEED = 20_260_101;

export interface MeterForecastInput {
  meter: Meter;
  /** IANA zone of the meter's building. */
  timezone: string;
  tariff: Tariff | null;
  /** Last day of data, `YYYY-MM-DD`; the forecast starts with the next calendar month. */
  asOf: string;
  months: number;
  /** The meter's change-point baseline fitted on data up to asOf; null = fallback. */
  fit: ChangePointFit | null;
  /** Typical temperature per calendar month (index 0 = Jan) in the model's unit; null = fallback. */
  typicalMonthlyTemp: number[] | null;
  /** Typical temperature per calendar month from the station's normals file (model unit); null without one. */
  normalsMonthlyTemp?: number[] | null;
  /** The station's historical weather years (model unit), identical for all meters of a building. */
  weatherYears: WeatherYear[];
  /** The meter's bills up to asOf (fallback usage, demand ratios, power factor). */
  bills: Bill[];
  /** The meter's bills as billed up to asOf, when `bills` carry the audit's corrections. */
  billedBills?: Bill[];
  /** Interval data (before the multiplier), used only before asOf. */
  intervals?: IntervalSeries | null;
  /** Billing demands (kW) of the meter's recent bills, oldest first, for ratchets. */
  previousBillingDemandsKw?: number[];
  /** Hour-of-week share of use from an interval meter of the building (bill-only meters on TOU). */
  loadShapeByHourOfWeek?: number[] | null;
  /** Yearly price drift after the last tariff version (0.03 = 3 %). */
  escalation: number;
  scenarios?: number;
  seed?: number;
  /** Multiplies the prediction noise; 1 = the model's own interval (calibrated by the backtests, backtest.ts). */
  calibration?: number;
  /** Calendar-month adjustment of the change-point forecast (residual.ts); absent = none. */
  adjustment?: MonthAdjustment;
  /**
   * Calendar year of scenario s is scenarioYearOrder[s mod length] (the portfolio's weather years),
   * so every meter of every station draws the same year in scenario s; a station without that year
   * falls back to s mod its own years. Absent: s mod the station's years.
   */
  scenarioYearOrder?: readonly number[];
}

export interface MonthForecast {
  month: string;
  usage: Band;
  cost: Band;
  /** Escalation factor applied to the month's priced totals (1 before/at the last version). */
  escalationFactor: number;
  /** `intervals` = scaled interval shape; `bill` = monthly usage (+ load shape or demand ratio). */
  pricedFrom: "intervals" | "bill";
  /** True when the engine estimated any line (e.g. time-of-use split from a load shape). */
  estimated: boolean;
}

export interface MeterForecast {
  meterId: string;
  buildingId: string;
  commodity: Commodity;
  unit: string;
  method: UsageMethod | "none";
  months: MonthForecast[];
  /** Quantiles of the scenario totals over all forecast months. */
  total: { usage: Band; cost: Band } | null;
  /**
   * Cost of scenario s, month k (for roll-ups that keep scenarios aligned); no scenarios when
   * the meter was not priced. The usage each was priced from is not kept (no page reads it):
   * `meterUsageScenarios` draws it again, identically.
   */
  scenarioCosts: ScenarioMatrix;
  /** Weather-year index of each scenario (−1 = no weather). */
  weatherIndex: Int32Array;
  /** Date escalation compounds from: the later of the last tariff version's start and the day after as-of. */
  escalationFrom: string | null;
  notes: string[];
  /** Why the meter has no forecast (no tariff, no bills, pricing failed); null when it has one. */
  error: string | null;
}

/**
 * Forecasts one meter (see the module comment).
 * @example forecastMeter({ meter, timezone: "America/New_York", tariff, asOf: "2025-12-31", months: 12, fit, typicalMonthlyTemp, weatherYears, bills, escalation: 0.03 })
 */
export function forecastMeter(input: MeterForecastInput): MeterForecast {
  const months = monthsAfter(input.asOf, input.months);
  const scenarios = Math.max(1, Math.floor(input.scenarios ?? DEFAULT_SCENARIOS));
  const calibration = input.calibration ?? 1;
  const base: MeterForecast = {
    meterId: input.meter.meterId,
    buildingId: input.meter.buildingId,
    commodity: input.meter.commodity,
    unit: input.meter.unit,
    method: "none",
    months: [],
    total: null,
    scenarioCosts: NO_SCENARIOS,
    weatherIndex: new Int32Array(0),
    escalationFrom: null,
    notes: [],
    error: null,
  };
  const usage = meterUsageScenarios(input, months, scenarios, calibration);
  if (!usage) return { ...base, error: "no bills to forecast from" };
  base.method = usage.method;
  base.weatherIndex = usage.weatherIndex;
  base.notes.push(usage.note);
  const tariff = input.tariff;
  if (!tariff || tariff.versions.length === 0) return { ...base, error: `tariff '${input.meter.tariffId}' is not available`, ...usageOnly(usage, months) };

  const contexts = meterPricingContexts(input, tariff, months);
  base.escalationFrom = escalationBase(tariff.versions[tariff.versions.length - 1]!.from, input.asOf);
  if (contexts.some((c) => c.shape)) {
    base.notes.push(`interval shape: same calendar month ${contexts.find((c) => c.shape)!.shape!.weeksBack} weeks earlier, scaled to each scenario's usage`);
  }
  const K = months.length;
  const scenarioCosts = scenarioMatrix(scenarios, K);
  const exactByMonth = months.map(() => true);
  const u = usage.usage.values;
  try {
    for (let s = 0; s < scenarios; s++) {
      const previous = [...(input.previousBillingDemandsKw ?? [])];
      for (let k = 0; k < K; k++) {
        const priced = priceForecastMonth(contexts[k]!, u[s * K + k]!, previous);
        scenarioCosts.values[s * K + k] = priced.cost;
        if (!priced.exact) exactByMonth[k] = false;
        if (priced.billingDemandKw !== null) previous.push(priced.billingDemandKw);
      }
    }
  } catch (error) {
    return { ...base, error: `pricing failed: ${expectedProblem(error)}`, ...usageOnly(usage, months) };
  }
  const monthsOut: MonthForecast[] = months.map((m, k) => ({
    month: m.month,
    usage: bandOf(monthColumn(usage.usage, k)),
    cost: bandOf(monthColumn(scenarioCosts, k)),
    escalationFactor: contexts[k]!.escalationFactor,
    pricedFrom: contexts[k]!.shape ? "intervals" : "bill",
    estimated: !exactByMonth[k],
  }));
  return {
    ...base,
    months: monthsOut,
    total: { usage: bandOf(scenarioTotals(usage.usage)), cost: bandOf(scenarioTotals(scenarioCosts)) },
    scenarioCosts,
  };
}

/** The meter's usage scenarios (model or fallback), seeded per meter so every call draws the same numbers. */
export function meterUsageScenarios(input: MeterForecastInput, months: CalendarMonth[], scenarios: number, calibration: number, noise?: ScenarioNoise): UsageScenarios | null {
  const setup = meterScenarioSetup(input, months, scenarios, noise);
  return setup ? scenariosAt(setup, calibration) : null;
}

/**
 * The meter's scenarios for any calibration factor (usageScenarios.ts `ScenarioSetup`); null
 * when it has no bills to forecast from. `noise`: draws of an earlier setup of the same meter
 * and seed, reused when their shape fits.
 */
export function meterScenarioSetup(input: MeterForecastInput, months: CalendarMonth[], scenarios: number, noise?: ScenarioNoise): ScenarioSetup | null {
  const rng = scenarioUniforms(seedFromString(input.meter.meterId, input.seed ?? DEFAULT_SEED));
  if (input.fit && input.typicalMonthlyTemp) {
    const own = scenarioYears(input.weatherYears).map((y) => y.year);
    const order = input.scenarioYearOrder;
    const setOfScenario = order && order.length > 0 && own.length > 0
      ? (s: number) => {
          const i = own.indexOf(order[s % order.length]!);
          return i >= 0 ? i : s % own.length;
        }
      : undefined;
    return modelScenarioSetup({
      setOfScenario,
      fit: input.fit,
      typicalMonthlyTemp: input.typicalMonthlyTemp,
      temperatureSets: scenarioTemperatures(input.typicalMonthlyTemp, input.weatherYears),
      months,
      scenarios,
      rng,
      residualPerDay: input.adjustment ? residualByCalendarMonth(input.fit, input.bills, input.weatherYears, input.asOf, input.adjustment) : null,
      noise,
    });
  }
  return fallbackScenarioSetup({ bills: input.bills, months, scenarios, rng, noise });
}

/** Months with usage bands but no cost (the meter could not be priced). */
function usageOnly(usage: UsageScenarios, months: CalendarMonth[]): Pick<MeterForecast, "months"> {
  return {
    months: months.map((m, k) => ({
      month: m.month,
      usage: bandOf(monthColumn(usage.usage, k)),
      cost: { p10: NaN, p50: NaN, p90: NaN },
      escalationFactor: 1,
      pricedFrom: "bill" as const,
      estimated: true,
    })),
  };
}

/** How each forecast month of the meter is priced (shape, demand ratio, power factor, escalation). */
export function meterPricingContexts(input: MeterForecastInput, tariff: Tariff, months: CalendarMonth[], minYearsBack = 1): MonthPricingContext[] {
  // Interval readings after the as-of day are not used (a backtest must not see its future).
  const untilMs = localMidnightMs(addDays(input.asOf, 1), input.timezone);
  const kw = kwPerUsePerDayByMonth(input.bills);
  const pf = recentPowerFactor(input.bills);
  const escalationFrom = escalationBase(tariff.versions[tariff.versions.length - 1]!.from, input.asOf);
  return months.map((m) => {
    const shape: MonthShape | null = input.intervals ? monthShapeFromIntervals(input.intervals, input.timezone, m, untilMs, 3, minYearsBack) : null;
    return {
      tariff,
      timezone: input.timezone,
      usageUnit: input.meter.unit,
      month: m,
      shape,
      loadShapeByHourOfWeek: input.loadShapeByHourOfWeek ?? null,
      kwPerUsePerDay: kw ? kw[m.calendarMonth - 1]! : null,
      powerFactor: pf,
      escalationFactor: escalationFactorForMonth(input.escalation, escalationFrom, m),
    };
  });
}
