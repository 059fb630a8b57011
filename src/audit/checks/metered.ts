/** Shared access to a bill's metered reconciliation and to the re-pricing hook. */
import type { Bill } from "../../domain/types.ts";
import type { ComputedBill } from "../../tariff/index.ts";
import type { AuditContext } from "../context.ts";
import type { MeteredPeriod } from "../types.ts";
import { roundCents } from "../../core/money.ts";

/** Metered period usable for comparison: present, with data, coverage at least `minCoverage`. */
export function comparableMetered(ctx: AuditContext, bill: Bill): MeteredPeriod | null {
  const m = ctx.input.metered.get(bill.billId) ?? null;
  if (m === null || m.intervals === 0 || m.coverage < ctx.tol.minCoverage) return null;
  return m;
}

/**
 * Billed total − total re-priced with corrected quantities, or null without a reprice hook
 * (or when the engine cannot price it). Positive = the bill looks too high.
 */
export function moneyAtStakeOnQuantities(
  ctx: AuditContext,
  bill: Bill,
  usage: number,
  demandKw: number | null,
): { amount: number; repricedTotal: number; repriced: ComputedBill } | null {
  const repriced = ctx.input.reprice?.(bill, { kind: "quantities", usage, demandKw }) ?? null;
  if (repriced === null) return null;
  return { amount: roundCents(bill.total - repriced.total), repricedTotal: repriced.total, repriced };
}

/**
 * Metered usage over the whole period: the sum of the intervals present scaled up by their
 * coverage (missing intervals assumed to use the period's average), so a period with a few
 * missing intervals is not compared as if complete. Equal to `usage` at full coverage.
 * @example fullPeriodUsage({ usage: 950, coverage: 0.95, ... }) // 1000
 */
export function fullPeriodUsage(m: MeteredPeriod): number {
  return m.coverage > 0 && m.coverage < 1 ? m.usage / m.coverage : m.usage;
}
