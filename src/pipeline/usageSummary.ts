/**
 * Last-12-months usage per building and commodity, in one reporting unit per commodity
 * (electricity kWh, gas therm, water gal), from bills prorated by days at the window edges.
 * Each meter's window is the 365 days ending at the earlier of `as_of` and its last read, so
 * a bill not yet received for the final weeks does not read as a drop in use.
 */
import type { Bill, Building, Commodity, Meter, Portfolio } from "../domain/types.ts";
import { addDays, daysBetween } from "../core/time.ts";
import { unitFactor, KWH_PER_THERM, DEFAULT_HEAT_CONTENT_THERM_PER_CCF } from "../tariff/units.ts";

export const REPORT_UNIT: Record<Commodity, string> = { electricity: "kWh", gas: "therm", water: "gal" };

/** kWh per one reporting unit, for energy use intensity; null for water (not energy). */
export const KWH_PER_REPORT_UNIT: Record<Commodity, number | null> = { electricity: 1, gas: KWH_PER_THERM, water: null };

/** The 365-day window ending on (and including) `asOf`: [asOf − 364 days, asOf + 1 day). */
export function last12MonthsWindow(asOf: string): { start: string; end: string } {
  const end = addDays(asOf, 1);
  return { start: addDays(end, -365), end };
}

/**
 * Usage of one bill that falls inside [start, end), prorated by days (bills report usage for
 * their whole period only, so an even daily spread is the only defensible split).
 */
export function billUsageInWindow(bill: Bill, start: string, end: string): number {
  const from = bill.periodStart > start ? bill.periodStart : start;
  const to = bill.periodEnd < end ? bill.periodEnd : end;
  const overlap = daysBetween(from, to);
  if (overlap <= 0) return 0;
  return (bill.usage * overlap) / daysBetween(bill.periodStart, bill.periodEnd);
}

/** The as-of date of the portfolio: the setting, else the day before the last bill end. */
export function effectiveAsOf(portfolio: Portfolio): string | null {
  if (portfolio.settings.asOf) return portfolio.settings.asOf;
  let last: string | null = null;
  for (const b of portfolio.bills) if (last === null || b.periodEnd > last) last = b.periodEnd;
  return last === null ? null : addDays(last, -1);
}

export interface CommodityUsage {
  commodity: Commodity;
  unit: string;
  /** Billed usage in the last 12 months, in `unit`; null when no bill touches the window. */
  actualLast12m: number | null;
  /** Share of the window's days covered by bills (1 = complete). */
  coverage: number;
}

/** Sums each commodity's billed usage of a building's meters over the last 12 months. */
export function buildingUsageLast12m(
  building: Building,
  meters: Meter[],
  bills: Bill[],
  asOf: string,
  heatContentByMeter: (meter: Meter) => number = () => DEFAULT_HEAT_CONTENT_THERM_PER_CCF,
): CommodityUsage[] {
  const out: CommodityUsage[] = [];
  for (const commodity of ["electricity", "gas", "water"] as const) {
    const own = meters.filter((m) => m.buildingId === building.buildingId && m.commodity === commodity);
    if (own.length === 0) continue;
    let total = 0;
    let touched = false;
    let coveredDays = 0;
    for (const meter of own) {
      let lastRead: string | null = null;
      for (const bill of bills) if (bill.meterId === meter.meterId && (lastRead === null || bill.periodEnd > lastRead)) lastRead = bill.periodEnd;
      const { start, end } = last12MonthsWindow(lastRead !== null && lastRead <= addDays(asOf, 1) ? addDays(lastRead, -1) : asOf);
      const factor = unitFactor(commodity, meter.unit, REPORT_UNIT[commodity], heatContentByMeter(meter)) ?? NaN;
      const days = new Set<string>();
      for (const bill of bills) {
        if (bill.meterId !== meter.meterId) continue;
        const part = billUsageInWindow(bill, start, end);
        if (part > 0 || (bill.periodStart < end && bill.periodEnd > start)) touched = true;
        total += part * factor;
        for (let d = bill.periodStart > start ? bill.periodStart : start; d < end && d < bill.periodEnd; d = addDays(d, 1)) days.add(d);
      }
      coveredDays += days.size;
    }
    out.push({
      commodity,
      unit: REPORT_UNIT[commodity],
      actualLast12m: touched && Number.isFinite(total) ? total : null,
      coverage: coveredDays / (365 * own.length),
    });
  }
  return out;
}
