/**
 * Tolerance rules shared by the checks. Money is compared in whole cents so a difference
 * sitting exactly on a tolerance is not turned into a finding by floating-point noise.
 */
import type { Tolerances } from "../domain/types.ts";
import type { AuditTolerances } from "./types.ts";
import { toCents } from "../core/money.ts";

/** Audit defaults for everything portfolio.yaml does not set (portfolio values always win). */
export const AUDIT_DEFAULTS: Omit<AuditTolerances, keyof Tolerances> = {
  minCoverage: 0.9,
  estimateStreakMin: 2,
  loneEstimateSeverity: "info",
  outlierRatio: 2,
  demandWindowMinutes: 15,
  trailingMissingDays: null,
};

/**
 * Merges portfolio tolerances, audit defaults and caller overrides (later wins).
 * @example resolveTolerances({usagePct:2,demandPct:3,costAbs:1,costPct:0.5}).minCoverage // 0.9
 */
export function resolveTolerances(portfolio: Tolerances, overrides: Partial<AuditTolerances> = {}): AuditTolerances {
  return { ...portfolio, ...AUDIT_DEFAULTS, ...overrides };
}

/**
 * The portfolio rule: a money difference is a finding only when it exceeds BOTH `costAbs`
 * (currency) and `costPct` (percent of `reference`, the expected amount). Strictly greater.
 * @example exceedsMoneyTolerance(1.01, 100, {costAbs:1, costPct:0.5}) // true
 * @example exceedsMoneyTolerance(1.00, 100, {costAbs:1, costPct:0.5}) // false (not beyond 1.00)
 * @example exceedsMoneyTolerance(4.00, 1000, {costAbs:1, costPct:0.5}) // false (0.4 % ≤ 0.5 %)
 */
export function exceedsMoneyTolerance(
  difference: number,
  reference: number,
  tol: Pick<Tolerances, "costAbs" | "costPct">,
): boolean {
  const diffCents = Math.abs(toCents(difference));
  const absCents = toCents(tol.costAbs);
  // percent limit in cents, kept fractional: |diff| > pct/100 × |ref|
  const pctLimitCents = Math.round((tol.costPct / 100) * Math.abs(toCents(reference)) * 1e6) / 1e6;
  return diffCents > absCents && diffCents > pctLimitCents;
}

/**
 * Relative difference `(actual − expected) / |expected|` beyond `pct` percent (strictly).
 * An expected value of 0 counts any non-zero actual as beyond.
 */
export function exceedsPct(actual: number, expected: number, pct: number): boolean {
  const diff = Math.abs(actual - expected);
  if (expected === 0) return diff > 1e-9;
  return diff / Math.abs(expected) > pct / 100 + 1e-12;
}
