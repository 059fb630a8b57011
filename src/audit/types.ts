/**
 * Types of the bill audit (src/audit). The audit runs after pricing: it receives every bill
 * already re-priced by the tariff engine and already reconciled against interval data, and
 * returns findings. Nothing here reads files or the clock.
 *
 * Severity rule, used by every check:
 *   - `error`   money or data plainly wrong (a total that the tariff cannot produce, a bill paid
 *               twice, demand higher than the meter ever saw beyond tolerance, a multiplier error);
 *   - `warning` likely wrong, needs a look (a gap in billing, usage off the meter, a streak of
 *               estimates, usage far from the same month last year, an unexplained printed line);
 *   - `info`    worth knowing (a single estimated read, a bill that could not be fully
 *               recomputed, a period with too little interval data to compare).
 */
import type { Bill, Meter, Portfolio, Tolerances } from "../domain/types.ts";
import type { ComputedBill } from "../tariff/index.ts";

/** Stable check codes, as listed in the outputs contract. */
export const CHECK_CODES = [
  "total-mismatch",
  "line-mismatch",
  "unexplained-line",
  "usage-vs-meter",
  "demand-vs-meter",
  "period-gap",
  "period-overlap",
  "duplicate-bill",
  "estimated-read",
  "usage-outlier",
  "multiplier-suspect",
  "missing-bill",
  "rate-suspect",
] as const;

export type CheckCode = (typeof CHECK_CODES)[number];

export type Severity = "error" | "warning" | "info";

/** Larger = more serious; used for sorting and `--fail-on`. */
export const SEVERITY_RANK: Record<Severity, number> = { error: 2, warning: 1, info: 0 };

export interface EvidenceRow {
  label: string;
  billed: string | number | null;
  expected: string | number | null;
  difference?: string | number | null;
}

export interface Evidence {
  rows: EvidenceRow[];
  notes: string[];
}

/**
 * A bill as it should have been: the figure a claim rests on. Checks that put money on a finding
 * attach one per bill they speak for, so the finding's amount, the bills table and the dispute
 * list all read the same corrected total (amountAtStake = Σ billedTotal − correctedTotal).
 */
export interface CorrectedBill {
  /** The bill corrected; null for a period no bill covers (a gap). */
  billId: string | null;
  periodStart: string;
  periodEnd: string;
  /** What the bill says (0 for a gap). */
  billedTotal: number;
  /** What it should have been, to the cent. */
  correctedTotal: number;
  /** The re-priced bill behind `correctedTotal`; null when no pricing is involved (a duplicate: 0). */
  corrected: ComputedBill | null;
  /** Usage and demand the corrected bill was priced on (bill unit, kW); null when not priced. */
  usage: number | null;
  demandKw: number | null;
  /** Plain words: what the corrected bill was priced on. */
  correctedOn: string;
  /** Low and high corrected totals when `correctedTotal` is an estimate from a usage band. */
  range?: { low: number; high: number };
}

export interface Finding {
  buildingId: string;
  meterId: string;
  billId: string | null;
  periodStart: string | null;
  periodEnd: string | null;
  check: CheckCode;
  severity: Severity;
  /** Currency; positive = the bill looks too high, negative = too low; null = not money. */
  amountAtStake: number | null;
  /** Plain-language title for the page. */
  title: string;
  /** One sentence with the numbers. */
  message: string;
  evidence: Evidence;
  /**
   * Other bills this finding speaks for (a streak of estimates, a run of multiplier errors,
   * the two bills on either side of a gap). Used to stop one cause cascading into more findings.
   */
  relatedBillIds?: string[];
  /** The corrected bills behind `amountAtStake` (absent when the finding is not about money). */
  corrections?: CorrectedBill[];
  /** Check codes of the findings this one absorbed as their root cause (see dedupe.ts). */
  absorbedChecks?: CheckCode[];
}

/**
 * A bill's period reconciled against the meter's interval data.
 * `usage` has the meter multiplier applied and is in the bill's unit.
 */
