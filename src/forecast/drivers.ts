/**
 * Why next year's cost differs from last year's, per building: a stated decomposition that adds
 * up exactly to the change.
 *
 * Months compared: the last 12 calendar months up to as-of that the bills cover completely,
 * each paired with the forecast month a year later. Over those months, per meter:
 *
 *   change  = F − A
 *     A = billed cost last year (bills spread by days)
 *     F = forecast P50 (for a building: the median of the scenario sums over its meters)
 *   rates   = P_next(U_last) − P_last(U_last)
 *     U_last = last year's billed usage per month (spread by days); P_next prices it as the
 *     forecast month (next year's versions and escalation), P_last as the month it was used
 *     (the versions then in force), both through the same engine and shapes
 *   weather = P_next(ŷ(T_typical) · days) − P_next(ŷ(T_last) · days)
 *     ŷ = the meter's change-point model, T_last = last year's mean temperature of the month;
 *     0 for meters without a model, and for months without last year's temperature
 *   billing errors corrected = A − A_billed
 *     A is last year as it should have been: the audit's corrected bills where it found money
 *     errors (correctedBills.ts); A_billed is what was billed. A duplicate or an overcharge last
 *     year makes this negative: it will not recur.
 *   usage trend = F − A − rates − weather   (the residual: real changes in use, model bias,
 *     demand and ratchet effects — never a billing error)
 *
 * The change shown is against what was billed: change = F − A_billed
 *   = billing errors corrected + weather + rates + usage trend.
 */
import type { Bill } from "../domain/types.ts";
import type { Tariff } from "../tariff/index.ts";
import { meterPricingContexts, type MeterForecast, type MeterForecastInput } from "./forecastMeter.ts";
import { spreadBillsByMonth } from "./months.ts";
import { priceForecastMonth, type MonthPricingContext } from "./priceMonth.ts";
import { billsKnownAt } from "./portfolioInputs.ts";
import { bandOf } from "./quantiles.ts";
import { valueAt } from "./scenarioMatrix.ts";
import { addDays, calendarMonth, shiftMonth, type CalendarMonth } from "../core/time/index.ts";

export interface ChangeDrivers {
  /** Months compared (last year's complete months). */
  months: string[];
  /** Last year as it should have been (corrected bills). */
  lastYearCost: number;
  /** Last year as billed. */
  lastYearBilledCost: number;
  forecastCost: number;
  change: number;
  weather: number;
  rates: number;
  /** Corrected − billed last year (0 when the audit corrected nothing in those months). */
  billingErrors: number;
  usageTrend: number;
}

export interface MeterDrivers extends ChangeDrivers {
  meterId: string;
  /** Why a meter was left out (no forecast, no priced month), else null. */
  note: string | null;
}

export interface BuildingDrivers extends ChangeDrivers {
  buildingId: string;
  meters: MeterDrivers[];
}

const ZERO: ChangeDrivers = { months: [], lastYearCost: 0, lastYearBilledCost: 0, forecastCost: 0, change: 0, weather: 0, rates: 0, billingErrors: 0, usageTrend: 0 };

/**
 * Drivers of one meter (see the module comment). `forecast` must come from `input`.
 * @example meterChangeDrivers(input, forecastMeter(input)).rates // next year's rates on last year's use, minus last year's
 */
