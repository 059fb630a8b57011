/**
 * Re-prices every bill of one meter through its tariff, oldest first, so demand ratchets
 * see the billing demand of the bills before them. Pure apart from the injected pricer.
 */
import type { Bill, IntervalSeries, Meter } from "../domain/types.ts";
import type { ComputedBill, IntervalUsage, PriceRequest } from "../tariff/types.ts";
import { sliceByTime, startOfLocalDayMs } from "../core/time.ts";

export interface PricedBill {
  computed: ComputedBill | null;
  /** Why the bill could not be priced (no tariff, unit mismatch, no version in force …). */
  error: string | null;
}

export type Pricer = (request: PriceRequest) => ComputedBill;

/**
 * Interval energy inside one bill's half-open local-time period, multiplier applied.
 * Returns null when the meter has no interval data touching the period.
 */
export function intervalsForPeriod(
  series: IntervalSeries | undefined,
  multiplier: number,
  periodStart: string,
  periodEnd: string,
  timezone: string,
): IntervalUsage | null {
  if (!series || series.startMs.length === 0) return null;
  const [from, to] = sliceByTime(series.startMs, startOfLocalDayMs(periodStart, timezone), startOfLocalDayMs(periodEnd, timezone));
  if (to <= from) return null;
  const values = new Float64Array(to - from);
  for (let i = from; i < to; i++) values[i - from] = series.values[i]! * multiplier;
  return { startMs: series.startMs.subarray(from, to), values, intervalMinutes: series.intervalMinutes };
}

/**
 * Prices `bills` (any order) of `meter`; returns results keyed by bill_id.
 * Interval data is used only when it covers at least `minCoverage` of the period's intervals,
 * otherwise the bill is priced from its billed usage and demand (and TOU lines say so).
 */
export function priceMeterBills(options: {
  meter: Meter;
  bills: Bill[];
  timezone: string;
  series: IntervalSeries | undefined;
  price: Pricer | null;
  pricerError?: string;
  minCoverage?: number;
}): Map<string, PricedBill> {
  const { meter, timezone, series, price } = options;
  const minCoverage = options.minCoverage ?? 0.9;
  const results = new Map<string, PricedBill>();
  const ordered = [...options.bills].sort((a, b) => a.periodStart.localeCompare(b.periodStart) || a.billId.localeCompare(b.billId));
  const previousDemandsKw: number[] = [];
  for (const bill of ordered) {
    if (!price) {
      results.set(bill.billId, { computed: null, error: options.pricerError ?? `tariff '${meter.tariffId}' is not available` });
      continue;
    }
    let intervals = intervalsForPeriod(series, meter.multiplier, bill.periodStart, bill.periodEnd, timezone);
    if (intervals) {
      const periodMs = startOfLocalDayMs(bill.periodEnd, timezone) - startOfLocalDayMs(bill.periodStart, timezone);
      const expected = periodMs / (intervals.intervalMinutes * 60_000);
      if (intervals.values.length < minCoverage * expected) intervals = null;
    }
    try {
      const computed = price({
        periodStart: bill.periodStart,
        periodEnd: bill.periodEnd,
        timezone,
        usage: bill.usage,
        usageUnit: meter.unit,
        demandKw: bill.demandKw,
        powerFactor: bill.powerFactor,
        intervals,
        previousBillingDemandsKw: [...previousDemandsKw],
      });
      results.set(bill.billId, { computed, error: null });
      if (computed.billingDemandKw !== null) previousDemandsKw.push(computed.billingDemandKw);
    } catch (error) {
      results.set(bill.billId, { computed: null, error: error instanceof Error ? error.message : String(error) });
    }
  }
  return results;
}
