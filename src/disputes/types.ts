/**
 * Types of the dispute list (src/disputes): the audit's money findings turned into claims a
 * finance team can send to the utility. One dispute = one root cause: a bill, or the bills one
 * cause made wrong, with what was billed, what the bill should have been (the corrected total,
 * re-priced through the tariff) and the claim = billed − corrected.
 *
 * Contract: outputs.md, section "disputes" (columns of disputes.csv / disputes.json).
 */
import type { LineStatus } from "../tariff/index.ts";

/** What the corrected total rests on (outputs.md `basis`). */
export type DisputeBasis = "tariff" | "meter" | "duplicate" | "overlap" | "gap" | "multiplier" | "rate-version";

/** `claim`: the bill is too high (money to recover); `back-bill-risk`: too low or not billed (the utility may bill it later). */
export type DisputeKind = "claim" | "back-bill-risk";

/** One line of a bill: as printed (bill_lines.csv) beside the corrected bill's line of the same label. */
export interface DisputeLine {
  label: string;
  /** Printed amount; null when the bill has no printed lines or none of this label. */
  printed: number | null;
  /** The corrected bill's amount for this label; null when the tariff has no such charge. */
  corrected: number | null;
  /** printed − corrected, when both exist. */
  difference: number | null;
  /** Quantity × rate of the corrected line (null for lines without a single quantity). */
  quantity: number | null;
  unit: string;
  rate: number | null;
  /** The engine's arithmetic note for the corrected line (blocks, periods, proration…). */
  note: string | null;
  status: LineStatus | null;
}

/** One bill of a dispute, with everything the claim sheet prints about it. */
export interface DisputeBill {
  billId: string;
  periodStart: string;
  periodEnd: string;
  /** Total on the bill (0 for a period nobody billed). */
  billedTotal: number;
  correctedTotal: number;
  /** billedTotal − correctedTotal, to the cent. */
  claimAmount: number;
  readType: "actual" | "estimated" | null;
  usageUnit: string;
  /** Usage printed on the bill (null for a gap). */
  billedUsage: number | null;
  /** Interval sum over the bill's local period × multiplier; null without interval data. */
  meteredUsage: number | null;
  /** Usage the corrected bill was priced on. */
  correctedUsage: number | null;
  billedDemandKw: number | null;
  /** Highest window-average demand in the interval data; null without interval data. */
  meteredDemandKw: number | null;
  /** Billing demand of the corrected bill (after ratchet and minimum); null without demand charges. */
  correctedDemandKw: number | null;
  tariffId: string;
  /** Tariff versions the corrected bill was priced under, with their share of billing days. */
  versions: { from: string; days: number; weight: number }[];
  /** Printed lines beside the corrected lines; empty when not priced (e.g. a duplicate: corrected = 0). */
  lines: DisputeLine[];
  /** The engine's notes on the corrected bill (unit conversion, proration, rounding rule). */
  notes: string[];
  /** Plain words: what the corrected bill was priced on, e.g. "metered usage and demand (interval data, multiplier 40)". */
  correctedOn: string;
}

export interface Dispute {
  /** Stable across builds of the same inputs; safe in a file name (letters, digits, `-`). */
  disputeId: string;
  buildingId: string;
  meterId: string;
  /** Utility account from meters.csv; null when not given. */
  account: string | null;
  /** Bills the claim covers (for a gap: the bills on either side are in `relatedBillIds`, this is empty). */
  billIds: string[];
  periodStart: string;
  periodEnd: string;
  /** Audit check codes behind the claim (the root first). */
  checks: string[];
  basis: DisputeBasis;
  kind: DisputeKind;
  severity: "error" | "warning";
  billedTotal: number;
  correctedTotal: number;
  /** billedTotal − correctedTotal, two decimals; > 0 for a claim. */
  claimAmount: number;
  /** Low and high corrected total when the corrected figure is an estimate (a gap priced from a usage band); else null. */
  correctedRange: { low: number; high: number } | null;
  /** Plain words, one short phrase: "Billed usage is twice what the meter recorded". */
  title: string;
  /** One or two sentences with the numbers; the `explanation` column of disputes.csv. */
  explanation: string;
  bills: DisputeBill[];
  /** Other bills that bear on the claim (the bill that already covered overlapped days, bills either side of a gap). */
  relatedBillIds: string[];
  /** Further evidence sentences (absorbed findings, assumptions of an estimate). */
  notes: string[];
}
