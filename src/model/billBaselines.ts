/**
 * Bill-level weather baselines per meter, two published model families:
 *  - change-point models of use per day vs mean period temperature (src/model/changePoint.ts,
 *    ASHRAE RP-1050 forms, 1P…5P, Guideline 14 statistics). The chosen one gives the
 *    weather-normalized annual use: Σ over the 12 months of a typical year of predicted use/day at
 *    that month's typical mean temperature × days in the month (365-day year), and the per-bill
 *    weather adjustment;
 *  - variable-base degree-day regression (src/model/degreeDayRegression.ts; the variable-base degree-day method of Fels 1986) with a
 *    leave-one-out band (src/model/outlierBand.ts): the expected-usage band per bill for the
 *    `usage-outlier` audit check. Degree-days see the cold days inside a mild month that a mean
 *    temperature hides, which is what kept the change-point band from judging shoulder months.
 * Estimated reads are left out of the fits (the utility's guess is not the building's use).
 */
import type { Bill, Building, Meter, Portfolio, WeatherSeries } from "../domain/types.ts";
import { fitChangePointAt, selectChangePointModel, type ChangePointFit, type ChangePointPoint } from "./changePoint.ts";
import { noMemo, type Memo } from "../core/memo.ts";
import { temperatureProfileForPeriod, type DegreeDayFit } from "./degreeDayRegression.ts";
import { degreeDayOutlierBand, type DegreeDayBandBill, type DegreeDayOutlierBand } from "./outlierBand.ts";
import { meetsGuideline14 } from "./stats.ts";
import { daysBetween, localMidnightMs, LocalMonthCalendar } from "../core/time/index.ts";
import { cToF } from "../core/units.ts";

/** One fitted model's headline statistics, as pages and data files show them. */
export interface ModelSummary {
  meterId: string;
  /** Model kind, e.g. `3PH`, `5P`, `TOWT`. */
  kind: string;
  /** CV(RMSE) in percent. */
  cvRmsePct: number | null;
  /** NMBE in percent. */
  nmbePct: number | null;
  r2: number | null;
  /** Number of observations the model was fitted on. */
  n: number;
}

const HOUR_MS = 3_600_000;
/** Share of a period's hours that must have a temperature for the bill to be a model point. */
const MIN_WEATHER_COVERAGE = 0.8;
/** Fewest points for a model at all (a 5P needs more; the search enforces points per segment). */
const MIN_POINTS = 9;

export interface MeterBaseline {
  meterId: string;
  buildingId: string;
  /** Temperature unit of the model's x axis. */
  tempUnit: "C" | "F";
  /** Points used in the fit (and bills left out, with why). */
  points: (ChangePointPoint & { billId: string })[];
  /** Every bill with a period temperature, for the scatter: used points and excluded ones with the reason. */
  scatter: { billId: string; temp: number; usePerDay: number; excluded?: string }[];
  excluded: { billId: string; reason: string }[];
  /** Chosen model; null when none passed (too few points or no form met the shape rules). */
  fit: ChangePointFit | null;
  /** Every form tried, with statistics or the reason it failed. */
  tried: { kind: string; accepted: boolean; reasons: string[]; cvRmsePct: number | null; nmbePct: number | null; r2: number | null; n: number; p: number }[];
  /** Typical-year mean temperature for each calendar month (index 0 = January), model units. */
  typicalMonthlyTemp: number[] | null;
  typicalSource: "normals" | "history" | null;
  /** Weather-normalized annual use in the meter's unit; null without a model or typical year. */
  normalizedAnnual: number | null;
  /** Whether the fit meets the Guideline 14 monthly limits (CV(RMSE) ≤ 15 %, |NMBE| ≤ 5 %). */
  meetsGuideline14: boolean;
  /**
   * Per bill (with weather): the model's use over the bill's days at the period's actual mean
   * temperature, and at the typical-year temperature of each of those days' months — the ratio
   * of the two weather-adjusts the bill (tenant pages, normalized comparisons).
   */
  perBill: { billId: string; expectedAtActualWeather: number; expectedAtTypicalWeather: number }[];
  /** The degree-day model behind the outlier band, and the training bills it refitted out. */
  degreeDay: { fit: DegreeDayFit; rejected: string[]; tried: { kind: string; accepted: boolean; reasons: string[]; cvRmsePct: number | null; nmbePct: number | null; r2: number | null; p: number }[] } | null;
  /** Expected usage band per bill id (bill unit) from the degree-day model's leave-one-out band. */
  expectedByBill: Map<string, { p50: number; low: number; high: number }>;
  summary: ModelSummary;
}

