/**
 * usage-outlier — usage far from what is expected for the period.
 *
 * With `expectedUsage` (a baseline model's prediction interval for the bill): warning when the
 * billed usage falls outside [low, high].
 *
 * Otherwise the INTERIM rule, labelled as such in every message: use per day vs the bill of
 * the same bill month (month of the period's middle day) a year earlier — or a year later for
 * the first year — flagged when the ratio exceeds outlierRatio (default 2) or falls below its
 * inverse. On a meter whose use swings with the seasons (90th / 10th percentile of its use per
 * day above 1.5, typical of heating gas) the same month can differ a lot with the weather alone,
 * so the limit is raised to outlierRatio^1.5 (2.83 by default) there. This is a rule of thumb of
 * this project, not a published method. So that one abnormal bill does not also flag the normal bills compared with it, a
 * bill is dropped when its reference bill is itself flagged and spikes more against its own
 * neighbouring bills. Severity warning; amount null (usage may be real).
 */
import type { Bill } from "../../domain/types.ts";
import { billsInSequence, billFinding, type AuditContext } from "../context.ts";
import { billMonth } from "../dates.ts";
import { formatQty } from "../format.ts";
import type { EvidenceRow, Finding } from "../types.ts";
import { daysBetween } from "../../core/time/index.ts";

function perDay(b: Bill): number {
  return b.usage / Math.max(1, daysBetween(b.periodStart, b.periodEnd));
}

function shiftMonth(yyyymm: string, years: number): string {
  return `${Number(yyyymm.slice(0, 4)) + years}${yyyymm.slice(4)}`;
}

const SWING_LIMIT = 1.5;

/** 90th / 10th percentile of use per day over a meter's bills (1 when too few bills or zero use). */
function seasonalSwing(bills: Bill[]): number {
  const v = bills.map(perDay).filter((x) => x > 0).sort((a, b) => a - b);
  if (v.length < 4) return 1;
  const q = (p: number) => v[Math.min(v.length - 1, Math.max(0, Math.round(p * (v.length - 1))))];
  return q(0.9) / q(0.1);
}

/** |log| of a bill's use/day against the mean of its neighbours' (0 when it has none). */
function neighbourSpike(bills: Bill[], i: number): number {
  const around = [bills[i - 1], bills[i + 1]].filter((b): b is Bill => b !== undefined).map(perDay);
  if (around.length === 0) return 0;
  const mean = around.reduce((s, v) => s + v, 0) / around.length;
  const own = perDay(bills[i]);
  return mean > 0 && own > 0 ? Math.abs(Math.log(own / mean)) : 0;
}

interface Hit {
  index: number;
  high: boolean;
  model: boolean;
  sentence: string;
  row: EvidenceRow;
  refBillId: string | null;
}

/** usage-outlier findings for every meter; consecutive abnormal bills in the same direction make one finding. */
export function checkUsageOutlier(ctx: AuditContext): Finding[] {
  const out: Finding[] = [];
  for (const meterId of ctx.billsByMeter.keys()) {
    const bills = billsInSequence(ctx, meterId);
    const unit = ctx.meters.get(meterId)?.unit ?? "";
    const byMonth = new Map<string, number>();
    bills.forEach((b, i) => { const k = billMonth(b.periodStart, b.periodEnd); if (!byMonth.has(k)) byMonth.set(k, i); });
    const candidates = new Map<number, { ref: number; ratio: number }>();
    const limit = seasonalSwing(bills) > SWING_LIMIT ? ctx.tol.outlierRatio ** 1.5 : ctx.tol.outlierRatio;
    const hits: Hit[] = [];

    bills.forEach((bill, i) => {
      const expected = ctx.input.expectedUsage?.get(bill.billId);
      if (expected) {
        if (bill.usage >= expected.low && bill.usage <= expected.high) return;
        hits.push({
          index: i, high: bill.usage > expected.high, model: true, refBillId: null,
          sentence: `bill ${bill.billId} uses ${formatQty(bill.usage)} ${unit}, outside the prediction interval of ${formatQty(expected.low)} to ${formatQty(expected.high)} ${unit} (expected ${formatQty(expected.p50)})`,
          row: { label: `${bill.billId} usage (${unit})`, billed: bill.usage, expected: expected.p50, difference: `interval ${formatQty(expected.low)} to ${formatQty(expected.high)}` },
        });
        return;
      }
      const month = billMonth(bill.periodStart, bill.periodEnd);
      const ref = byMonth.get(shiftMonth(month, -1)) ?? byMonth.get(shiftMonth(month, 1));
      if (ref === undefined) return;
      const refPerDay = perDay(bills[ref]);
      const ownPerDay = perDay(bill);
      if (!(refPerDay > 0) || !(ownPerDay > 0)) return;
      const ratio = ownPerDay / refPerDay;
      if (ratio > limit || ratio < 1 / limit) candidates.set(i, { ref, ratio });
    });

    for (const [i, { ref, ratio }] of candidates) {
      if (candidates.has(ref) && neighbourSpike(bills, ref) > neighbourSpike(bills, i)) continue;
      const bill = bills[i];
      const refBill = bills[ref];
      const when = refBill.periodStart < bill.periodStart ? "a year earlier" : "a year later";
      hits.push({
        index: i, high: ratio > 1, model: false, refBillId: refBill.billId,
        sentence: `bill ${bill.billId} uses ${formatQty(perDay(bill))} ${unit}/day, ${formatQty(ratio)} times the ${formatQty(perDay(refBill))} ${unit}/day of bill ${refBill.billId} in the same bill month ${when}`,
        row: { label: `${bill.billId} use per day (${unit})`, billed: Number(perDay(bill).toFixed(3)), expected: Number(perDay(refBill).toFixed(3)), difference: `ratio ${ratio.toFixed(3)}` },
      });
    }

    hits.sort((a, b) => a.index - b.index);
    let run: Hit[] = [];
    const flush = (): void => {
      if (run.length) out.push(runFinding(ctx, run.map((h) => ({ ...h, bill: bills[h.index] })), limit));
      run = [];
    };
    for (const h of hits) {
      const last = run[run.length - 1];
      if (last && (h.index !== last.index + 1 || h.high !== last.high || h.model !== last.model)) flush();
      run.push(h);
    }
    flush();
  }
  return out;
}

function runFinding(ctx: AuditContext, run: (Hit & { bill: Bill })[], limit: number): Finding {
  const first = run[0];
  const last = run[run.length - 1];
  const rule = first.model
    ? "Outside the weather-normalized model's prediction interval: "
    : "Interim rule (no baseline model yet): ";
  const limitText = first.model ? "" : `, beyond the stated limit of ×${formatQty(limit)} either way${limit === ctx.tol.outlierRatio ? "" : " (raised for a meter whose use swings with the seasons)"}`;
  const title = first.model
    ? (first.high ? "Usage far above expected" : "Usage far below expected")
    : (first.high ? "Usage far above the same month last year" : "Usage far below the same month last year");
  const related = run.flatMap((h) => [h.bill.billId, ...(h.refBillId ? [h.refBillId] : [])]);
  return {
    ...billFinding(ctx, first.bill, {
      check: "usage-outlier", severity: "warning", amountAtStake: null, title,
      message: `${rule}${run.map((h) => h.sentence).join("; ")}${limitText}.`,
      evidence: {
        rows: run.map((h) => h.row),
        notes: first.model ? [] : ["Not weather-normalized: a much colder or hotter month can explain part of the difference."],
      },
      relatedBillIds: [...new Set(related)],
    }),
    periodEnd: last.bill.periodEnd,
  };
}
