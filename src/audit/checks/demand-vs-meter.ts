/**
 * demand-vs-meter — billed maximum demand vs the highest rolling-window average kW in the
 * interval data over the bill period (window: demandWindowMinutes, default 15).
 *
 * Compared when coverage ≥ minCoverage (the usage check reports low coverage). Finding when
 * |billed − metered| / metered > demand_pct. Severity: error when the bill exceeds the meter's
 * peak by more than 5 × demand_pct (demand the meter never saw), otherwise warning.
 * Amount = billed total − total re-priced with the metered peak (null without a reprice hook).
 */
import { billFinding, type AuditContext } from "../context.ts";
import { formatPct, formatQty } from "../format.ts";
import { exceedsPct } from "../tolerances.ts";
import type { EvidenceRow, Finding } from "../types.ts";
import { comparableMetered, moneyAtStakeOnQuantities } from "./metered.ts";
import { repricedCorrection } from "../corrections.ts";
import { moneyText } from "../../core/money.ts";

/** demand-vs-meter findings for every bill with a printed demand and comparable interval data. */
export function checkDemandVsMeter(ctx: AuditContext): Finding[] {
  const out: Finding[] = [];
  for (const bill of ctx.input.portfolio.bills) {
    if (bill.demandKw === null) continue;
    const m = comparableMetered(ctx, bill);
    if (m === null || m.peakKw === null) continue;
    if (!exceedsPct(bill.demandKw, m.peakKw, ctx.tol.demandPct)) continue;
    const diff = bill.demandKw - m.peakKw;
    const rel = m.peakKw === 0 ? Infinity : diff / m.peakKw;
    const money = moneyAtStakeOnQuantities(ctx, bill, bill.usage, m.peakKw);
    const window = m.peakWindowMinutes ?? ctx.tol.demandWindowMinutes;
    const notes = [`Peak = highest ${window}-minute average over intervals wholly inside the period; coverage ${formatPct(m.coverage)}.`];
    if (money) notes.push(`Re-priced with the metered peak: ${moneyText(money.repricedTotal, ctx.currency)}.`);
    const rows: EvidenceRow[] = [{ label: m.flaggedIntervals ? "Demand (kW), flagged readings left out" : "Demand (kW)", billed: bill.demandKw, expected: Number(m.peakKw.toFixed(3)), difference: Number(diff.toFixed(3)) }];
    if (m.raw && m.flaggedIntervals) {
      notes.push(`${m.flaggedIntervals} reading(s) in this period were flagged by the data-quality stage and are left out of the peak. No amount rests on them.`);
      if (m.raw.peakKw !== null) rows.push({ label: `Demand (kW), raw readings incl. ${m.flaggedIntervals} flagged (not used)`, billed: bill.demandKw, expected: Number(m.raw.peakKw.toFixed(3)), difference: Number((bill.demandKw - m.raw.peakKw).toFixed(3)) });
    }
    out.push(billFinding(ctx, bill, {
      check: "demand-vs-meter",
      severity: rel > (5 * ctx.tol.demandPct) / 100 ? "error" : "warning",
      amountAtStake: money?.amount ?? null,
      title: diff > 0 ? "Billed demand higher than the meter's peak" : "Billed demand lower than the meter's peak",
      message: `Bill ${bill.billId} shows ${formatQty(bill.demandKw)} kW of demand but the meter's highest ${window}-minute average was ${formatQty(m.peakKw)} kW (${rel > 0 ? "+" : ""}${Number.isFinite(rel) ? formatPct(rel) : "n/a"}, tolerance ${ctx.tol.demandPct} %).`,
      evidence: { rows, notes },
      corrections: money ? [repricedCorrection(bill, money.repriced, bill.usage, m.peakKw, `the billed usage with the demand the meter recorded (${formatQty(m.peakKw)} kW), priced through the tariff`)] : undefined,
    }));
  }
  return out;
}