/** Mean temperature over [startMs, endMs) from an hourly series, with the share of hours covered. */
export function meanTemperature(weather: WeatherSeries, startMs: number, endMs: number): { meanC: number; coverage: number } {
  const first = Math.max(0, Math.floor((startMs - weather.startMs) / HOUR_MS));
  const last = Math.min(weather.tempC.length, Math.ceil((endMs - weather.startMs) / HOUR_MS));
  let sum = 0;
  let count = 0;
  for (let i = first; i < last; i++) {
    const t = weather.tempC[i]!;
    if (Number.isFinite(t)) {
      sum += t;
      count++;
    }
  }
  const hours = (endMs - startMs) / HOUR_MS;
  return { meanC: count > 0 ? sum / count : NaN, coverage: hours > 0 ? count / hours : 0 };
}

/**
 * Typical mean temperature per calendar month (°C) in `zone`: from a normals year when given,
 * else the average of every hour in the history that falls in that month (all years pooled).
 */
export function typicalMonthlyTempC(weather: WeatherSeries, zone: string): number[] | null {
  const sums = new Array<number>(12).fill(0);
  const counts = new Array<number>(12).fill(0);
  // Month boundaries change only 12 times a year: walk month by month rather than per hour.
  const endMs = weather.startMs + weather.tempC.length * HOUR_MS;
  for (const m of new LocalMonthCalendar(zone).between(weather.startMs, endMs)) {
    const month = Number(m.month.slice(5, 7));
    const from = Math.max(0, Math.ceil((m.startMs - weather.startMs) / HOUR_MS));
    const to = Math.min(weather.tempC.length, Math.ceil((m.endMs - weather.startMs) / HOUR_MS));
    addHours(weather.tempC, from, to, sums, counts, month - 1);
  }
  if (counts.some((c) => c < 24 * 20)) return null; // a month with under 20 days of data is not typical of anything
  return sums.map((s, i) => s / counts[i]!);
}

/**
 * Adds the finite temperatures of hours [from, to) to month m's sum and count. A function of
 * its own, so V8 optimizes this loop once rather than the whole caller mid-loop at every call.
 */
function addHours(tempC: WeatherSeries["tempC"], from: number, to: number, sums: number[], counts: number[], m: number): void {
  for (let i = from; i < to; i++) {
    const t = tempC[i]!;
    if (Number.isFinite(t)) {
      sums[m]! += t;
      counts[m]!++;
    }
  }
}

const DAYS_IN_MONTH = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];

/** Calendar month index (0 = January) of the day `offset` days after `isoDate`. */
function monthIndexOf(isoDate: string, offset: number): number {
  return new Date(Date.UTC(+isoDate.slice(0, 4), +isoDate.slice(5, 7) - 1, +isoDate.slice(8, 10) + offset)).getUTCMonth();
}

function toUnit(tempC: number, unit: "C" | "F"): number {
  return unit === "F" ? cToF(tempC) : tempC;
}

// Module-level helpers rather than callbacks made per call: V8 keeps their optimized code.

function byPeriodStart(a: Bill, b: Bill): number {
  return a.periodStart.localeCompare(b.periodStart);
}

/** The bills of one meter, in the portfolio's order. */
function billsOfMeter(bills: readonly Bill[], meterId: string): Bill[] {
  const out: Bill[] = [];
  for (const b of bills) if (b.meterId === meterId) out.push(b);
  return out;
}

interface BaselineOptions {
  meter: Meter;
  building: Building;
  bills: Bill[];
  weather: WeatherSeries | undefined;
  normals: WeatherSeries | undefined;
  tempUnit: "C" | "F";
  /** Bills to leave out of the change-point fit, with the reason (e.g. the audit found them wrong). */
  exclude?: ReadonlyMap<string, string>;
}

