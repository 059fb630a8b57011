/**
 * Re-prices every bill of one meter through its tariff, oldest first, so demand ratchets
 * see the billing demand of the bills before them. Pure apart from the injected pricer.
 *
 * Each bill gets up to two recomputations, each on one basis only:
 *  - on the billed quantities (usage and demand as printed; interval data, when it covers the
 *    period, only splits them over time-of-use periods) — checks the arithmetic and the rates;
 *  - on the metered quantities (interval sum × multiplier, scaled up by coverage when a few
 *    intervals are missing, and the meter's peak) — checks the quantities. Only when interval
 *    data covers at least `minCoverage` of the period. Read from `meteredSeries` when given (the
 *    cleaned view: flagged readings count as missing).
 * Both use the same ratchet history: the billing demands of the earlier bills as billed.
 */
import type { Bill, IntervalSeries, Meter } from "../domain/types.ts";
import type { ComputedBill, IntervalUsage, PriceRequest } from "./types.ts";
import { localMidnightMs } from "../core/time/index.ts";
import { lowerBound } from "../core/sorted.ts";
import { expectedProblem } from "../core/errors.ts";

export interface PricedBill {
  computed: ComputedBill | null;
  /** Plain-words reason when `computed` is null (e.g. "tariff T9 not found"). */
  error: string | null;
  /** Re-priced on metered quantities; null/absent when interval data does not cover the period. */
  metered?: ComputedBill | null;
  /** Metered usage the `metered` recomputation used (bill unit, multiplier applied). */
  meteredUsage?: number | null;
  /** Metered peak demand (kW) over the period, when the meter is electricity with interval data. */
  meteredDemandKw?: number | null;
}

/**
 * How far a bill could be checked: `exact` (every line of the billed-basis recomputation is
 * exact, so its total can be compared), `estimated` (time-of-use or period demand split by the
 * building's load shape: shown, never compared), `needs-interval-data` (such a split could not
 * even be estimated), `not-priced` (no usable tariff).
 */
export type BillCheckState = "exact" | "estimated" | "needs-interval-data" | "not-priced";

/** The check state of a priced bill (see BillCheckState). */
export function billCheckState(priced: PricedBill | undefined): BillCheckState {
  const c = priced?.computed;
  if (!c) return "not-priced";
  if (c.exact) return "exact";
  return c.lines.some((l) => l.status === "needs-interval-data") ? "needs-interval-data" : "estimated";
}

/**
 * The meter's intervals inside the bill's half-open local period, multiplier applied, or null
 * when there are none or fewer than `minCoverage` of the expected intervals (then the engine
 * prices from billed quantities, as for the original pricing). Non-finite readings (flagged
 * readings in the cleaned view, see `withFlaggedAsMissing`) are left out and count as missing.
 */
export function intervalUsageForBill(
  series: IntervalSeries | undefined, multiplier: number, bill: Bill, timezone: string, minCoverage = 0.9,
): IntervalUsage | null {
  if (!series || series.startMs.length === 0) return null;
  const a = localMidnightMs(bill.periodStart, timezone);
  const b = localMidnightMs(bill.periodEnd, timezone);
  const from = lowerBound(series.startMs, a);
  const to = lowerBound(series.startMs, b);
  const expected = (b - a) / (series.intervalMinutes * 60_000);
  let finite = 0;
  for (let i = from; i < to; i++) if (Number.isFinite(series.values[i])) finite++;
  if (to <= from || finite < minCoverage * expected) return null;
  if (finite === to - from) {
    const values = new Float64Array(to - from);
    for (let i = from; i < to; i++) values[i - from] = series.values[i] * multiplier;
    return { startMs: series.startMs.subarray(from, to), values, intervalMinutes: series.intervalMinutes };
  }
  const startMs = new Float64Array(finite);
  const values = new Float64Array(finite);
  let k = 0;
  for (let i = from; i < to; i++) {
    if (!Number.isFinite(series.values[i])) continue;
    startMs[k] = series.startMs[i];
    values[k++] = series.values[i] * multiplier;
  }
  return { startMs, values, intervalMinutes: series.intervalMinutes };
}

export type Pricer = (request: PriceRequest) => ComputedBill;

/**
 * The order priceMeterBills prices a meter's bills in (period start, then bill id): each bill's
 * ratchet reads the billing demands of the bills before it in this order.
 */
export function pricingOrder<B extends Pick<Bill, "periodStart" | "billId">>(bills: readonly B[]): B[] {
  return [...bills].sort((a, b) => a.periodStart.localeCompare(b.periodStart) || a.billId.localeCompare(b.billId));
}

