/**
 * rate-suspect — the bill matches another tariff (or another dated version) much better than
 * its own: probably priced on the wrong schedule, or on an old rate after a change.
 *
 * Tried only when the bill's own re-pricing is exact and its total mismatch exceeds the money
 * tolerance, and a reprice hook is given. An alternative (exact re-pricing) is a match when its
 * difference is within the money tolerance, or at most 2 % of the own difference (far closer).
 * Severity error; amount = billed − computed under the bill's own tariff (what was overpaid).
 */
import { repricedCorrection } from "../corrections.ts";
import { billFinding, type AuditContext } from "../context.ts";
import { exceedsMoneyTolerance } from "../tolerances.ts";
import type { Finding, RepriceAlternative } from "../types.ts";
import { moneyText, roundCents } from "../../core/money.ts";

type RateAlternative = Extract<RepriceAlternative, { kind: "rate" }>;

/** rate-suspect findings for every bill whose total mismatches. */
export function checkRateSuspect(ctx: AuditContext): Finding[] {
  const out: Finding[] = [];
  const reprice = ctx.input.reprice;
  if (!reprice) return out;
  const tariffIds = [...ctx.input.portfolio.tariffs.keys()];
  for (const bill of ctx.input.portfolio.bills) {
    const own = ctx.input.priced.get(bill.billId) ?? null;
    const meter = ctx.meters.get(bill.meterId);
    if (own === null || !own.exact || !meter) continue;
    const ownDiff = roundCents(bill.total - own.total);
    if (!exceedsMoneyTolerance(ownDiff, own.total, ctx.tol)) continue;
    const alternatives: RateAlternative[] = ctx.input.rateAlternatives?.(bill, meter) ??
      tariffIds.filter((id) => id !== meter.tariffId).map((id) => ({ kind: "rate", tariffId: id, versionFrom: null, label: `tariff ${id}` }));
    let best: { alt: RateAlternative; total: number; diff: number } | null = null;
    for (const alt of alternatives) {
      const priced = reprice(bill, alt);
      if (priced === null || !priced.exact) continue;
      const diff = roundCents(bill.total - priced.total);
      if (best === null || Math.abs(diff) < Math.abs(best.diff)) best = { alt, total: priced.total, diff };
    }
    if (best === null) continue;
    const matches = !exceedsMoneyTolerance(best.diff, best.total, ctx.tol) || Math.abs(best.diff) <= 0.02 * Math.abs(ownDiff);
    if (!matches) continue;
    out.push(billFinding(ctx, bill, {
      check: "rate-suspect", severity: "error", amountAtStake: ownDiff,
      title: "Bill priced on the wrong rate",
      message: `Bill ${bill.billId} (${moneyText(bill.total, ctx.currency)}) matches ${best.alt.label} within ${moneyText(Math.abs(best.diff), ctx.currency)}, but differs by ${moneyText(ownDiff, ctx.currency)} from its own tariff ${meter.tariffId} (${moneyText(own.total, ctx.currency)}), so it was probably priced on the wrong rate.`,
      evidence: {
        rows: [
          { label: `Total under own tariff ${meter.tariffId}`, billed: roundCents(bill.total), expected: roundCents(own.total), difference: ownDiff },
          { label: `Total under ${best.alt.label}`, billed: roundCents(bill.total), expected: roundCents(best.total), difference: best.diff },
        ],
        notes: [`Alternatives tried: ${alternatives.map((a) => a.label).join(", ")}.`],
      },
      corrections: [repricedCorrection(bill, own, bill.usage, bill.demandKw, `the billed usage and demand, priced on tariff ${meter.tariffId} as in force on the bill's days`)],
    }));
  }
  return out;
}