/** The bills' period temperatures, the points of the change-point fit and the chosen fit. */
function changePointPart(options: BaselineOptions, memo: Memo = noMemo) {
  const { building, weather, tempUnit } = options;
  const points: MeterBaseline["points"] = [];
  const excluded: MeterBaseline["excluded"] = [];
  const billTemps = new Map<string, number>();
  const scatter: MeterBaseline["scatter"] = [];
  const seen = new Set<string>();
  for (const bill of [...options.bills].sort(byPeriodStart)) {
    const days = daysBetween(bill.periodStart, bill.periodEnd);
    if (!weather) {
      excluded.push({ billId: bill.billId, reason: `no weather for station ${building.weatherStation}` });
      continue;
    }
    const { meanC, coverage } = meanTemperature(weather, localMidnightMs(bill.periodStart, building.timezone), localMidnightMs(bill.periodEnd, building.timezone));
    if (coverage < MIN_WEATHER_COVERAGE || !Number.isFinite(meanC)) {
      excluded.push({ billId: bill.billId, reason: `weather covers ${(coverage * 100).toFixed(0)} % of the period` });
      continue;
    }
    const temp = toUnit(meanC, tempUnit);
    billTemps.set(bill.billId, temp);
    const key = `${bill.periodStart}/${bill.periodEnd}`;
    const reason =
      options.exclude?.get(bill.billId) ??
      (bill.readType === "estimated" ? "estimated read" : seen.has(key) ? "same period as an earlier bill" : null);
    scatter.push({ billId: bill.billId, temp, usePerDay: bill.usage / days, ...(reason ? { excluded: reason } : {}) });
    if (reason) {
      excluded.push({ billId: bill.billId, reason });
      continue;
    }
    seen.add(key);
    points.push({ billId: bill.billId, temp, usePerDay: bill.usage / days, days });
  }

  let fit: ChangePointFit | null = null;
  let tried: MeterBaseline["tried"] = [];
  if (points.length >= MIN_POINTS && memo !== noMemo) {
    // Only the chosen form and its breakpoints are remembered; the fit is rebuilt from the points
    // at them, bit for bit the search's fit (as the analysis pool's hydrateResults does).
    const choice = memo("change-point-choice", { points }, () => {
      const chosen = selectChangePointModel(points, { weightByDays: true }).chosen;
      return chosen ? { kind: chosen.kind, breakpoints: chosen.breakpoints } : null;
    });
    fit = choice ? fitChangePointAt(points, choice.kind, choice.breakpoints, { weightByDays: true }) : null;
  } else if (points.length >= MIN_POINTS) {
    const selection = selectChangePointModel(points, { weightByDays: true });
    fit = selection.chosen;
    tried = selection.tried.map((c) => ({
      kind: c.kind,
      accepted: c.accepted,
      reasons: c.reasons,
      cvRmsePct: c.fit?.stats.cvRmsePct ?? null,
      nmbePct: c.fit?.stats.nmbePct ?? null,
      r2: c.fit?.stats.rSquared ?? null,
      n: points.length,
      p: c.fit?.parameterCount ?? 0,
    }));
  }
  return { points, excluded, billTemps, scatter, fit, tried };
}

/** Typical month temperatures (°C, and in the model's unit) from the normals, else the history. */
function typicalPart(options: BaselineOptions): { typicalC: number[] | null; typicalMonthlyTemp: number[] | null } {
  const typicalSeries = options.normals ?? options.weather;
  const typicalC = typicalSeries ? typicalMonthlyTempC(typicalSeries, options.building.timezone) : null;
  return { typicalC, typicalMonthlyTemp: typicalC ? typicalC.map((t) => toUnit(t, options.tempUnit)) : null };
}

/**
 * Only what a forecast reads of a meter's baseline: the chosen change-point fit and the typical
 * year, computed exactly as `fitMeterBaseline` computes them, without the degree-day band and the
 * per-bill adjustments (the rolling backtests refit every meter at every origin and read neither).
 */
export function fitForecastBaseline(options: BaselineOptions, memo: Memo = noMemo): Pick<MeterBaseline, "fit" | "typicalMonthlyTemp"> {
  return { fit: changePointPart(options, memo).fit, typicalMonthlyTemp: typicalPart(options).typicalMonthlyTemp };
}

