/**
 * Facts about a meter's bills that pricing a forecast month needs when there is no interval
 * shape: demand per unit of daily use by calendar month, and the usual power factor.
 */
import type { Bill } from "../domain/types.ts";
import { daysBetween } from "../core/time/index.ts";

/** Calendar month (1–12) a bill mostly belongs to: the month of its middle day. */
function midMonth(bill: Bill): number {
  const days = daysBetween(bill.periodStart, bill.periodEnd);
  const mid = new Date(Date.parse(`${bill.periodStart}T00:00:00Z`) + Math.floor(days / 2) * 86_400_000);
  return mid.getUTCMonth() + 1;
}

/**
 * kW of printed demand per (usage unit per day), averaged per calendar month (index 0 = Jan);
 * months without a bill that prints demand take the average over all such bills. Null when no
 * bill prints demand. Estimated reads are left out.
 * @example bills of 31 days, 31,000 kWh, 100 kW → 100 / 1000 = 0.1 kW per (kWh/day)
 */
export function kwPerUsePerDayByMonth(bills: readonly Bill[]): number[] | null {
  const sums = new Array<number>(12).fill(0);
  const counts = new Array<number>(12).fill(0);
  let all = 0;
  let n = 0;
  for (const b of bills) {
    const days = daysBetween(b.periodStart, b.periodEnd);
    if (b.demandKw === null || !(b.usage > 0) || !(days > 0) || b.readType === "estimated") continue;
    const r = b.demandKw / (b.usage / days);
    const m = midMonth(b) - 1;
    sums[m]! += r;
    counts[m]!++;
    all += r;
    n++;
  }
  if (n === 0) return null;
  return sums.map((s, m) => (counts[m]! > 0 ? s / counts[m]! : all / n));
}

/** Mean power factor of the last 12 bills (by period start) that print one; null when none do. */
export function recentPowerFactor(bills: readonly Bill[]): number | null {
  const pfs = [...bills]
    .sort((a, b) => a.periodStart.localeCompare(b.periodStart))
    .slice(-12)
    .map((b) => b.powerFactor)
    .filter((pf): pf is number => pf !== null && pf > 0 && pf <= 1);
  return pfs.length > 0 ? pfs.reduce((a, b) => a + b, 0) / pfs.length : null;
}
