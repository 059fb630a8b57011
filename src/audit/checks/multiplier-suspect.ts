/**
 * multiplier-suspect — billed usage off the meter by an exact common ratio (a wrong meter
 * multiplier / CT-PT ratio on the utility's or the portfolio's records).
 *
 * For each bill with comparable interval data, r = billed usage / metered usage. The meter's
 * own baseline ratio is 1 when at least a third of its bills have r ≈ 1, else the median r.
 *  - Baseline itself ≈ a common ratio k (or 1/k): one meter-level warning (every bill is off by
 *    the same ratio: check the multiplier in meters.csv or the utility's records); amount null.
 *  - A bill whose r / baseline ≈ k or 1/k: suspect. Consecutive suspect bills with the same
 *    factor form ONE finding (one cause, one finding), severity error, amount = Σ (billed total −
 *    total re-priced on usage and demand divided by the factor), null without a reprice hook.
 * "≈" = within max(usage_pct, 1 %). Common ratios: the usual CT ratios and unit slips
 * (2, 10, 20, …, 1200; 1000 = kWh/MWh) — common practice, not exhaustive.
 */
import type { Bill } from "../../domain/types.ts";
import { billsInSequence, buildingOf, type AuditContext } from "../context.ts";
import { formatQty } from "../format.ts";
import type { CorrectedBill, Finding } from "../types.ts";
import { comparableMetered, fullPeriodUsage, moneyAtStakeOnQuantities } from "./metered.ts";
import { repricedCorrection } from "../corrections.ts";
import { moneyText, roundCents } from "../../core/money.ts";

export const COMMON_RATIOS = [2, 10, 20, 30, 40, 50, 60, 80, 100, 120, 150, 160, 200, 240, 300, 400, 500, 600, 800, 1000, 1200];

/**
 * The common factor (k or 1/k) that `ratio` matches within `relTol`, or null.
 * @example matchCommonRatio(40.3, 0.02) // 40
 * @example matchCommonRatio(0.0251, 0.02) // 0.025 (÷ 40)
 */
export function matchCommonRatio(ratio: number, relTol: number): number | null {
  if (!(ratio > 0) || !Number.isFinite(ratio)) return null;
  for (const k of COMMON_RATIOS) {
    if (Math.abs(ratio / k - 1) <= relTol) return k;
    if (Math.abs(ratio * k - 1) <= relTol) return 1 / k;
  }
  return null;
}

function median(values: number[]): number {
  const s = [...values].sort((a, b) => a - b);
  const mid = s.length >> 1;
  return s.length % 2 ? s[mid] : (s[mid - 1] + s[mid]) / 2;
}

function factorText(f: number): string {
  return f >= 1 ? `× ${formatQty(f)}` : `÷ ${formatQty(1 / f)}`;
}

