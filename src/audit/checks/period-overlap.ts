/**
 * period-overlap — a bill whose service period starts before an earlier bill of the same meter
 * ended (duplicates are reported by duplicate-bill instead and left out here).
 *
 * Severity error (the overlapped days are paid twice). Amount = the later bill's total minus the
 * same bill re-priced over its true period (from the earlier bill's end), with the overlapped
 * days' usage taken off at the earlier bill's use per day (the utility's own reading of those
 * days); fixed charges are then counted once, not prorated. Without a reprice hook, or when the
 * later bill lies wholly inside the earlier one, the overlapped share of the total prorated by
 * days (or the whole total) is used instead.
 */
import { billsInSequence, billFinding, type AuditContext } from "../context.ts";
import { minDate } from "../dates.ts";
import type { Bill } from "../../domain/types.ts";
import type { CorrectedBill, Finding } from "../types.ts";
import { repricedCorrection, voidCorrection } from "../corrections.ts";
import { formatQty } from "../format.ts";
import { daysBetween } from "../../core/time/index.ts";
import { moneyText, roundCents } from "../../core/money.ts";

/**
 * The later bill over its true period [earlier end, later end): usage less the overlapped days at
 * the earlier bill's use per day, demand as billed. Null without a reprice hook or a price.
 */
function truePeriodCorrection(ctx: AuditContext, earlier: Bill, later: Bill, overlapEnd: string, overlapDays: number): CorrectedBill | null {
  if (overlapEnd >= later.periodEnd) return voidCorrection(later, `nothing: its whole period was already billed on ${earlier.billId}`);
  const reprice = ctx.input.reprice;
  if (!reprice) return null;
  const perDay = earlier.usage / daysBetween(earlier.periodStart, earlier.periodEnd);
  const trueDays = daysBetween(overlapEnd, later.periodEnd);
  let usage = later.usage - overlapDays * perDay;
  let how = `less ${overlapDays} day${overlapDays === 1 ? "" : "s"} at ${earlier.billId}'s ${formatQty(perDay)} per day`;
  if (!(usage > 0)) {
    usage = (later.usage * trueDays) / daysBetween(later.periodStart, later.periodEnd);
    how = `prorated to ${trueDays} of its days`;
  }
  const unit = ctx.meters.get(later.meterId)?.unit ?? "";
  const trueBill: Bill = { ...later, periodStart: overlapEnd, usage };
  const priced = reprice(trueBill, { kind: "quantities", usage, demandKw: later.demandKw });
  if (priced === null) return null;
  return repricedCorrection(later, priced, usage, later.demandKw, `its true period ${overlapEnd} to ${later.periodEnd}: the billed usage ${how} (${formatQty(usage)} ${unit}), demand as billed, priced through the tariff`);
}

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
        const corrected = truePeriodCorrection(ctx, earlier, later, overlapEnd, days);
        const prorated = roundCents((days / billDays) * later.total);
        const amount = corrected ? roundCents(corrected.billedTotal - corrected.correctedTotal) : prorated;
        const how = corrected
          ? corrected.corrected === null
            ? `the whole bill lies inside ${earlier.billId}, so all of ${moneyText(later.total, ctx.currency)} is billed twice`
            : `re-priced over its true period ${corrected.periodStart} to ${corrected.periodEnd} it comes to ${moneyText(corrected.correctedTotal, ctx.currency)}, ${moneyText(amount, ctx.currency)} less`
          : `prorated by days that is ${days}/${billDays} of ${moneyText(later.total, ctx.currency)} = ${moneyText(amount, ctx.currency)}`;
        out.push(billFinding(ctx, later, {
          check: "period-overlap", severity: "error", amountAtStake: amount,
          title: "Bill period overlaps an earlier bill",
          message: `Bill ${later.billId} covers ${days} day${days === 1 ? "" : "s"} (${later.periodStart} to ${overlapEnd}) already billed on ${earlier.billId}; ${how}.`,
          evidence: {
            rows: [
              { label: "Earlier bill period", billed: `${earlier.periodStart} to ${earlier.periodEnd}`, expected: null },
              { label: "This bill starts", billed: later.periodStart, expected: earlier.periodEnd, difference: `${days} days overlap` },
            ],
            notes: corrected
              ? [`For comparison, the overlapped share of the total prorated by days is ${days} / ${billDays} × ${later.total} = ${prorated.toFixed(2)}.`]
              : [`Amount at stake = overlap days / billing days × total = ${days} / ${billDays} × ${later.total}.`],
          },
          relatedBillIds: [earlier.billId],
          corrections: corrected ? [corrected] : undefined,
        }));
      }
    }
  }
  return out;
}
