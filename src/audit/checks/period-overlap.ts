/**
 * period-overlap — a bill whose service period starts before an earlier bill of the same meter
 * ended (duplicates are reported by duplicate-bill instead and left out here).
 *
 * Severity error (the overlapped days are paid twice). Amount = the overlapped share of the
 * later bill's total, prorated by days: overlap days / billing days × total.
 */
import { billsInSequence, billFinding, type AuditContext } from "../context.ts";
import { daysBetween, minDate } from "../dates.ts";
import { formatMoney } from "../format.ts";
import { roundCents } from "../tolerances.ts";
import type { Finding } from "../types.ts";

/** period-overlap findings: one per (earlier, later) overlapping pair. */
export function checkPeriodOverlap(ctx: AuditContext): Finding[] {
  const out: Finding[] = [];
  for (const meterId of ctx.billsByMeter.keys()) {
    const bills = billsInSequence(ctx, meterId);
    for (let j = 1; j < bills.length; j++) {
      const later = bills[j];
      for (let i = 0; i < j; i++) {
        const earlier = bills[i];
        if (earlier.periodEnd <= later.periodStart) continue;
        const overlapEnd = minDate(earlier.periodEnd, later.periodEnd);
        const days = daysBetween(later.periodStart, overlapEnd);
        const billDays = daysBetween(later.periodStart, later.periodEnd);
        const amount = roundCents((days / billDays) * later.total);
        out.push(billFinding(ctx, later, {
          check: "period-overlap", severity: "error", amountAtStake: amount,
          title: "Bill period overlaps an earlier bill",
          message: `Bill ${later.billId} covers ${days} day${days === 1 ? "" : "s"} (${later.periodStart} to ${overlapEnd}) already billed on ${earlier.billId}; prorated by days that is ${days}/${billDays} of ${formatMoney(later.total, ctx.currency)} = ${formatMoney(amount, ctx.currency)}.`,
          evidence: {
            rows: [
              { label: "Earlier bill period", billed: `${earlier.periodStart} to ${earlier.periodEnd}`, expected: null },
              { label: "This bill starts", billed: later.periodStart, expected: earlier.periodEnd, difference: `${days} days overlap` },
            ],
            notes: [`Amount at stake = overlap days / billing days × total = ${days} / ${billDays} × ${later.total}.`],
          },
          relatedBillIds: [earlier.billId],
        }));
      }
    }
  }
  return out;
}
