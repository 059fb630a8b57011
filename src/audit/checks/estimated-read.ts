/**
 * estimated-read — bills on estimated meter reads, streaks of them, and the true-up.
 *
 *  - A streak of ≥ estimateStreakMin consecutive estimated bills (default 2): ONE warning for
 *    the streak (bill = its first bill, period = the whole streak), naming the true-up bill.
 *  - A lone estimated bill: info (loneEstimateSeverity; estimates are routine, streaks are not).
 *  - The first actual bill after any estimate (the true-up): info, with its use per day vs
 *    the estimates' (a catch-up can land in a higher block or season).
 * Amount null (the money, if any, comes from the usage-vs-meter comparison merged into it).
 */
import type { Bill } from "../../domain/types.ts";
import { billsInSequence, billFinding, buildingOf, type AuditContext } from "../context.ts";
import { formatQty } from "../format.ts";
import type { Finding } from "../types.ts";
import { daysBetween } from "../../core/time/index.ts";

function usePerDay(bills: Bill[]): number {
  const days = bills.reduce((s, b) => s + daysBetween(b.periodStart, b.periodEnd), 0);
  return days > 0 ? bills.reduce((s, b) => s + b.usage, 0) / days : 0;
}

/** estimated-read findings for every meter. */
export function checkEstimatedRead(ctx: AuditContext): Finding[] {
  const out: Finding[] = [];
  for (const meterId of ctx.billsByMeter.keys()) {
    const bills = billsInSequence(ctx, meterId);
    const unit = ctx.meters.get(meterId)?.unit ?? "";
    let i = 0;
    while (i < bills.length) {
      if (bills[i].readType !== "estimated") { i++; continue; }
      let j = i;
      while (j + 1 < bills.length && bills[j + 1].readType === "estimated") j++;
      const streak = bills.slice(i, j + 1);
      const trueUp = j + 1 < bills.length ? bills[j + 1] : null;
      const estPerDay = usePerDay(streak);
      const trueUpNote = trueUp
        ? `True-up on ${trueUp.billId}: ${formatQty(usePerDay([trueUp]))} ${unit}/day vs ${formatQty(estPerDay)} ${unit}/day estimated.`
        : "No actual read yet after the estimates.";
      const rows = streak.map((b) => ({ label: `${b.billId} usage (${unit}, estimated)`, billed: b.usage, expected: null }));
      if (streak.length >= ctx.tol.estimateStreakMin) {
        const first = streak[0];
        const last = streak[streak.length - 1];
        out.push({
          buildingId: buildingOf(ctx, meterId), meterId, billId: first.billId,
          periodStart: first.periodStart, periodEnd: last.periodEnd,
          check: "estimated-read", severity: "warning", amountAtStake: null,
          title: `${streak.length} estimated bills in a row`,
          message: `Meter ${meterId} was billed on ${streak.length} consecutive estimated reads from ${first.periodStart} to ${last.periodEnd} (${streak.map((b) => b.billId).join(", ")}), which can hide real changes in use and push the true-up into a higher block or season.`,
          evidence: { rows, notes: [trueUpNote] },
          relatedBillIds: streak.map((b) => b.billId),
        });
      } else {
        out.push(billFinding(ctx, streak[0], {
          check: "estimated-read", severity: ctx.tol.loneEstimateSeverity, amountAtStake: null,
          title: "Estimated meter read",
          message: `Bill ${streak[0].billId} was based on an estimated read of ${formatQty(streak[0].usage)} ${unit}; the next actual read corrects it.`,
          evidence: { rows, notes: [trueUpNote] },
        }));
      }
      if (trueUp) {
        const actualPerDay = usePerDay([trueUp]);
        out.push(billFinding(ctx, trueUp, {
          check: "estimated-read", severity: "info", amountAtStake: null,
          title: "True-up after estimated reads",
          message: `Bill ${trueUp.billId} is the first actual read after ${streak.length} estimated bill${streak.length === 1 ? "" : "s"}: ${formatQty(actualPerDay)} ${unit}/day against ${formatQty(estPerDay)} ${unit}/day in the estimates.`,
          evidence: { rows: [{ label: `Use per day (${unit})`, billed: Number(actualPerDay.toFixed(3)), expected: Number(estPerDay.toFixed(3)) }], notes: [] },
          relatedBillIds: streak.map((b) => b.billId),
        }));
      }
      i = j + 1;
    }
  }
  return out;
}
