/**
 * Builds each meter's forecast input from a portfolio as it stood on an as-of date: bills that
 * ended after it, weather and interval readings after it are cut off, and the baseline is
 * refitted on what is left (so the track record's "forecast made a year earlier" sees only
 * what was known then).
 */
import type { Bill, Building, IntervalSeries, Meter, Portfolio, WeatherSeries } from "../domain/types.ts";
import type { Tariff } from "../tariff/index.ts";
import { priceBill } from "../tariff/index.ts";
import { fitForecastBaseline, typicalMonthlyTempC, type MeterBaseline } from "../model/index.ts";
import { priceMeterBills, pricingOrder, samePricingFields } from "../tariff/index.ts";
import { loadShapeByHourOfWeek } from "./profile.ts";
import { weatherYears, type WeatherYear } from "./weatherYears.ts";
import type { MeterForecastInput } from "./forecastMeter.ts";
import { typicalForBasis, type WeatherBasisId } from "./weatherBasis.ts";
import type { MonthAdjustment } from "./residual.ts";
import { addDays, localMidnightMs } from "../core/time/index.ts";
import { lowerBound } from "../core/sorted.ts";
import { cToF } from "../core/units.ts";
import { noMemo, type Memo } from "../core/memo.ts";
import { contentDigestOf, contentHash, withContentDigest } from "../core/contentHash.ts";

const HOUR_MS = 3_600_000;

export interface ForecastRunOptions {
  /**
   * Baselines already fitted on the same data (by meter id), to skip refitting. Only for the
   * real forecast: the backtest must refit on truncated data, so it never passes these.
   */
  baselines?: ReadonlyMap<string, Pick<MeterBaseline, "fit" | "typicalMonthlyTemp">>;
  /** Last day of data, `YYYY-MM-DD`. */
  asOf: string;
  /** Forecast horizon in calendar months (portfolio.yaml `forecast_months`). */
  months: number;
  scenarios?: number;
  seed?: number;
  calibration?: number;
  /** Noise factor per meter (overrides `calibration`): meters without a track record keep 1. */
  calibrationByMeter?: ReadonlyMap<string, number>;
  /** The bills as billed, when `portfolio.bills` carry the audit's corrections (drivers show the difference). */
  billedBills?: readonly Bill[];
  /** Weather basis for the typical year (weatherBasis.ts); absent = the baseline's own typical year. */
  basis?: WeatherBasisId;
  /** Calendar-month adjustment (residual.ts); absent = none. */
  adjustment?: MonthAdjustment;
  /**
   * Each meter's forecast is a pure function of its input: a build with a cache keeps it here,
   * so a rebuild prices only the meters whose inputs changed. Default: none.
   */
  memo?: Memo;
  /**
   * The analysis's billed-basis pricing of the portfolio's bills as read (before the audit's
   * corrections), so the ratchet history need not be priced again at every origin: used for a
   * meter only where it gives the very numbers re-pricing would (see `analysedBillingDemands`).
   */
  analysed?: AnalysedPricing;
}

/** Bills as the analysis priced them and each one's billing demand (kW; null when none or not priced). */
export interface AnalysedPricing {
  /** The portfolio's bills before corrections, in file order. */
  bills: readonly Bill[];
  /** Bill id → the billed-basis recomputation's billing demand; absent = not priced by the analysis. */
  billingDemandKw: ReadonlyMap<string, number | null>;
}

/**
 * The analysis's pricing in the form `analysed` takes: each bill's billed-basis billing demand.
 * Undefined when bill ids repeat in `bills` (the analysis's results are keyed by id, so a
 * repeated id could read another bill's result).
 */
export function analysedPricing(bills: readonly Bill[], priced: ReadonlyMap<string, { computed: { billingDemandKw: number | null } | null }>): AnalysedPricing | undefined {
  if (new Set(bills.map((b) => b.billId)).size !== bills.length) return undefined;
  const billingDemandKw = new Map<string, number | null>();
  for (const [id, p] of priced) billingDemandKw.set(id, p.computed?.billingDemandKw ?? null);
  return { bills, billingDemandKw };
}

