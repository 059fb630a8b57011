/**
 * Billing-period amounts spread over calendar months for the forecast, skipping re-issued
 * statements (calendar arithmetic itself lives in src/core/time).
 */
import type { Bill } from "../domain/types.ts";
import { calendarMonth, spreadOverMonths } from "../core/time/index.ts";

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
    const amount = amountOf(bill);
    for (const part of spreadOverMonths(amount, bill.periodStart, bill.periodEnd)) {
      const cur = out.get(part.month) ?? { month: part.month, amount: 0, coveredDays: 0, days: calendarMonth(part.month).days };
      cur.amount += part.amount;
      cur.coveredDays += part.days;
      out.set(part.month, cur);
    }
  }
  return new Map([...out].sort((a, b) => a[0].localeCompare(b[0])));
}
