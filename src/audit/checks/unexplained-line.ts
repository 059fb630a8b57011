/**
 * unexplained-line — a printed charge that no tariff charge explains (no computed line with
 * the same label). Finding when its amount exceeds BOTH cost_abs and cost_pct (of the bill
 * total): severity warning (it may be a legitimate charge the tariff file lacks), amount = the
 * line's amount.
 */
import { adjustedCorrection } from "../corrections.ts";
import { billFinding, type AuditContext } from "../context.ts";
import { exceedsMoneyTolerance } from "../tolerances.ts";
import type { Finding } from "../types.ts";
import { groupLines } from "./labels.ts";
import { moneyText, roundCents } from "../../core/money.ts";

/** unexplained-line findings for every bill with printed lines and a computed bill. */
export function checkUnexplainedLine(ctx: AuditContext): Finding[] {
  const out: Finding[] = [];
  for (const bill of ctx.input.portfolio.bills) {
    const printed = ctx.linesByBill.get(bill.billId);
    const computed = ctx.input.priced.get(bill.billId) ?? null;
    if (!printed?.length || computed === null) continue;
    for (const g of groupLines(printed, computed.lines)) {
      if (g.printed === null || g.computed !== null) continue;
      const amount = roundCents(g.printed);
      if (!exceedsMoneyTolerance(amount, bill.total, ctx.tol)) continue;
      out.push(billFinding(ctx, bill, {
        check: "unexplained-line", severity: "warning", amountAtStake: amount,
        title: `Charge "${g.label}" not in the tariff`,
        message: `Bill ${bill.billId} prints "${g.label}" for ${moneyText(amount, ctx.currency)}, but no charge of tariff ${ctx.meters.get(bill.meterId)?.tariffId ?? "?"} has that label.`,
        evidence: {
          rows: [{ label: g.label, billed: amount, expected: null, difference: amount }],
          notes: [`Tariff charges: ${computed.lines.map((l) => l.label).join(", ")}.`],
        },
        corrections: [adjustedCorrection(bill, amount, computed, `the printed bill without the "${g.label}" line`)],
      }));
    }
  }
  return out;
}
