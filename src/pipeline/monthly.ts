/** Interval data summed by local calendar month for every interval meter (multiplier applied). */
import type { Portfolio } from "../domain/types.ts";
import { monthlyTotals, type MonthTotal } from "../ingest/index.ts";

export function monthlyMeteredByMeter(portfolio: Portfolio): Map<string, MonthTotal[]> {
  const zoneOf = new Map(portfolio.buildings.map((b) => [b.buildingId, b.timezone]));
  const out = new Map<string, MonthTotal[]>();
  for (const meter of portfolio.meters) {
    const series = portfolio.intervals.get(meter.meterId);
    const zone = zoneOf.get(meter.buildingId);
    if (series && zone) out.set(meter.meterId, monthlyTotals(series, zone, meter.multiplier));
  }
  return out;
}
