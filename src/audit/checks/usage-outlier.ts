/**
 * usage-outlier — usage far from what is expected for the period.
 *
 * With `expectedUsage` (a baseline model's prediction interval for the bill): warning when the
 * billed usage falls outside [low, high].
 *
 * Otherwise the INTERIM rule, labelled as such in every message: use per day vs the bill of
 * the same bill month (month of the period's middle day) a year earlier — or a year later for
 * the first year — flagged when the ratio exceeds outlierRatio (default 2) or falls below its
 * inverse. So that one abnormal bill does not also flag the normal bills compared with it, a
 * bill is dropped when its reference bill is itself flagged and spikes more against its own
 * neighbouring bills. Severity warning; amount null (usage may be real).
 */
import type { Bill } from "../../domain/types.ts";
import { billsInSequence, billFinding, type AuditContext } from "../context.ts";
import { billMonth, daysBetween } from "../dates.ts";
import { formatQty } from "../format.ts";
import type { Finding } from "../types.ts";

function perDay(b: Bill): number {
  return b.usage / Math.max(1, daysBetween(b.periodStart, b.periodEnd));
}

function shiftMonth(yyyymm: string, years: number): string {
  return `${Number(yyyymm.slice(0, 4)) + years}${yyyymm.slice(4)}`;
}

/** |log| of a bill's use/day against the mean of its neighbours' (0 when it has none). */
function neighbourSpike(bills: Bill[], i: number): number {
  const around = [bills[i - 1], bills[i + 1]].filter((b): b is Bill => b !== undefined).map(perDay);
  if (around.length === 0) return 0;
  const mean = around.reduce((s, v) => s + v, 0) / around.length;
  const own = perDay(bills[i]);
  return mean > 0 && own > 0 ? Math.abs(Math.log(own / mean)) : 0;
}

/** usage-outlier findings for every meter. */
export function checkUsageOutlier(ctx: AuditContext): Finding[] {
  const out: Finding[] = [];
  for (const meterId of ctx.billsByMeter.keys()) {
    const bills = billsInSequence(ctx, meterId);
    const unit = ctx.meters.get(meterId)?.unit ?? "";
    const byMonth = new Map<string, number>();
    bills.forEach((b, i) => { const k = billMonth(b.periodStart, b.periodEnd); if (!byMonth.has(k)) byMonth.set(k, i); });
    const candidates = new Map<number, { ref: number; ratio: number }>();

    bills.forEach((bill, i) => {
      const expected = ctx.input.expectedUsage?.get(bill.billId);
      if (expected) {
        if (bill.usage >= expected.low && bill.usage <= expected.high) return;
        out.push(billFinding(ctx, bill, {
          check: "usage-outlier", severity: "warning", amountAtStake: null,
          title: bill.usage > expected.high ? "Usage far above expected" : "Usage far below expected",
          message: `Bill ${bill.billId} uses ${formatQty(bill.usage)} ${unit}, outside the weather-normalized model's prediction interval of ${formatQty(expected.low)} to ${formatQty(expected.high)} ${unit} (expected ${formatQty(expected.p50)}).`,
          evidence: { rows: [{ label: `Usage (${unit})`, billed: bill.usage, expected: expected.p50, difference: formatQty(bill.usage - expected.p50) }], notes: [`Prediction interval ${expected.low} to ${expected.high}.`] },
        }));
        return;
      }
      const month = billMonth(bill.periodStart, bill.periodEnd);
      const ref = byMonth.get(shiftMonth(month, -1)) ?? byMonth.get(shiftMonth(month, 1));
      if (ref === undefined) return;
      const refPerDay = perDay(bills[ref]);
      const ownPerDay = perDay(bill);
      if (!(refPerDay > 0) || !(ownPerDay > 0)) return;
      const ratio = ownPerDay / refPerDay;
      if (ratio > ctx.tol.outlierRatio || ratio < 1 / ctx.tol.outlierRatio) candidates.set(i, { ref, ratio });
    });

    for (const [i, { ref, ratio }] of candidates) {
      if (candidates.has(ref) && neighbourSpike(bills, ref) > neighbourSpike(bills, i)) continue;
      const bill = bills[i];
      const refBill = bills[ref];
      const when = refBill.periodStart < bill.periodStart ? "a year earlier" : "a year later";
      out.push(billFinding(ctx, bill, {
        check: "usage-outlier", severity: "warning", amountAtStake: null,
        title: ratio > 1 ? "Usage far above the same month last year" : "Usage far below the same month last year",
        message: `Interim rule (no baseline model yet): bill ${bill.billId} uses ${formatQty(perDay(bill))} ${unit}/day, ${formatQty(ratio)} times the ${formatQty(perDay(refBill))} ${unit}/day of bill ${refBill.billId} in the same bill month ${when}, beyond the stated limit of ×${ctx.tol.outlierRatio} either way.`,
        evidence: {
          rows: [{ label: `Use per day (${unit})`, billed: Number(perDay(bill).toFixed(3)), expected: Number(perDay(refBill).toFixed(3)), difference: `ratio ${ratio.toFixed(3)}` }],
          notes: ["Not weather-normalized: a much colder or hotter month can explain part of the difference."],
        },
        relatedBillIds: [refBill.billId],
      }));
    }
  }
  return out;
}
