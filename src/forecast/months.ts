/**
 * Calendar months for the forecast: which months follow an as-of date, their first and last
 * days, and billing-period amounts spread over calendar months by days (a bill of 31 days
 * with 10 of them in March puts 10/31 of its amount in March).
 */
import { DateTime } from "luxon";
import type { Bill } from "../domain/types.ts";
import { daysBetween } from "../core/time.ts";
import { ForecastInputError } from "./errors.ts";

export interface CalendarMonth {
  /** `YYYY-MM`. */
  month: string;
  /** First day, `YYYY-MM-DD`. */
  start: string;
  /** First day of the next month, `YYYY-MM-DD` (the half-open end, as bills have it). */
  end: string;
  days: number;
  /** 1 = January. */
  calendarMonth: number;
}

/** The calendar month `YYYY-MM`. @throws ForecastInputError on a malformed month. */
export function calendarMonth(month: string): CalendarMonth {
  const d = DateTime.fromISO(`${month}-01`, { zone: "utc" });
  if (!/^\d{4}-\d{2}$/.test(month) || !d.isValid) throw new ForecastInputError(`month must be YYYY-MM, got '${month}'`);
  const next = d.plus({ months: 1 });
  return { month, start: d.toISODate()!, end: next.toISODate()!, days: d.daysInMonth!, calendarMonth: d.month };
}

/**
 * The `count` calendar months after the month of `asOf` (as_of = last day of data).
 * @example monthsAfter("2025-12-31", 2).map(m => m.month) // ["2026-01", "2026-02"]
 */
export function monthsAfter(asOf: string, count: number): CalendarMonth[] {
  const d = DateTime.fromISO(asOf, { zone: "utc" });
  if (!d.isValid) throw new ForecastInputError(`as_of must be YYYY-MM-DD, got '${asOf}'`);
  const out: CalendarMonth[] = [];
  for (let i = 1; i <= count; i++) out.push(calendarMonth(d.startOf("month").plus({ months: i }).toFormat("yyyy-MM")));
  return out;
}

/** The month `k` months after (k < 0: before) `month`. @example shiftMonth("2025-01", -12) // "2024-01" */
export function shiftMonth(month: string, k: number): string {
  return DateTime.fromISO(`${month}-01`, { zone: "utc" }).plus({ months: k }).toFormat("yyyy-MM");
}

/** `iso` minus `months` months (end-of-month aware: 2025-12-31 − 12 → 2024-12-31). */
export function minusMonths(iso: string, months: number): string {
  return DateTime.fromISO(iso, { zone: "utc" }).minus({ months }).toISODate()!;
}

export interface MonthSpread {
  month: string;
  /** Sum of each bill's amount × (its days in the month / its billing days). */
  amount: number;
  /** Billing days that fell in the month (several bills may overlap: counted each time). */
  coveredDays: number;
  days: number;
}

/**
 * Spreads `amountOf(bill)` of every bill over the calendar months it touches, by days.
 * Bills with the same period as an earlier one are skipped (a re-issued statement is not
 * twice the use). Returns months in order, from the first bill's month to the last's.
 * @example one bill 2025-01-20 → 2025-02-10 (21 days) of 210 → Jan 120, Feb 90
 */
export function spreadBillsByMonth(bills: readonly Bill[], amountOf: (bill: Bill) => number): Map<string, MonthSpread> {
  const out = new Map<string, MonthSpread>();
  const seen = new Set<string>();
  const ordered = [...bills].sort((a, b) => a.periodStart.localeCompare(b.periodStart) || a.billId.localeCompare(b.billId));
  for (const bill of ordered) {
    const key = `${bill.periodStart}/${bill.periodEnd}`;
    if (seen.has(key)) continue;
    seen.add(key);
    const billDays = daysBetween(bill.periodStart, bill.periodEnd);
    if (!(billDays > 0)) continue;
    const amount = amountOf(bill);
    let m = calendarMonth(bill.periodStart.slice(0, 7));
    while (m.start < bill.periodEnd) {
      const from = bill.periodStart > m.start ? bill.periodStart : m.start;
      const to = bill.periodEnd < m.end ? bill.periodEnd : m.end;
      const d = daysBetween(from, to);
      if (d > 0) {
        const cur = out.get(m.month) ?? { month: m.month, amount: 0, coveredDays: 0, days: m.days };
        cur.amount += (amount * d) / billDays;
        cur.coveredDays += d;
        out.set(m.month, cur);
      }
      m = calendarMonth(shiftMonth(m.month, 1));
    }
  }
  return new Map([...out].sort((a, b) => a[0].localeCompare(b[0])));
}