/** multiplier-suspect findings, meter by meter. */
export function checkMultiplierSuspect(ctx: AuditContext): Finding[] {
  const out: Finding[] = [];
  const relTol = Math.max(ctx.tol.usagePct / 100, 0.01);
  for (const meterId of ctx.billsByMeter.keys()) {
    const unit = ctx.meters.get(meterId)?.unit ?? "";
    const points: { bill: Bill; ratio: number; metered: number }[] = [];
    for (const bill of billsInSequence(ctx, meterId)) {
      const m = comparableMetered(ctx, bill);
      const meteredUsage = m === null ? 0 : fullPeriodUsage(m);
      if (!(meteredUsage > 0) || !(bill.usage > 0)) continue;
      points.push({ bill, ratio: bill.usage / meteredUsage, metered: meteredUsage });
    }
    if (points.length === 0) continue;
    const nearOne = points.filter((p) => Math.abs(p.ratio - 1) <= relTol).length;
    const baseline = nearOne * 3 >= points.length ? 1 : median(points.map((p) => p.ratio));
    const baselineFactor = baseline === 1 ? null : matchCommonRatio(baseline, relTol);

    if (baselineFactor !== null && points.length >= 2) {
      const first = points[0].bill;
      const last = points[points.length - 1].bill;
      out.push({
        buildingId: buildingOf(ctx, meterId), meterId, billId: null,
        periodStart: first.periodStart, periodEnd: last.periodEnd,
        check: "multiplier-suspect", severity: "warning", amountAtStake: null,
        title: "Bills and meter data differ by a constant ratio",
        message: `On ${points.filter((p) => Math.abs(p.ratio / baselineFactor - 1) <= relTol).length} of ${points.length} bills of meter ${meterId} the billed usage is the interval data ${factorText(baselineFactor)}, so either the multiplier in meters.csv or the utility's meter multiplier is wrong.`,
        evidence: {
          rows: points.map((p) => ({ label: `${p.bill.billId} usage (${unit})`, billed: p.bill.usage, expected: Number(p.metered.toFixed(3)), difference: `ratio ${p.ratio.toFixed(3)}` })),
          notes: [`Median billed/metered ratio ${baseline.toFixed(3)}.`],
        },
        relatedBillIds: points.map((p) => p.bill.billId),
      });
    }

    // runs of consecutive bills whose ratio jumps from the baseline by a common factor
    let run: { factor: number; items: typeof points } | null = null;
    const flush = () => {
      if (run) out.push(runFinding(ctx, meterId, unit, baseline, run.factor, run.items));
      run = null;
    };
    for (const p of points) {
      const f = matchCommonRatio(p.ratio / baseline, relTol);
      if (f === null) { flush(); continue; }
      if (run !== null && (run as { factor: number }).factor === f) (run as { items: typeof points }).items.push(p);
      else { flush(); run = { factor: f, items: [p] }; }
    }
    flush();
  }
  return out;
}

function runFinding(
  ctx: AuditContext, meterId: string, unit: string, baseline: number, factor: number,
  items: { bill: Bill; ratio: number; metered: number }[],
): Finding {
  let total: number | null = 0;
  const notes: string[] = [];
  const corrections: CorrectedBill[] = [];
  for (const { bill } of items) {
    const usage = bill.usage / factor;
    const demandKw = bill.demandKw === null ? null : bill.demandKw / factor;
    const money = moneyAtStakeOnQuantities(ctx, bill, usage, demandKw);
    if (money === null) { total = null; break; }
    total += money.amount;
    corrections.push(repricedCorrection(bill, money.repriced, usage, demandKw, `the billed usage${demandKw === null ? "" : " and demand"} ${factorText(1 / factor)} (${formatQty(usage)} ${unit}${demandKw === null ? "" : `, ${formatQty(demandKw)} kW`}), priced through the tariff`));
    notes.push(`${bill.billId}: billed ${moneyText(bill.total, ctx.currency)}, re-priced on usage ${factorText(1 / factor)} ${moneyText(money.repricedTotal, ctx.currency)}.`);
  }
  if (total === null) notes.length = 0;
  if (baseline !== 1) notes.push(`The meter's usual billed/metered ratio is ${baseline.toFixed(3)}; these bills jump from it ${factorText(factor)}.`);
  const first = items[0].bill;
  const last = items[items.length - 1].bill;
  const bills = items.length === 1 ? `bill ${first.billId}` : `${items.length} consecutive bills from ${first.billId}`;
  return {
    buildingId: buildingOf(ctx, meterId), meterId, billId: first.billId,
    periodStart: first.periodStart, periodEnd: last.periodEnd,
    check: "multiplier-suspect", severity: "error",
    amountAtStake: total === null ? null : roundCents(total),
    title: "Wrong meter multiplier suspected",
    message: `On ${bills} the billed usage is the meter's usual figure ${factorText(factor)} (billed ${formatQty(first.usage)} ${unit} vs ${formatQty(items[0].metered * baseline)} ${unit} expected from the interval data), the signature of a wrong meter multiplier.`,
    evidence: {
      rows: items.map((p) => ({ label: `${p.bill.billId} usage (${unit})`, billed: p.bill.usage, expected: Number((p.metered * baseline).toFixed(3)), difference: `ratio ${(p.ratio / baseline).toFixed(3)}` })),
      notes,
    },
    relatedBillIds: items.map((p) => p.bill.billId),
    corrections: total === null ? undefined : corrections,
  };
}
