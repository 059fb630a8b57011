/**
 * The one definition of "last 12 months" used by portfolio.json and by every page: per meter,
 * the 365 days ending at the earlier of `as_of` and that meter's last read, with bills prorated
 * by days at the window edges. Ending at the meter's last read means a bill not yet received
 * for the final weeks does not read as a drop in use or cost.
 * Also: last-12-months usage per building and commodity, in one reporting unit per commodity
 * (electricity kWh, gas therm, water gal).
 */
import type { Bill, Building, Commodity, Meter, Portfolio } from "../domain/types.ts";
import { unitFactor } from "../tariff/index.ts";
import { addDays, daysBetween } from "../core/time/index.ts";
import { KWH_PER_THERM, DEFAULT_HEAT_CONTENT_THERM_PER_CCF } from "../core/units.ts";

export const REPORT_UNIT: Record<Commodity, string> = { electricity: "kWh", gas: "therm", water: "gal" };

/** kWh per one reporting unit, for energy use intensity; null for water (not energy). */
export const KWH_PER_REPORT_UNIT: Record<Commodity, number | null> = { electricity: 1, gas: KWH_PER_THERM, water: null };

/** Half-open window of calendar days `[start, end)`, ISO dates. */
export interface DayWindow {
  start: string;
  end: string;
}

/**
 * The 365-day window ending on (and including) `asOf`: [asOf − 364 days, asOf + 1 day).
 * @example last12MonthsWindow("2025-12-31") // { start: "2025-01-01", end: "2026-01-01" }
 */
export function last12MonthsWindow(asOf: string): DayWindow {
  const end = addDays(asOf, 1);
  return { start: addDays(end, -365), end };
}

/**
 * One meter's last-12-months window: the 365 days ending at the earlier of `asOf` (inclusive)
 * and the meter's last read (the latest bill end, exclusive). Null when the meter has no bill.
 * @example meterYearWindow([{ periodStart: "2025-11-10", periodEnd: "2025-12-10", … }], "2025-12-31")
 *   // { start: "2024-12-10", end: "2025-12-10" }
 */
export function meterYearWindow(meterBills: Iterable<Pick<Bill, "periodEnd">>, asOf: string): DayWindow | null {
  let lastRead: string | null = null;
  for (const bill of meterBills) if (lastRead === null || bill.periodEnd > lastRead) lastRead = bill.periodEnd;
  if (lastRead === null) return null;
  return last12MonthsWindow(lastRead <= addDays(asOf, 1) ? addDays(lastRead, -1) : asOf);
}

/** Days of the half-open period `[start, end)` inside `window` (0 when disjoint). */
export function overlapDays(start: string, end: string, window: DayWindow): number {
  const from = start > window.start ? start : window.start;
  const to = end < window.end ? end : window.end;
  return Math.max(0, daysBetween(from, to));
}

/**
 * Share of a billing-period amount (usage or cost) that falls in `window`, prorated by days:
 * bills state amounts for their whole period only, so an even daily spread is the only
 * defensible split (common practice).
 * @example prorateToWindow(310, "2025-12-15", "2026-01-15", { start: "2025-01-01", end: "2026-01-01" }) // 170
 */
export function prorateToWindow(amount: number, start: string, end: string, window: DayWindow): number {
  const days = daysBetween(start, end);
  if (days <= 0) return 0;
  return (amount * overlapDays(start, end, window)) / days;
}

/**
 * Usage of one bill that falls inside [start, end), prorated by days.
 * @example billUsageInWindow({ usage: 310, periodStart: "2024-12-22", periodEnd: "2025-01-22", … }, "2025-01-01", "2026-01-01") // 210
 */
export function billUsageInWindow(bill: Bill, start: string, end: string): number {
  return prorateToWindow(bill.usage, bill.periodStart, bill.periodEnd, { start, end });
}

/**
 * Billed cost of some meters over each one's last-12-months window, in currency; null when no
 * meter has a bill.
 * @example metersCostLast12m(meters, billsByMeter, "2025-12-31") // 48_213.55
 */
export function metersCostLast12m(meters: Iterable<Pick<Meter, "meterId">>, billsByMeter: ReadonlyMap<string, readonly Bill[]>, asOf: string): number | null {
  let total = 0;
  let any = false;
  for (const meter of meters) {
    const bills = billsByMeter.get(meter.meterId) ?? [];
    const window = meterYearWindow(bills, asOf);
    if (!window) continue;
    any = true;
    for (const bill of bills) total += prorateToWindow(bill.total, bill.periodStart, bill.periodEnd, window);
  }
  return any ? total : null;
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
      const window = meterYearWindow(bills.filter((b) => b.meterId === meter.meterId), asOf);
      if (!window) continue;
      const { start, end } = window;
      const factor = unitFactor(commodity, meter.unit, REPORT_UNIT[commodity], heatContentByMeter(meter)) ?? NaN;
      // Days of the window some bill covers, each counted once (bills may overlap), by day number.
      const covered = new Uint8Array(Math.max(0, daysBetween(start, end)));
      for (const bill of bills) {
        if (bill.meterId !== meter.meterId) continue;
        const part = billUsageInWindow(bill, start, end);
        if (part > 0 || (bill.periodStart < end && bill.periodEnd > start)) touched = true;
        total += part * factor;
        const from = Math.max(0, daysBetween(start, bill.periodStart));
        const to = Math.min(covered.length, daysBetween(start, bill.periodEnd));
        for (let d = from; d < to; d++) {
          if (covered[d] === 0) {
            covered[d] = 1;
            coveredDays++;
          }
        }
      }
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

/**
 * Site energy of a building over the last 12 months, kWh: electricity kWh + gas therms ×
 * 29.3071 kWh/therm (1 therm = 100,000 Btu, U.S. EIA; Btu per NIST SP 811); water is not
 * energy. Null when there is no energy commodity or one of them has no figure.
 * @example siteKwhLast12m([{ commodity: "electricity", actualLast12m: 1000, … }, { commodity: "gas", actualLast12m: 10, … }]) // 1293.071
 */
export function siteKwhLast12m(usage: readonly Pick<CommodityUsage, "commodity" | "actualLast12m">[]): number | null {
  const energy = usage.filter((u) => KWH_PER_REPORT_UNIT[u.commodity] !== null);
  if (energy.length === 0 || energy.some((u) => u.actualLast12m === null)) return null;
  return energy.reduce((sum, u) => sum + u.actualLast12m! * KWH_PER_REPORT_UNIT[u.commodity]!, 0);
}
