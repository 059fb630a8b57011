/**
 * period-gap — days between consecutive bills of a meter that no bill covers.
 *
 * Bills are taken in service order with duplicates left out; the gap runs from the latest
 * end so far to the next start (periods are half-open, so abutting bills have end = next start).
 * Severity warning (a missing bill usually arrives later as a catch-up). Amount = − the expected
 * cost of the stretch (its expected usage priced through the tariff; see unbilled.ts): what the
 * utility may still bill.
 * The finding's period is the gap itself; its bill is the one after the gap.
 */
import { billsInSequence, buildingOf, type AuditContext } from "../context.ts";
import type { Finding } from "../types.ts";
import { expectedStretchUsage, unbilledCorrection } from "./unbilled.ts";
import { daysBetween } from "../../core/time/index.ts";
import { moneyText } from "../../core/money.ts";

/** period-gap findings for every meter. */
export function checkPeriodGap(ctx: AuditContext): Finding[] {
  const out: Finding[] = [];
  for (const meterId of ctx.billsByMeter.keys()) {
    const bills = billsInSequence(ctx, meterId);
    let latest = bills[0];
    for (const bill of bills.slice(1)) {
      if (bill.periodStart > latest.periodEnd) {
        const days = daysBetween(latest.periodEnd, bill.periodStart);
        const unit = ctx.meters.get(meterId)?.unit ?? "";
        const usage = expectedStretchUsage(ctx, meterId, latest.periodEnd, bill.periodStart, [latest, bill]);
        const worth = usage ? unbilledCorrection(ctx, bill, latest.periodEnd, bill.periodStart, usage, unit) : null;
        const worthText = worth
          ? ` Priced from the expected use, the missing period is worth about ${moneyText(worth.correctedTotal, ctx.currency)}${worth.range ? ` (${moneyText(worth.range.low, ctx.currency)} to ${moneyText(worth.range.high, ctx.currency)})` : ""}.`
          : "";
        out.push({
          buildingId: buildingOf(ctx, meterId), meterId, billId: bill.billId,
          periodStart: latest.periodEnd, periodEnd: bill.periodStart,
          check: "period-gap", severity: "warning", amountAtStake: worth ? -worth.correctedTotal : null,
          title: "Days not covered by any bill",
          message: `No bill of meter ${meterId} covers the ${days} day${days === 1 ? "" : "s"} from ${latest.periodEnd} to ${bill.periodStart} between bills ${latest.billId} and ${bill.billId}.${worthText}`,
          evidence: {
            rows: [{ label: "Next bill starts", billed: bill.periodStart, expected: latest.periodEnd, difference: `${days} days` }],
            notes: ["A gap usually means a bill is missing and will arrive later as a catch-up."],
          },
          relatedBillIds: [latest.billId, bill.billId],
          corrections: worth ? [worth] : undefined,
        });
      }
      if (bill.periodEnd > latest.periodEnd) latest = bill;
    }
  }
  return out;
}