export interface MeteredPeriod {
  usage: number;
  /** Highest rolling-window average demand in the period, kW; null when not electricity or no full window. */
  peakKw: number | null;
  /** Share (0–1) of the expected intervals that are present. */
  coverage: number;
  /** Intervals present with a finite value. */
  intervals: number;
  /** Intervals the half-open local period holds under the zone's rules (DST-aware). */
  expectedIntervals: number;
  /** Rolling window used for `peakKw`, minutes (absent = the audit's demandWindowMinutes). */
  peakWindowMinutes?: number;
  /**
   * Readings in the period that the data-quality stage flagged. They are left out of `usage`,
   * `peakKw`, `intervals` and `coverage` (counted as missing), so no comparison rests on them.
   */
  flaggedIntervals?: number;
  /** The same period on every reading as read, flagged ones included; present when readings were flagged. */
  raw?: { usage: number; peakKw: number | null; coverage: number; intervals: number };
}

/** Portfolio tolerances plus the audit's own knobs (all stated on the methods page). */
export interface AuditTolerances extends Tolerances {
  /** Below this interval coverage (0–1) metered comparisons are not made. Default 0.9. */
  minCoverage: number;
  /** Consecutive estimated reads that make a streak (warning). Default 2. */
  estimateStreakMin: number;
  /** Severity of a lone estimated read (not part of a streak). Default info: estimates are routine. */
  loneEstimateSeverity: "info" | "warning";
  /** Interim outlier rule: flag use/day beyond this ratio (or its inverse) of the same month a year earlier. Default 2. */
  outlierRatio: number;
  /** Rolling window for metered peak demand, minutes. Default 15. */
  demandWindowMinutes: number;
  /**
   * Interval data with no bill for longer than this many days after a meter's last bill (up to
   * as_of, default the portfolio's last bill end) is a missing bill. Null (default) = 75 % of the
   * meter's median billing period, i.e. most of a billing cycle has passed without a bill.
   */
  trailingMissingDays: number | null;
}

/** What the audit may ask the tariff engine to price instead of the bill as billed. */
export type RepriceAlternative =
  /** Same tariff, corrected quantities (metered usage and/or demand). */
  | { kind: "quantities"; usage: number; demandKw: number | null }
  /** Another tariff, or one dated version of a tariff applied to the whole period (`versionFrom`). */
  | { kind: "rate"; tariffId: string; versionFrom: string | null; label: string };

export type RepriceFn = (bill: Bill, alternative: RepriceAlternative) => ComputedBill | null;

export interface AuditInput {
  portfolio: Portfolio;
  /** Computed bill per bill id; null = could not be priced (tariff missing or unpriceable). */
  priced: Map<string, ComputedBill | null>;
  /** Metered reconciliation per bill id; null or absent = no interval data for the meter. */
  metered: Map<string, MeteredPeriod | null>;
  /** Overrides on top of portfolio.settings.tolerances and the audit defaults. */
  tolerances?: Partial<AuditTolerances>;
  /** Re-pricing hook (the tariff engine, wired in by the caller). Without it money at stake for meter checks is null. */
  reprice?: RepriceFn;
  /** Alternatives tried by rate-suspect; default: every other tariff id in the portfolio, all versions. */
  rateAlternatives?: (bill: Bill, meter: Meter) => Extract<RepriceAlternative, { kind: "rate" }>[];
  /** Expected usage per bill id from a baseline model (bill unit); replaces the interim outlier rule. */
  expectedUsage?: Map<string, { p50: number; low: number; high: number }>;
  /**
   * Expected usage of a meter over any period (bill unit) with a band and the basis in words,
   * used to price a period nobody billed. Null = no model for the meter (the gap checks then
   * fall back to the neighbouring bills' use per day).
   */
  expectedUsageForPeriod?: (meterId: string, periodStart: string, periodEnd: string) => { p50: number; low: number; high: number; basis: string } | null;
}