/** Bills whose period ends by the day after `asOf` (the ingest rule for as_of). */
export function billsKnownAt(bills: readonly Bill[], asOf: string): Bill[] {
  const limit = addDays(asOf, 1);
  return bills.filter((b) => b.periodEnd <= limit);
}

/**
 * A meter's bills, in file order. Grouped once per bill list (keyed by the list itself, which no
 * stage changes once made): the backtests ask for every meter at every origin, and filtering the
 * whole portfolio's bills each time grew with meters × bills.
 */
const billsByMeterOf = new WeakMap<readonly Bill[], Map<string, Bill[]>>();
function billsOfMeter(bills: readonly Bill[], meterId: string): Bill[] {
  let byMeter = billsByMeterOf.get(bills);
  if (!byMeter) {
    byMeter = new Map();
    for (const b of bills) {
      const list = byMeter.get(b.meterId);
      if (list) list.push(b);
      else byMeter.set(b.meterId, [b]);
    }
    billsByMeterOf.set(bills, byMeter);
  }
  return byMeter.get(meterId) ?? [];
}

/** The hourly series cut before `untilMs`. */
function weatherBefore(w: WeatherSeries | undefined, untilMs: number): WeatherSeries | undefined {
  if (!w) return undefined;
  const hours = Math.max(0, Math.min(w.tempC.length, Math.ceil((untilMs - w.startMs) / HOUR_MS)));
  return { ...w, tempC: w.tempC.subarray(0, hours), filled: w.filled.subarray(0, hours) };
}

/**
 * Interval readings starting before `untilMs`. A series with a content digest (withContentDigest)
 * gives a cut with one too, made from the series' digest and the cut's length (the cut is its
 * first n readings), so the forecast keys of every origin do not hash the readings again.
 */
function intervalsBefore(s: IntervalSeries | undefined, untilMs: number): IntervalSeries | undefined {
  if (!s) return undefined;
  const n = lowerBound(s.startMs, untilMs);
  if (n === 0) return undefined;
  const cut = { ...s, startMs: s.startMs.subarray(0, n), values: s.values.subarray(0, n) };
  const whole = contentDigestOf(s);
  return whole === undefined ? cut : withContentDigest(cut, contentHash(["first readings", whole, n]));
}

/**
 * weatherYears of a station's series cut at `untilMs`, made once per series, zone, unit and cut:
 * the buildings on one station ask for the same years at every origin. Frozen, as they are
 * shared by every meter's input (a change would throw, not leak into another meter).
 */
const weatherYearsByStation = new WeakMap<WeatherSeries, Map<string, WeatherYear[]>>();
function weatherYearsOnce(station: WeatherSeries | undefined, cut: WeatherSeries | undefined, zone: string, unit: "C" | "F", untilMs: number): WeatherYear[] {
  if (!station) return weatherYears(cut, zone, unit, untilMs);
  let byCut = weatherYearsByStation.get(station);
  if (!byCut) weatherYearsByStation.set(station, (byCut = new Map()));
  const key = `${zone}\0${unit}\0${untilMs}`;
  let years = byCut.get(key);
  if (!years) {
    years = weatherYears(cut, zone, unit, untilMs);
    for (const y of years) Object.freeze(Object.freeze(y).monthlyTemp);
    byCut.set(key, Object.freeze(years) as WeatherYear[]);
  }
  return years;
}

function hasRatchetOrDemand(tariff: Tariff | undefined): boolean {
  return !!tariff?.versions.some((v) => v.charges.some((c) => c.kind === "demand"));
}

/**
 * Forecast inputs of every meter of `building` as of `options.asOf`.
 * Ratchet history: the billing demands of the last 12 known bills, re-priced through the tariff.
 * Load shape for bill-only meters: hour-of-week shape of the building's first interval meter of
 * the same commodity; interval meters use their own for months their data cannot shape.
 */