export function meterChangeDrivers(input: MeterForecastInput, forecast: MeterForecast): MeterDrivers & { scenarioSums: Float64Array | null } {
  const none = (note: string) => ({ ...ZERO, meterId: input.meter.meterId, note, scenarioSums: null });
  if (forecast.error !== null || !input.tariff) return none(forecast.error ?? "no tariff");
  const tariff: Tariff = input.tariff;
  const bills = billsKnownAt(input.bills, input.asOf);
  const cost = spreadBillsByMonth(bills, (b: Bill) => b.total);
  const billedCost = input.billedBills ? spreadBillsByMonth(billsKnownAt(input.billedBills, input.asOf), (b: Bill) => b.total) : cost;
  const usage = spreadBillsByMonth(bills, (b: Bill) => b.usage);
  const pairs: { last: CalendarMonth; k: number }[] = [];
  forecast.months.forEach((m, k) => {
    const last = calendarMonth(shiftMonth(m.month, -12));
    const c = cost.get(last.month);
    if (c && c.coveredDays >= c.days && last.end <= addDays(input.asOf, 1)) pairs.push({ last, k });
  });
  if (pairs.length === 0) return none("no complete month last year");
  const nextCtx = meterPricingContexts(input, tariff, pairs.map((p) => calendarMonth(forecast.months[p.k]!.month)));
  const lastCtx = meterPricingContexts(input, tariff, pairs.map((p) => p.last), 0);
  const prev = input.previousBillingDemandsKw ?? [];
  const price = (ctx: MonthPricingContext, u: number): number => priceForecastMonth(ctx, Math.max(0, u), [...prev]).cost;
  let A = 0;
  let billed = 0;
  let rates = 0;
  let weather = 0;
  pairs.forEach((p, i) => {
    A += cost.get(p.last.month)!.amount;
    billed += billedCost.get(p.last.month)?.amount ?? 0;
    const uLast = usage.get(p.last.month)!.amount;
    rates += price(nextCtx[i]!, uLast) - price(lastCtx[i]!, uLast);
    const tLast = input.weatherYears.find((y) => y.year === Number(p.last.month.slice(0, 4)))?.monthlyTemp[p.last.calendarMonth - 1];
    if (input.fit && input.typicalMonthlyTemp && tLast !== undefined && Number.isFinite(tLast)) {
      const days = nextCtx[i]!.month.days;
      const typical = input.fit.predict(input.typicalMonthlyTemp[p.last.calendarMonth - 1]!) * days;
      const actualWeather = input.fit.predict(tLast) * days;
      weather += price(nextCtx[i]!, typical) - price(nextCtx[i]!, actualWeather);
    }
  });
  const costs = forecast.scenarioCosts;
  const scenarioSums = new Float64Array(costs.scenarios);
  for (let s = 0; s < costs.scenarios; s++) scenarioSums[s] = pairs.reduce((sum, p) => sum + valueAt(costs, s, p.k), 0);
  const F = bandOf(scenarioSums).p50;
  return {
    meterId: input.meter.meterId,
    months: pairs.map((p) => p.last.month),
    lastYearCost: A,
    lastYearBilledCost: billed,
    forecastCost: F,
    change: F - billed,
    weather,
    rates,
    billingErrors: A - billed,
    usageTrend: F - A - weather - rates,
    note: null,
    scenarioSums,
  };
}

/**
 * Drivers of one building: sums of its meters' last-year cost, weather and rates; the forecast
 * is the median of the scenario sums across meters (scenario-aligned, see rollup.ts), and the
 * usage trend the residual, so the four drivers add up to the building's change against what was billed.
 */
export function buildingChangeDrivers(
  buildingId: string,
  inputs: readonly MeterForecastInput[],
  forecasts: readonly MeterForecast[],
  /** Meter i's drivers from `compute` or remembered (a build's cache); default: computed. */
  remember: (i: number, compute: () => ReturnType<typeof meterChangeDrivers>) => ReturnType<typeof meterChangeDrivers> = (_i, compute) => compute(),
): BuildingDrivers {
  const perMeter = inputs.map((input, i) => remember(i, () => meterChangeDrivers(input, forecasts[i]!)));
  const used = perMeter.filter((m) => m.scenarioSums !== null);
  const meters: MeterDrivers[] = perMeter.map(({ scenarioSums: _unused, ...rest }) => rest);
  if (used.length === 0) return { ...ZERO, buildingId, meters };
  const n = Math.min(...used.map((m) => m.scenarioSums!.length));
  const sums = new Float64Array(n);
  for (const m of used) for (let s = 0; s < n; s++) sums[s] += m.scenarioSums![s]!;
  const A = used.reduce((s, m) => s + m.lastYearCost, 0);
  const billed = used.reduce((s, m) => s + m.lastYearBilledCost, 0);
  const F = bandOf(sums).p50;
  const weather = used.reduce((s, m) => s + m.weather, 0);
  const rates = used.reduce((s, m) => s + m.rates, 0);
  const months = [...new Set(used.flatMap((m) => m.months))].sort();
  return {
    buildingId, months, lastYearCost: A, lastYearBilledCost: billed, forecastCost: F, change: F - billed, weather, rates,
    billingErrors: A - billed, usageTrend: F - A - weather - rates, meters,
  };
}
