/**
 * Re-prices every bill of one meter through its tariff, oldest first, so demand ratchets
 * see the billing demand of the bills before them. Pure apart from the injected pricer.
 */
import type { Bill, IntervalSeries, Meter } from "../domain/types.ts";
import type { ComputedBill, PriceRequest } from "../tariff/types.ts";
import { intervalUsageForBill } from "../audit/wiring.ts";

export type { PricedBill } from "../report/input.ts";
import type { PricedBill } from "../report/input.ts";

export type Pricer = (request: PriceRequest) => ComputedBill;

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
    const intervals = intervalUsageForBill(series, meter.multiplier, bill, timezone, minCoverage);
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
