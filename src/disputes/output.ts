/**
 * disputes.csv and disputes.json (outputs.md, section "disputes"). Pure: text and objects only.
 */
import { toCsv } from "../core/csv.ts";
import type { Dispute } from "./types.ts";
import { moneyCell } from "../core/money.ts";

/** Columns of disputes.csv, in contract order. */
export const DISPUTES_CSV_COLUMNS = [
  "dispute_id", "building_id", "meter_id", "account", "bill_ids", "period_start", "period_end",
  "checks", "basis", "billed_total", "corrected_total", "claim_amount", "kind", "explanation",
] as const;

type DisputeRow = Record<(typeof DISPUTES_CSV_COLUMNS)[number], string>;

const money = moneyCell;

/** One row per dispute with the contract's columns; money as two-decimal text. */
export function disputeRows(disputes: readonly Dispute[]): DisputeRow[] {
  return disputes.map((d) => ({
    dispute_id: d.disputeId,
    building_id: d.buildingId,
    meter_id: d.meterId,
    account: d.account ?? "",
    bill_ids: d.billIds.join(";"),
    period_start: d.periodStart,
    period_end: d.periodEnd,
    checks: d.checks.join(";"),
    basis: d.basis,
    billed_total: money(d.billedTotal),
    corrected_total: money(d.correctedTotal),
    claim_amount: money(d.claimAmount),
    kind: d.kind,
    explanation: d.explanation,
  }));
}

/** disputes.csv text. */
export function disputesCsv(disputes: readonly Dispute[]): string {
  return toCsv(DISPUTES_CSV_COLUMNS, disputeRows(disputes));
}

/**
 * disputes.json objects: the contract's columns (money as numbers; `bill_ids` and `checks`
 * `;`-separated as in the CSV), plus the claim's title, severity, the corrected range of an
 * estimate and each bill's evidence.
 */
export function disputesJson(disputes: readonly Dispute[]): object[] {
  return disputes.map((d) => ({
    dispute_id: d.disputeId,
    building_id: d.buildingId,
    meter_id: d.meterId,
    account: d.account,
    bill_ids: d.billIds.join(";"),
    period_start: d.periodStart,
    period_end: d.periodEnd,
    checks: d.checks.join(";"),
    basis: d.basis,
    billed_total: d.billedTotal,
    corrected_total: d.correctedTotal,
    claim_amount: d.claimAmount,
    kind: d.kind,
    explanation: d.explanation,
    title: d.title,
    severity: d.severity,
    corrected_low: d.correctedRange?.low ?? null,
    corrected_high: d.correctedRange?.high ?? null,
    related_bill_ids: d.relatedBillIds,
    bills: d.bills.map((b) => ({
      bill_id: b.billId || null,
      period_start: b.periodStart,
      period_end: b.periodEnd,
      billed_total: b.billedTotal,
      corrected_total: b.correctedTotal,
      claim_amount: b.claimAmount,
      corrected_on: b.correctedOn,
      usage_unit: b.usageUnit,
      billed_usage: b.billedUsage,
      metered_usage: b.meteredUsage,
      corrected_usage: b.correctedUsage,
      billed_demand_kw: b.billedDemandKw,
      metered_demand_kw: b.meteredDemandKw,
      corrected_demand_kw: b.correctedDemandKw,
      tariff: b.tariffId,
      tariff_versions: b.versions,
      lines: b.lines,
    })),
    notes: d.notes,
  }));
}
