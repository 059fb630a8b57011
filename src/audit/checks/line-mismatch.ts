/**
 * line-mismatch — a printed charge vs the tariff charge with the same label.
 *
 * Only labels whose computed lines are all `exact` are compared. Finding when printed −
 * computed exceeds BOTH cost_abs and cost_pct (of the computed charge): severity error,
 * amount = printed − computed for that line.
 */
import { billFinding, type AuditContext } from "../context.ts";
import { exceedsMoneyTolerance } from "../tolerances.ts";
import type { Finding } from "../types.ts";
import { groupLines } from "./labels.ts";
import { adjustedCorrection } from "../corrections.ts";
import { moneyText, roundCents } from "../../core/money.ts";

/** line-mismatch findings for every bill with printed lines. */
export function checkLineMismatch(ctx: AuditContext): Finding[] {
  const out: Finding[] = [];
  for (const bill of ctx.input.portfolio.bills) {
    const printed = ctx.linesByBill.get(bill.billId);
    const computed = ctx.input.priced.get(bill.billId) ?? null;
    if (!printed?.length || computed === null) continue;
    for (const g of groupLines(printed, computed.lines)) {
      if (g.printed === null || g.computed === null || !g.exact) continue;
      const diff = roundCents(g.printed - g.computed);
      if (!exceedsMoneyTolerance(diff, g.computed, ctx.tol)) continue;
      const math = g.computedLines
        .map((l) => (l.quantity !== null && l.rate !== null ? `${l.quantity} ${l.unit} × ${l.rate}` : l.kind))
        .join(" + ");
      out.push(billFinding(ctx, bill, {
        check: "line-mismatch", severity: "error", amountAtStake: diff,
        title: `"${g.label}" charge differs from the tariff`,
        message: `The "${g.label}" line of bill ${bill.billId} is ${moneyText(g.printed, ctx.currency)} but the tariff gives ${moneyText(g.computed, ctx.currency)} (${math}), a difference of ${moneyText(diff, ctx.currency)}.`,
        evidence: {
          rows: [{ label: g.label, billed: roundCents(g.printed), expected: roundCents(g.computed), difference: diff }],
          notes: g.computedLines.map((l) => l.note).filter((n): n is string => !!n),
        },
        corrections: [adjustedCorrection(bill, diff, computed, `the printed bill with the "${g.label}" line at the tariff's ${moneyText(g.computed, ctx.currency)}`)],
      }));
    }
  }
  return out;
}
