/**
 * total-mismatch — the billed total vs the total the tariff gives for the billed quantities.
 *
 * Compared only when every computed line is `exact`. Finding when the difference exceeds BOTH
 * cost_abs and cost_pct (of the computed total): severity error, amount = billed − computed.
 * A bill that could not be priced, or only with estimated lines (time-of-use without interval
 * data), is not compared and raises nothing here: it is not a difference. Its state is shown with
 * the bill and counted in the build summary.
 */
import type { Bill } from "../../domain/types.ts";
import type { ComputedBill } from "../../tariff/index.ts";
import { billFinding, type AuditContext } from "../context.ts";
import { exceedsMoneyTolerance } from "../tolerances.ts";
import type { EvidenceRow, Finding } from "../types.ts";
import { groupLines } from "./labels.ts";
import { repricedCorrection } from "../corrections.ts";
import { moneyText, roundCents } from "../../core/money.ts";

/** Evidence rows: every charge (printed vs computed) and the total. Shared with other checks. */
function billVsComputedRows(ctx: AuditContext, bill: Bill, computed: ComputedBill): EvidenceRow[] {
  const printed = ctx.linesByBill.get(bill.billId) ?? [];
  const rows: EvidenceRow[] = groupLines(printed, computed.lines).map((g) => ({
    label: g.computedLines.length
      ? `${g.label}${g.computedLines.map((l) => (l.quantity !== null && l.rate !== null ? ` (${l.quantity} ${l.unit} × ${l.rate})` : "")).join("")}${g.exact ? "" : " [not exact]"}`
      : `${g.label} [no tariff charge]`,
    billed: g.printed === null ? null : roundCents(g.printed),
    expected: g.computed === null ? null : roundCents(g.computed),
    difference: g.printed !== null && g.computed !== null ? roundCents(g.printed - g.computed) : null,
  }));
  rows.push({ label: "Total", billed: roundCents(bill.total), expected: roundCents(computed.total), difference: roundCents(bill.total - computed.total) });
  return rows;
}

/** total-mismatch findings for every bill. */
export function checkTotalMismatch(ctx: AuditContext): Finding[] {
  const out: Finding[] = [];
  for (const bill of ctx.input.portfolio.bills) {
    const computed = ctx.input.priced.get(bill.billId) ?? null;
    if (computed === null || !computed.exact) continue;
    const rows = billVsComputedRows(ctx, bill, computed);
    const notes = [...computed.notes];
    const diff = roundCents(bill.total - computed.total);
    if (!exceedsMoneyTolerance(diff, computed.total, ctx.tol)) continue;
    out.push(billFinding(ctx, bill, {
      check: "total-mismatch", severity: "error", amountAtStake: diff,
      title: diff > 0 ? "Bill total higher than the tariff gives" : "Bill total lower than the tariff gives",
      message: `Billed ${moneyText(bill.total, ctx.currency)} but the tariff gives ${moneyText(computed.total, ctx.currency)} for the billed quantities, a difference of ${moneyText(diff, ctx.currency)}.`,
      evidence: { rows, notes },
      corrections: [repricedCorrection(bill, computed, bill.usage, bill.demandKw, "the billed usage and demand, priced through the tariff")],
    }));
  }
  return out;
}