/**
 * The fields of a bill that pricing reads (with the meter, its series and the bills before it):
 * two bills equal in these price the same. Others (total, read type, statement date, source) are
 * never read, so a bill whose total the audit corrected prices as the bill billed.
 */
export const PRICING_FIELDS = ["billId", "meterId", "periodStart", "periodEnd", "usage", "demandKw", "powerFactor"] as const satisfies readonly (keyof Bill)[];

/** Whether `a` and `b` agree on every field pricing reads (PRICING_FIELDS). */
export function samePricingFields(a: Bill, b: Bill): boolean {
  return a === b || PRICING_FIELDS.every((k) => Object.is(a[k], b[k]));
}

/**
 * Metered usage of a bill's period from its intervals (multiplier applied): the sum scaled up by
 * coverage, so a period with a few missing intervals is not compared as if complete (the audit's
 * usage-vs-meter uses the same rule).
 */
function meteredUsageOf(intervals: IntervalUsage, bill: Bill, timezone: string): number {
  let sum = 0;
  for (let i = 0; i < intervals.values.length; i++) sum += intervals.values[i];
  const expected = (localMidnightMs(bill.periodEnd, timezone) - localMidnightMs(bill.periodStart, timezone)) / (intervals.intervalMinutes * 60_000);
  const coverage = expected > 0 ? intervals.values.length / expected : 1;
  return coverage > 0 && coverage < 1 ? sum / coverage : sum;
}

/**
 * Prices `bills` (any order) of `meter`; returns results keyed by bill_id.
 * Interval data is used only when it covers at least `minCoverage` of the period's intervals,
 * otherwise the bill is priced from its billed usage and demand alone (and time-of-use lines say
 * they are estimates) and has no metered recomputation.
 */
export function priceMeterBills(options: {
  meter: Meter;
  bills: Bill[];
  timezone: string;
  series: IntervalSeries | undefined;
  /**
   * The series the metered basis is read from (default `series`): the cleaned view, flagged
   * readings as NaN (`withFlaggedAsMissing`), so the metered recomputation never rests on them.
   * The billed basis always uses `series`.
   */
  meteredSeries?: IntervalSeries;
  price: Pricer | null;
  pricerError?: string;
  minCoverage?: number;
  /** Also re-price on metered quantities (default true; the forecast needs only the billed basis). */
  meteredBasis?: boolean;
}): Map<string, PricedBill> {
  const { meter, timezone, series, price } = options;
  const minCoverage = options.minCoverage ?? 0.9;
  const results = new Map<string, PricedBill>();
  const ordered = pricingOrder(options.bills);
  const previousDemandsKw: number[] = [];
  for (const bill of ordered) {
    if (!price) {
      results.set(bill.billId, { computed: null, error: options.pricerError ?? `tariff '${meter.tariffId}' is not available`, metered: null });
      continue;
    }
    const intervals = intervalUsageForBill(series, meter.multiplier, bill, timezone, minCoverage);
    const base: PriceRequest = {
      periodStart: bill.periodStart,
      periodEnd: bill.periodEnd,
      timezone,
      usage: bill.usage,
      usageUnit: meter.unit,
      demandKw: bill.demandKw,
      powerFactor: bill.powerFactor,
      intervals,
      intervalsGive: "shape",
      previousBillingDemandsKw: [...previousDemandsKw],
    };
    let computed: ComputedBill;
    try {
      computed = price(base);
    } catch (error) {
      results.set(bill.billId, { computed: null, error: expectedProblem(error), metered: null });
      continue;
    }
    if (computed.billingDemandKw !== null) previousDemandsKw.push(computed.billingDemandKw);
    let metered: ComputedBill | null = null;
    let meteredUsage: number | null = null;
    const meteredIntervals = options.meteredSeries && options.meteredSeries !== series
      ? intervalUsageForBill(options.meteredSeries, meter.multiplier, bill, timezone, minCoverage)
      : intervals;
    if (meteredIntervals && options.meteredBasis !== false) {
      meteredUsage = meteredUsageOf(meteredIntervals, bill, timezone);
      try {
        // demand null: the meter's own peak (per charge window) is the demand
        metered = price({ ...base, usage: meteredUsage, demandKw: null, intervals: meteredIntervals });
      } catch (error) {
        expectedProblem(error);
        metered = null;
      }
    }
    // meteredDemandKw is filled by the caller from the reconciliation (the meter's peak on the bill's window)
    results.set(bill.billId, { computed, error: null, metered, meteredUsage, meteredDemandKw: null });
  }
  return results;
}