/** Fits the baseline of one meter from its bills and its building's weather. */
export function fitMeterBaseline(options: BaselineOptions & {
  /** The degree-day band when already computed (it is fitted before the audit, which uses it). */
  degreeDayResult?: Pick<MeterBaseline, "degreeDay" | "expectedByBill">;
}): MeterBaseline {
  const { meter, normals, tempUnit } = options;
  const { points, excluded, billTemps, scatter, fit, tried } = changePointPart(options);
  const { typicalC, typicalMonthlyTemp } = typicalPart(options);
  const normalizedAnnual =
    fit && typicalMonthlyTemp ? typicalMonthlyTemp.reduce((s, t, m) => s + Math.max(0, fit!.predict(t)) * DAYS_IN_MONTH[m]!, 0) : null;

  const perBill: MeterBaseline["perBill"] = [];
  if (fit && typicalMonthlyTemp) {
    for (const bill of options.bills) {
      const temp = billTemps.get(bill.billId);
      if (temp === undefined) continue;
      const days = daysBetween(bill.periodStart, bill.periodEnd);
      let typical = 0;
      for (let d = 0; d < days; d++) typical += Math.max(0, fit.predict(typicalMonthlyTemp[monthIndexOf(bill.periodStart, d)]!));
      perBill.push({ billId: bill.billId, expectedAtActualWeather: Math.max(0, fit.predict(temp)) * days, expectedAtTypicalWeather: typical });
    }
  }

  const meetsG14 = fit !== null && meetsGuideline14(fit.stats, "monthly");
  const { degreeDay, expectedByBill } = options.degreeDayResult ?? degreeDayBand(options, tempUnit);

  return {
    meterId: meter.meterId,
    buildingId: meter.buildingId,
    tempUnit,
    points,
    scatter,
    excluded,
    fit,
    tried,
    typicalMonthlyTemp,
    typicalSource: typicalC ? (normals ? "normals" : "history") : null,
    normalizedAnnual,
    meetsGuideline14: meetsG14,
    perBill,
    degreeDay,
    expectedByBill,
    summary: {
      meterId: meter.meterId,
      kind: fit?.kind ?? "none",
      cvRmsePct: fit?.stats.cvRmsePct ?? null,
      nmbePct: fit?.stats.nmbePct ?? null,
      r2: fit?.stats.rSquared ?? null,
      n: points.length,
    },
  };
}

/** A bill as a point of a meter's degree-day band: its temperature profile in the model's unit (null when the weather covers too little of it). */
interface BandInputs {
  pointOf(bill: Bill): DegreeDayBandBill | null;
}

function bandInputs(building: Building, weather: WeatherSeries, tempUnit: "C" | "F"): BandInputs {
  const temps = tempUnit === "F" ? weather.tempC.map(cToF) : weather.tempC;
  const hourly = { startMs: weather.startMs, temps };
  return {
    pointOf: (bill) => {
      const days = daysBetween(bill.periodStart, bill.periodEnd);
      const profile = temperatureProfileForPeriod(hourly, localMidnightMs(bill.periodStart, building.timezone), localMidnightMs(bill.periodEnd, building.timezone));
      if (profile.hoursTotal === 0 || profile.hoursCovered / profile.hoursTotal < MIN_WEATHER_COVERAGE) return null;
      return { id: bill.billId, profile, days, usePerDay: bill.usage / days };
    },
  };
}

/**
 * The degree-day band of a meter's bills (train on actual reads, one bill per period; band
 * every bill with weather; null with too few training bills), and how a further bill becomes a
 * point; null without weather.
 */
function meterDegreeDayBand(
  options: { building: Building; bills: Bill[]; weather: WeatherSeries | undefined },
  tempUnit: "C" | "F",
): { result: DegreeDayOutlierBand | null; inputs: BandInputs } | null {
  const { weather, building } = options;
  if (!weather) return null;
  const inputs = bandInputs(building, weather, tempUnit);
  const targets: DegreeDayBandBill[] = [];
  const train: DegreeDayBandBill[] = [];
  const seen = new Set<string>();
  for (const bill of [...options.bills].sort(byPeriodStart)) {
    const item = inputs.pointOf(bill);
    if (!item) continue;
    targets.push(item);
    const key = `${bill.periodStart}/${bill.periodEnd}`;
    if (bill.readType === "actual" && !seen.has(key)) {
      seen.add(key);
      train.push(item);
    }
  }
  return { result: train.length < MIN_POINTS ? null : degreeDayOutlierBand(train, targets, { tempUnit }), inputs };
}

/**
 * The degree-day model and its leave-one-out band for every bill with weather (train on actual
 * reads, one bill per period; band every bill, estimates and repeats included).
 */
