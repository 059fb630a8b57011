/**
 * View models of a meter's bills page (bills/<building>/<meter>.html) and of the per-bill
 * re-pricing shown there. Like every view model, numbers are already formatted strings.
 */
import type { BaselineSection, LabelValue, PageBase, QualitySection, TableModel } from "./siteModel.ts";

/** One computed line of a recomputation: quantity × rate = amount, with the printed amount of the same label beside it. */
export interface MathLine {
  label: string;
  kind: string;
  quantity: string;
  rate: string;
  amount: string;
  /** Plain words: "exact", "estimated", "needs interval data". */
  status: string;
  note: string;
  /** Amount printed on the bill for this charge (bill_lines.csv), "" when not shown on this row. Billed basis only. */
  printed: string;
  /** Printed − tariff for this charge when both exist and the charge is exact; "" otherwise. */
  printedDifference: string;
  printedTone?: "pos" | "neg";
}

/** One recomputation of a bill, on ONE basis (never mixed). */
export interface BasisMath {
  basis: "billed" | "metered";
  /** e.g. "Re-priced on the billed quantities". */
  heading: string;
  /** One sentence: what the basis is and what it checks. */
  explanation: string;
  /** The quantities this recomputation priced (usage, demand) and its tariff facts. */
  facts: LabelValue[];
  lines: MathLine[];
  /** Whether the billed basis shows the bill's printed lines beside the tariff's (only when the bill has printed lines). */
  showPrinted: boolean;
  /** Printed lines whose label matches no tariff charge: label and amount. */
  unmatchedPrinted: { label: string; amount: string }[];
  total: string;
  billed: string;
  /** "Billed − re-priced" as a signed amount; null when this recomputation is not exact (then `stateText` says why). */
  difference: string | null;
  differenceTone?: "pos" | "neg";
  /** Plain words when the recomputation cannot be compared (estimated / needs interval data); null when exact. */
  stateText: string | null;
  notes: string[];
}

/** The claim or back-billing risk a bill belongs to, as the dispute list states it. */
export interface BillClaim {
  /** e.g. "Claim" or "Back-billing risk". */
  label: string;
  /** The dispute's per-bill amount, formatted; never recomputed here. */
  amount: string;
  title: string;
  /** Relative to the site root. */
  href: string;
}

/** Everything the meter page shows about one bill. */
export interface BillDetail {
  billId: string;
  /** Fragment id (`billAnchor`). */
  anchor: string;
  heading: string;
  period: string;
  /** The bill's check state in plain words. */
  stateText: string;
  facts: LabelValue[];
  claims: BillClaim[];
  /** Recomputations shown (billed basis first); empty when not re-priced. */
  bases: BasisMath[];
  /** Why the bill was not re-priced; null when it was. */
  notPricedReason: string | null;
}

/** A page per meter: its facts, its bills, the re-pricing of each bill, its interval data and models. */
export interface MeterBillsPage extends PageBase {
  buildingId: string;
  meterId: string;
  buildingName: string;
  /** Relative to the site root. */
  buildingHref: string;
  lede: string;
  facts: LabelValue[];
  billsTable: TableModel;
  /** Plain sentences on what the columns and states mean. */
  billsKey: string[];
  bills: BillDetail[];
  /** Claims and risks on this meter that cover no bill of it (e.g. a period nobody billed). */
  otherClaims: BillClaim[];
  meteredTable: TableModel | null;
  baseline: BaselineSection | null;
  quality: QualitySection | null;
}