export function buildingForecastInputs(portfolio: Portfolio<Tariff>, building: Building, options: ForecastRunOptions): MeterForecastInput[] {
  const untilMs = localMidnightMs(addDays(options.asOf, 1), building.timezone);
  const tempUnit = portfolio.settings.degreeDayBase.unit;
  const weather = weatherBefore(portfolio.weather.get(building.weatherStation), untilMs);
  const normals = portfolio.normals.get(building.weatherStation);
  const years = weatherYearsOnce(portfolio.weather.get(building.weatherStation), weather, building.timezone, tempUnit, untilMs);
  const normalsC = normals ? typicalMonthlyTempC(normals, building.timezone) : null;
  const normalsMonthlyTemp = normalsC ? normalsC.map((t) => (tempUnit === "F" ? cToF(t) : t)) : null;
  const meters = portfolio.meters.filter((m) => m.buildingId === building.buildingId);
  const series = new Map<string, IntervalSeries>();
  for (const m of meters) {
    const s = intervalsBefore(portfolio.intervals.get(m.meterId), untilMs);
    if (s) series.set(m.meterId, s);
  }
  // One hour-of-week shape per interval meter, shared by the bill-only meters that borrow it.
  const shapes = new Map<string, number[] | null>();
  const shapeOf = (meter: Meter): number[] | null => {
    const donorId = series.has(meter.meterId)
      ? meter.meterId
      : meters.find((m) => m.commodity === meter.commodity && series.has(m.meterId))?.meterId;
    if (donorId === undefined) return null;
    if (!shapes.has(donorId)) shapes.set(donorId, loadShapeByHourOfWeek(series.get(donorId)!, building.timezone, untilMs));
    return shapes.get(donorId)!;
  };
  return meters.map((meter) => {
    const bills = billsKnownAt(billsOfMeter(portfolio.bills, meter.meterId), options.asOf);
    const baseline = options.baselines?.get(meter.meterId) ?? fitForecastBaseline({ meter, building, bills, weather, normals, tempUnit }, options.memo);
    const tariff = portfolio.tariffs.get(meter.tariffId) ?? null;
    return {
      meter,
      timezone: building.timezone,
      tariff,
      asOf: options.asOf,
      months: options.months,
      fit: baseline.fit,
      typicalMonthlyTemp: options.basis && baseline.fit ? typicalForBasis(options.basis, years, normalsMonthlyTemp) ?? baseline.typicalMonthlyTemp : baseline.typicalMonthlyTemp,
      normalsMonthlyTemp,
      weatherYears: years,
      bills,
      billedBills: options.billedBills ? billsKnownAt(billsOfMeter(options.billedBills, meter.meterId), options.asOf) : undefined,
      intervals: series.get(meter.meterId) ?? null,
      previousBillingDemandsKw: hasRatchetOrDemand(tariff ?? undefined) ? ratchetHistory(portfolio, meter, bills, tariff!, building.timezone, series.get(meter.meterId), options.analysed, options.memo) : [],
      loadShapeByHourOfWeek: shapeOf(meter),
      escalation: portfolio.settings.escalation[meter.commodity] ?? 0,
      scenarios: options.scenarios,
      seed: options.seed,
      calibration: options.calibrationByMeter?.get(meter.meterId) ?? options.calibration,
      adjustment: options.adjustment,
    };
  });
}

/**
 * `recentBillingDemands` read from the analysis's pricing instead of pricing again, or null when
 * that could differ. Pricing a bill reads only its own period's intervals (the same in the
 * series cut at the origin), its own pricing fields (PRICING_FIELDS) and the billing demands of
 * the bills before it in pricing order, so when the known bills are, field for field, the first
 * bills of the meter's pricing order as the analysis priced them (no correction of usage or
 * demand, removal or addition among them, none of the analysed ones ordered between them left
 * out; a corrected total alone changes nothing pricing reads), each one's billing demand is the
 * analysis's. Bill ids must be unique within the meter (results are keyed by id) and every known
 * bill priced.
 * @example analysedBillingDemands(known, analysedBillsOfMeter, demandsById) // [412.5, 430, …] or null
 */