function degreeDayBand(
  options: { building: Building; bills: Bill[]; weather: WeatherSeries | undefined },
  tempUnit: "C" | "F",
): Pick<MeterBaseline, "degreeDay" | "expectedByBill"> {
  const expectedByBill = new Map<string, { p50: number; low: number; high: number }>();
  const result = meterDegreeDayBand(options, tempUnit)?.result;
  if (!result?.fit) return { degreeDay: null, expectedByBill };
  for (const [id, band] of result.bands) expectedByBill.set(id, { p50: band.expected, low: band.low, high: band.high });
  return {
    degreeDay: {
      fit: result.fit,
      rejected: result.rejected,
      tried: result.tried.map((c) => ({
        kind: c.form,
        accepted: c.accepted,
        reasons: c.reasons,
        cvRmsePct: c.fit?.stats.cvRmsePct ?? null,
        nmbePct: c.fit?.stats.nmbePct ?? null,
        r2: c.fit?.stats.rSquared ?? null,
        p: c.fit?.parameterCount ?? 0,
      })),
    },
    expectedByBill,
  };
}

/**
 * Expected usage of a meter over any stretch of days, from its degree-day model and leave-one-out
 * band: the stretch is banded as if it were one more (estimated, so untrained-on) bill. Null when
 * the meter has no accepted model or no weather for the stretch. Used to price a period nobody
 * billed.
 */
export function expectedUsageForStretch(portfolio: Portfolio, building: Building): (meterId: string, periodStart: string, periodEnd: string) => { p50: number; low: number; high: number; basis: string } | null {
  const tempUnit = portfolio.settings.degreeDayBase.unit;
  // The stretch is one more target that is never trained on (an estimated read), so the model
  // and band are the meter's own: fitted once per meter, however many stretches it has.
  const byMeter = new Map<string, ReturnType<typeof meterDegreeDayBand>>();
  return (meterId, periodStart, periodEnd) => {
    const bills = billsOfMeter(portfolio.bills, meterId);
    if (bills.length === 0) return null;
    let band = byMeter.get(meterId);
    if (band === undefined) {
      band = meterDegreeDayBand({ building, bills, weather: portfolio.weather.get(building.weatherStation) }, tempUnit);
      byMeter.set(meterId, band);
    }
    if (!band) return null;
    const id = "\u0000stretch";
    const stretch: Bill = { ...bills[0], billId: id, periodStart, periodEnd, usage: 0, readType: "estimated", demandKw: null, total: 0 };
    const point = band.inputs.pointOf(stretch);
    if (!band.result?.fit) return null;
    const e = point ? band.result.bandOf(point) : null;
    const form = ` (${band.result.fit.form})`;
    return e ? { p50: e.expected, low: e.low, high: e.high, basis: `the meter's degree-day model${form} at the stretch's actual temperatures, with its prediction band` } : null;
  };
}

/** The degree-day bands of every meter of a building, by meter id (fitted before the audit). */
export function buildingDegreeDayBands(portfolio: Portfolio, building: Building): Map<string, Pick<MeterBaseline, "degreeDay" | "expectedByBill">> {
  const tempUnit = portfolio.settings.degreeDayBase.unit;
  const out = new Map<string, Pick<MeterBaseline, "degreeDay" | "expectedByBill">>();
  for (const meter of portfolio.meters) {
    if (meter.buildingId !== building.buildingId) continue;
    const bills = billsOfMeter(portfolio.bills, meter.meterId);
    out.set(meter.meterId, degreeDayBand({ building, bills, weather: portfolio.weather.get(building.weatherStation) }, tempUnit));
  }
  return out;
}

/**
 * Baselines for every meter of a building. `exclude` leaves bills out of the change-point fits
 * (the build passes the bills the audit found wrong, so a multiplier error or a leak does not
 * bend the weather model, the normalized use and the forecast).
 */
export function fitBuildingBaselines(
  portfolio: Portfolio,
  building: Building,
  exclude: ReadonlyMap<string, string> = new Map(),
  degreeDayBands?: ReadonlyMap<string, Pick<MeterBaseline, "degreeDay" | "expectedByBill">>,
): MeterBaseline[] {
  const tempUnit = portfolio.settings.degreeDayBase.unit;
  return portfolio.meters
    .filter((m) => m.buildingId === building.buildingId)
    .map((meter) =>
      fitMeterBaseline({
        meter,
        building,
        bills: billsOfMeter(portfolio.bills, meter.meterId),
        weather: portfolio.weather.get(building.weatherStation),
        normals: portfolio.normals.get(building.weatherStation),
        tempUnit,
        exclude,
        degreeDayResult: degreeDayBands?.get(meter.meterId),
      }),
    );
}
