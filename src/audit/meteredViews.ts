/**
 * Each interval-meter bill's metered usage two ways: the raw sum of every reading as read, and
 * the cleaned view with the readings flagged by the data-quality stage left out (what the models
 * train on, and — scaled up by coverage — what the audit compares with the bill and re-prices:
 * no money figure rests on a flagged reading). Showing both lets a reader see when a flagged
 * outage or spike sits inside a bill.
 */
import type { Portfolio } from "../domain/types.ts";
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
  const out = new Map<string, MeteredViews>();
  for (const bill of portfolio.bills) {
    const meter = meters.get(bill.meterId);
    const series = portfolio.intervals.get(bill.meterId);
    const zone = meter ? zones.get(meter.buildingId) : undefined;
    if (!meter || !series || !zone) continue;
    const mask = masks.get(bill.meterId);
    const from = lowerBound(series.startMs, localMidnightMs(bill.periodStart, zone));
    const to = lowerBound(series.startMs, localMidnightMs(bill.periodEnd, zone));
    if (to <= from) continue;
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
    out.set(bill.billId, { raw: raw * meter.multiplier, cleaned: cleaned * meter.multiplier, flaggedIntervals: flagged, intervals: to - from });
  }
  return out;
}
