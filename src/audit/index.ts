/**
 * The bill audit: every check over every bill, cascades removed, ranked by money at stake.
 *
 *   runAudit(input)            -> Finding[]
 *   findingsToCsvRows(f)       -> rows of findings.csv      (./output.ts)
 *   toFindingsJson(f)          -> findings.json objects     (./output.ts)
 *   meteredForBills(portfolio) -> AuditInput.metered        (./reconcile.ts)
 *   makeRepricer({portfolio, priced, price}) -> { reprice, rateAlternatives } (./wiring.ts)
 */
import { buildContext } from "./context.ts";
import { checkDemandVsMeter } from "./checks/demand-vs-meter.ts";
import { checkDuplicateBill } from "./checks/duplicate-bill.ts";
import { checkEstimatedRead } from "./checks/estimated-read.ts";
import { checkLineMismatch } from "./checks/line-mismatch.ts";
import { checkMissingBill } from "./checks/missing-bill.ts";
import { checkMultiplierSuspect } from "./checks/multiplier-suspect.ts";
import { checkPeriodGap } from "./checks/period-gap.ts";
import { checkPeriodOverlap } from "./checks/period-overlap.ts";
import { checkRateSuspect } from "./checks/rate-suspect.ts";
import { checkTotalMismatch } from "./checks/total-mismatch.ts";
import { checkUnexplainedLine } from "./checks/unexplained-line.ts";
import { checkUsageOutlier } from "./checks/usage-outlier.ts";
import { checkUsageVsMeter } from "./checks/usage-vs-meter.ts";
import { dedupeFindings } from "./dedupe.ts";
import { SEVERITY_RANK, type AuditInput, type Finding, type Severity } from "./types.ts";

export * from "./types.ts";
export { meteredForPeriod, meteredForBills, localMidnightMs } from "./reconcile.ts";
export { findingsToCsvRows, findingsToCsvText, toFindingsJson, billsRecomputedRows, FINDINGS_CSV_COLUMNS } from "./output.ts";
export { resolveTolerances, exceedsMoneyTolerance, AUDIT_DEFAULTS } from "./tolerances.ts";
export { makeRepricer, pinVersion } from "./wiring.ts";

const CHECKS = [
  checkTotalMismatch, checkLineMismatch, checkUnexplainedLine, checkUsageVsMeter, checkDemandVsMeter,
  checkPeriodGap, checkPeriodOverlap, checkDuplicateBill, checkEstimatedRead, checkUsageOutlier,
  checkMultiplierSuspect, checkMissingBill, checkRateSuspect,
];

/**
 * Ranking: |amount at stake| descending (no amount counts as 0), then severity (error first),
 * then building, meter, period start, check, bill for a stable order.
 */
function compareFindings(a: Finding, b: Finding): number {
  return (
    Math.abs(b.amountAtStake ?? 0) - Math.abs(a.amountAtStake ?? 0) ||
    SEVERITY_RANK[b.severity] - SEVERITY_RANK[a.severity] ||
    a.buildingId.localeCompare(b.buildingId) ||
    a.meterId.localeCompare(b.meterId) ||
    (a.periodStart ?? "").localeCompare(b.periodStart ?? "") ||
    a.check.localeCompare(b.check) ||
    (a.billId ?? "").localeCompare(b.billId ?? "")
  );
}

/**
 * Runs every check, removes cascades (see dedupe.ts) and ranks the findings.
 * Pure: no I/O, no clock; the input is not mutated.
 * @example runAudit({ portfolio, priced, metered: meteredForBills(portfolio), reprice })
 */
export function runAudit(input: AuditInput): Finding[] {
  const ctx = buildContext(input);
  const all = CHECKS.flatMap((check) => check(ctx));
  return dedupeFindings(all, ctx.tol).sort(compareFindings);
}

/** True when any finding is at or above `threshold` (for `build --fail-on`). */
export function reachesSeverity(findings: Finding[], threshold: Severity): boolean {
  return findings.some((f) => SEVERITY_RANK[f.severity] >= SEVERITY_RANK[threshold]);
}

// Used by other folders (see test/architecture/layers.test.ts).
export { groupLines } from "./checks/labels.ts";
export { COMMON_RATIOS } from "./checks/multiplier-suspect.ts";
export { claimOf } from "./corrections.ts";
export { meteredViewsByBill } from "./meteredViews.ts";
export type { MeteredViews } from "./meteredViews.ts";
