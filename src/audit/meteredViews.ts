/**
 * Each interval-meter bill's metered usage two ways: the raw sum of every reading as read, and
 * the cleaned view with the readings flagged by the data-quality stage left out (what the models
 * train on, and — scaled up by coverage — what the audit compares with the bill and re-prices:
 * no money figure rests on a flagged reading). Showing both lets a reader see when a flagged
 * outage or spike sits inside a bill.
 */
import type { Bill, IntervalSeries, Portfolio } from "../domain/types.ts";
import { groupBy } from "../core/groupBy.ts";
import { localMidnightMs } from "../core/time/index.ts";
import { lowerBound } from "../core/sorted.ts";

export interface MeteredViews {
  /** Σ value × multiplier over the bill's half-open local period. */
  raw: number;
  /** The same without flagged intervals. */
  cleaned: number;
  /** Intervals in the period that the data-quality stage flagged. */
  flaggedIntervals: number;
  intervals: number;
}

/** Raw and cleaned metered usage per bill id, for bills of meters with interval data. */
export function meteredViewsByBill(portfolio: Portfolio, masks: ReadonlyMap<string, Uint8Array>): Map<string, MeteredViews> {
  const meters = new Map(portfolio.meters.map((m) => [m.meterId, m]));
  const zones = new Map(portfolio.buildings.map((b) => [b.buildingId, b.timezone]));
  // A meter's bills together: its readings are fetched once (they may be read from disk).
  const views = new Map<Bill, MeteredViews | null>();
  for (const [meterId, bills] of groupBy(portfolio.bills, (b) => b.meterId)) {
    const meter = meters.get(meterId);
    const zone = meter ? zones.get(meter.buildingId) : undefined;
    const series = meter && zone ? portfolio.intervals.get(meterId) : undefined;
    if (!meter || !series || !zone) continue;
    for (const bill of bills) views.set(bill, billViews(bill, series, masks.get(meterId), zone, meter.multiplier));
  }
  // Keyed in the order of the bills (a repeated bill id keeps its first place and last value).
  const out = new Map<string, MeteredViews>();
  for (const bill of portfolio.bills) {
    const v = views.get(bill);
    if (v) out.set(bill.billId, v);
  }
  return out;
}

function billViews(bill: Bill, series: IntervalSeries, mask: Uint8Array | undefined, zone: string, multiplier: number): MeteredViews | null {
  const from = lowerBound(series.startMs, localMidnightMs(bill.periodStart, zone));
  const to = lowerBound(series.startMs, localMidnightMs(bill.periodEnd, zone));
  if (to <= from) return null;
  let raw = 0;
  let cleaned = 0;
  let flagged = 0;
  for (let i = from; i < to; i++) {
    const v = series.values[i]!;
    if (!Number.isFinite(v)) continue;
    raw += v;
    if (mask?.[i]) flagged++;
    else cleaned += v;
  }
  return { raw: raw * multiplier, cleaned: cleaned * multiplier, flaggedIntervals: flagged, intervals: to - from };
}