export function analysedBillingDemands(known: readonly Bill[], analysedBills: readonly Bill[] | undefined, billingDemandKw: ReadonlyMap<string, number | null> | undefined): number[] | null {
  if (!analysedBills || !billingDemandKw || known.length > analysedBills.length) return null;
  const ordered = pricingOrder(known);
  const all = pricingOrder(analysedBills);
  if (new Set(all.map((b) => b.billId)).size !== all.length) return null;
  const demands: number[] = [];
  for (let i = 0; i < ordered.length; i++) {
    if (!samePricingFields(ordered[i]!, all[i]!) || !billingDemandKw.has(ordered[i]!.billId)) return null;
    const d = billingDemandKw.get(ordered[i]!.billId);
    if (d !== null && d !== undefined) demands.push(d);
  }
  return demands.slice(-12);
}

/**
 * The billing demands of the last 12 of `known` (the meter's bills known at an origin, from
 * `portfolio.bills`), oldest first: recentBillingDemands's numbers, read from the analysis's
 * pricing or from the meter's bills priced once where that gives the very same numbers
 * (analysedBillingDemands), priced again only where neither does. `series` is the meter's
 * interval data as seen at the origin (readings before it).
 */
export function ratchetHistory(portfolio: Portfolio<Tariff>, meter: Meter, known: Bill[], tariff: Tariff, timezone: string, series: IntervalSeries | undefined, analysed?: AnalysedPricing, memo?: Memo): number[] {
  return analysedBillingDemands(known, analysed && billsOfMeter(analysed.bills, meter.meterId), analysed?.billingDemandKw)
    ?? analysedBillingDemands(known, billsOfMeter(portfolio.bills, meter.meterId), pricedOnce(portfolio, meter, tariff, timezone, memo))
    ?? recentBillingDemands(meter, known, tariff, timezone, series);
}

/**
 * Every bill of `meter` in `portfolio` priced once (billed basis, the meter's whole series),
 * each one's billing demand by bill id: at every origin and in the forecast itself the known
 * bills are mostly the first ones of that pricing order, so analysedBillingDemands reads their
 * history from here instead of pricing them again (the same argument as for the analysis's
 * pricing). Kept per portfolio object (the backtests and the forecast share one; no stage
 * changes a portfolio once made), and in `memo` between builds: a function of the meter, its
 * bills, tariff, zone and readings alone.
 */
const pricedOnceByPortfolio = new WeakMap<Portfolio<Tariff>, Map<string, Map<string, number | null>>>();
function pricedOnce(portfolio: Portfolio<Tariff>, meter: Meter, tariff: Tariff, timezone: string, memo: Memo = noMemo): Map<string, number | null> {
  let byMeter = pricedOnceByPortfolio.get(portfolio);
  if (!byMeter) pricedOnceByPortfolio.set(portfolio, (byMeter = new Map()));
  let demands = byMeter.get(meter.meterId);
  if (!demands) {
    const bills = billsOfMeter(portfolio.bills, meter.meterId);
    const series = portfolio.intervals.get(meter.meterId);
    demands = memo("meter-billing-demands", { meter, bills, tariff, timezone, series }, () => {
      const priced = priceMeterBills({ meter, bills, timezone, series, price: (r) => priceBill(tariff, r), meteredBasis: false });
      return new Map([...priced].map(([id, p]) => [id, p.computed?.billingDemandKw ?? null]));
    });
    byMeter.set(meter.meterId, demands);
  }
  return demands;
}

/** Billing demands of the last 12 bills (oldest first), from re-pricing the known bills in order. */
export function recentBillingDemands(meter: Meter, bills: Bill[], tariff: Tariff, timezone: string, series: IntervalSeries | undefined): number[] {
  const priced = priceMeterBills({ meter, bills, timezone, series, price: (r) => priceBill(tariff, r), meteredBasis: false });
  const ordered = pricingOrder(bills);
  const demands: number[] = [];
  for (const b of ordered) {
    const d = priced.get(b.billId)?.computed?.billingDemandKw;
    if (d !== null && d !== undefined) demands.push(d);
  }
  return demands.slice(-12);
}
