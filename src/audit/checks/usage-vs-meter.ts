/**
 * usage-vs-meter — billed usage vs the sum of the meter's intervals over the bill period.
 *
 * Compared when interval coverage ≥ minCoverage; a period with some data but less coverage
 * gets an `info` finding saying it was not compared. Finding when |billed − metered| /
 * metered > usage_pct, the metered sum scaled up by its coverage when a few intervals are missing. Severity: error beyond 5 × usage_pct (plainly wrong), else warning.
 * Amount = billed total − total re-priced on metered usage and demand (the bill's metered basis; null without a reprice hook).
 */
import { billFinding, type AuditContext } from "../context.ts";
import { formatPct, formatQty } from "../format.ts";
import { exceedsPct } from "../tolerances.ts";
import type { EvidenceRow, Finding, MeteredPeriod } from "../types.ts";
import { fullPeriodUsage, moneyAtStakeOnQuantities } from "./metered.ts";
import { repricedCorrection } from "../corrections.ts";
import { moneyText } from "../../core/money.ts";

/** usage-vs-meter findings (and low-coverage notices) for every bill with interval data. */
export function checkUsageVsMeter(ctx: AuditContext): Finding[] {
  const out: Finding[] = [];
  for (const bill of ctx.input.portfolio.bills) {
    const m = ctx.input.metered.get(bill.billId) ?? null;
    if (m === null || m.intervals === 0) continue;
    const unit = ctx.meters.get(bill.meterId)?.unit ?? "";
    if (m.coverage < ctx.tol.minCoverage) {
      out.push(billFinding(ctx, bill, {
        check: "usage-vs-meter", severity: "info", amountAtStake: null,
        title: "Too little interval data to check usage",
        message: `Only ${formatPct(m.coverage)} of the expected intervals (${m.intervals} of ${m.expectedIntervals}) are present for bill ${bill.billId}, below the ${formatPct(ctx.tol.minCoverage)} needed, so its usage and demand were not compared with the meter.`,
        evidence: { rows: [{ label: `Usage (${unit})`, billed: bill.usage, expected: null }], notes: [`Metered sum of the intervals present: ${formatQty(m.usage)} ${unit}.`, ...flaggedNote(m, unit)] },
      }));
      continue;
    }
    const meteredUsage = fullPeriodUsage(m);
    if (!exceedsPct(bill.usage, meteredUsage, ctx.tol.usagePct)) continue;
    const diff = bill.usage - meteredUsage;
    const rel = meteredUsage === 0 ? Infinity : diff / meteredUsage;
    const money = moneyAtStakeOnQuantities(ctx, bill, meteredUsage, null);
    const notes = [`Interval coverage ${formatPct(m.coverage)} (${m.intervals} of ${m.expectedIntervals} intervals), multiplier applied.`];
    if (m.coverage < 1) notes.push(`Metered sum of the intervals present ${formatQty(m.usage)} ${unit}, scaled by the coverage to ${formatQty(meteredUsage)} ${unit}.`);
    if (money) notes.push(`Re-priced on metered usage: ${moneyText(money.repricedTotal, ctx.currency)}.`);
    const rows: EvidenceRow[] = [{ label: m.flaggedIntervals ? `Usage (${unit}), flagged readings left out` : `Usage (${unit})`, billed: bill.usage, expected: Number(meteredUsage.toFixed(3)), difference: Number(diff.toFixed(3)) }];
    rows.push(...rawEvidence(m, bill.usage, unit, notes));
    out.push(billFinding(ctx, bill, {
      check: "usage-vs-meter",
      severity: Math.abs(rel) > (5 * ctx.tol.usagePct) / 100 ? "error" : "warning",
      amountAtStake: money?.amount ?? null,
      title: diff > 0 ? "Billed usage higher than the meter recorded" : "Billed usage lower than the meter recorded",
      message: `Bill ${bill.billId} charges ${formatQty(bill.usage)} ${unit} but the interval meter recorded ${formatQty(meteredUsage)} ${unit}${m.coverage < 1 ? ` (scaled from ${formatPct(m.coverage)} coverage)` : ""} over the same period (${rel > 0 ? "+" : ""}${Number.isFinite(rel) ? formatPct(rel) : "n/a"}, tolerance ${ctx.tol.usagePct} %).`,
      evidence: { rows, notes },
      corrections: money ? [repricedCorrection(bill, money.repriced, meteredUsage, null, `the metered usage (${formatQty(meteredUsage)} ${unit}) and the meter's own demand, priced through the tariff`)] : undefined,
    }));
  }
  return out;
}

/** A note on the readings the data-quality stage flagged in the period (none when there are none). */
function flaggedNote(m: MeteredPeriod, unit: string): string[] {
  if (!m.raw || !m.flaggedIntervals) return [];
  return [`${m.flaggedIntervals} reading(s) flagged by the data-quality stage are left out and counted as missing; with them the intervals sum to ${formatQty(m.raw.usage)} ${unit}.`];
}

/**
 * Raw beside cleaned: the row the finding would have shown had the flagged readings been used,
 * and a note saying they were not. Empty when no reading of the period was flagged.
 */
function rawEvidence(m: MeteredPeriod, billed: number, unit: string, notes: string[]): EvidenceRow[] {
  if (!m.raw || !m.flaggedIntervals) return [];
  const rawUsage = m.raw.coverage > 0 && m.raw.coverage < 1 ? m.raw.usage / m.raw.coverage : m.raw.usage;
  notes.push(`${m.flaggedIntervals} reading(s) in this period were flagged by the data-quality stage (see the building's data-quality table); they are left out and counted as missing (coverage ${formatPct(m.raw.coverage)} → ${formatPct(m.coverage)}). No amount rests on them.`);
  return [{ label: `Usage (${unit}), raw readings incl. ${m.flaggedIntervals} flagged (not used)`, billed, expected: Number(rawUsage.toFixed(3)), difference: Number((billed - rawUsage).toFixed(3)) }];
}
