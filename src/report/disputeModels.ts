/**
 * View models of the finance reader's pages: the dispute list (disputes.html), the dispute
 * block at the top of the index and one printable claim sheet per dispute. Like every view
 * model they carry formatted strings; `sort` fields carry the plain number for the sort script.
 *
 * Every money figure is one of the Dispute's own numbers (src/disputes/types.ts) formatted, or
 * a cent-exact sum of them: the report never recomputes a claim.
 */
import type { DisputeKind } from "../disputes/index.ts";
import type { DataFileRow, LabelValue, PageBase, TableCell, TableModel } from "./siteModel.ts";

/** One dispute as a row of a dispute table (the same columns on the index and the dispute list). */
export interface DisputeRow {
  disputeId: string;
  building: string;
  buildingHref: string;
  meter: string;
  /** Utility account, or "—". */
  account: string;
  /** e.g. "Meter E1 · account 100-200", or "Meter E1" when no account is on file. */
  meterText: string;
  /** Bill ids, comma-separated ("none: period not billed" for a gap). */
  bills: string;
  /** Service period, first and last day of service. */
  period: string;
  periodSort: string;
  /** What is wrong, in plain words (the dispute's title). */
  title: string;
  billed: string;
  billedSort: string;
  corrected: string;
  correctedSort: string;
  /** The range of an estimated corrected total, e.g. "range $5,100.12 – $6,301.90"; null when exact. */
  correctedNote: string | null;
  /** Claims: billed − corrected. Back-billing risks: the shortfall, corrected − billed, shown positive. */
  amount: string;
  amountSort: string;
  /** What the corrected total rests on, in plain words. */
  basis: string;
  /** Relative to the site root. */
  sheetHref: string;
  /** Accessible name of the evidence link, e.g. "Claim sheet for bill WHS-E-2025-02". */
  sheetLabel: string;
}

/** A footer row of a dispute table: the totals of the rows it names. */
export interface DisputeTotal {
  /** e.g. "Total, 7 claims". */
  label: string;
  billed: string;
  corrected: string;
  amount: string;
  /** The amount as a plain number (cent-exact sum), for tests and scripts reading the page. */
  amountSort: string;
}

/** A table of claims or of back-billing risks, with its totals. */
export interface DisputeTable {
  /** DOM id of the table, unique on the page. */
  id: string;
  kind: DisputeKind;
  caption: string;
  /** Heading of the money column: "Claim (billed − corrected)" or "Not yet billed (corrected − billed)". */
  amountLabel: string;
  /** Largest amount first. */
  rows: DisputeRow[];
  /** One or two footer rows (the rows shown, then all when the table shows only the largest). */
  totals: DisputeTotal[];
}

/** The dispute block of the index: the headline figure, the largest claims and the budget risks. */
export interface IndexDisputes {
  /** Sum of `claimAmount` over the claims, formatted: equals the dispute list's total and disputes.csv. */
  claimTotal: string;
  /** e.g. "7 claims covering 9 bills". */
  claimCount: string;
  /** Sum of the shortfalls of the back-billing risks, formatted. */
  riskTotal: string;
  riskCount: string;
  /** Relative link to the dispute list. */
  href: string;
  /** The largest claims (at most 10); null when there is no claim. */
  claims: DisputeTable | null;
  /** "Showing the 10 largest of 14 claims." when cut; null when all are shown. */
  moreText: string | null;
  /** The largest back-billing risks (at most 10, like the claims), largest first; null when none. */
  risks: DisputeTable | null;
  /** "Showing the 10 largest of 40 risks." when cut; null when all are shown. */
  riskMoreText: string | null;
}

/** The dispute list page. */
export interface DisputesPage extends PageBase {
  lede: string;
  /** Headline figures: claim total and count, risk total and count. */
  summary: LabelValue[];
  claims: DisputeTable | null;
  risks: DisputeTable | null;
  /** Cautions: findings are leads, the approved tariff governs, the dispute procedure and look-back apply. */
  cautions: string[];
  /** disputes.csv and disputes.json as written by this build (filled by the site writer). */
  downloads: DataFileRow[];
  /** What the basis words mean. */
  bases: LabelValue[];
}

/** A table with a footer row (the claim sheet's line comparison: printed beside corrected, bill totals at the foot). */
export interface FootedTable extends TableModel {
  /** Footer row, same columns; first cell is its row header. Null when none. */
  foot: TableCell[] | null;
}

/** One bill of a claim sheet. */
export interface ClaimBill {
  billId: string;
  /** DOM id of the bill's section. */
  anchor: string;
  heading: string;
  /** Billed, corrected, difference, read type, tariff, versions, what the corrected bill rests on. */
  facts: LabelValue[];
  /** Printed lines beside the corrected lines; null when the bill has no lines to compare (e.g. a duplicate). */
  lines: FootedTable | null;
  /** The corrected bill's arithmetic: quantity × rate = amount with the engine's note; null when not priced. */
  arithmetic: TableModel | null;
  /** Billed vs metered vs corrected usage and demand. */
  quantities: TableModel;
  notes: string[];
  /** This bill on its meter's bills page (relative to the site root). */
  billsHref: string;
}

/** A printable one-page sheet of one dispute, to attach to a message to the utility. */
export interface ClaimSheet extends PageBase {
  disputeId: string;
  kind: DisputeKind;
  /** "Billing claim" or "Budget note: possible back-billing". */
  kindLabel: string;
  /** The amount in large type with its label. */
  amountLabel: string;
  amount: string;
  /** The dispute's title (what is wrong). */
  what: string;
  /** The dispute's explanation, as in disputes.csv. */
  explanation: string;
  /** What the corrected total rests on, in one plain sentence. */
  basisText: string;
  /** Portfolio, building, account, meter, bills, period, billed, corrected, basis, checks. */
  header: LabelValue[];
  /** The corrected range of an estimate, in words; null when exact. */
  rangeText: string | null;
  bills: ClaimBill[];
  /** Other bills that bear on it, with links to their meter's bills page. */
  related: { billId: string; href: string }[];
  notes: string[];
  cautions: string[];
  buildingName: string;
  buildingHref: string;
  meterId: string;
  meterBillsHref: string;
  disputesHref: string;
}
