/**
 * Findings as the rows of OUT/data/findings.csv / findings.json, and bills as the rows of
 * bills-recomputed.csv (column names per the outputs contract).
 */
import type { Bill } from "../domain/types.ts";
import type { ComputedBill } from "../tariff/index.ts";
import type { Evidence, Finding } from "./types.ts";
import { csvField } from "../core/csv.ts";
import { roundCents } from "../core/money.ts";

export const FINDINGS_CSV_COLUMNS = [
  "building_id", "meter_id", "bill_id", "period_start", "period_end", "check", "severity", "amount_at_stake", "message",
] as const;

export type FindingCsvRow = Record<(typeof FINDINGS_CSV_COLUMNS)[number], string>;

/**
 * One string-valued row per finding with exactly the findings.csv columns; `amount_at_stake`
 * has two decimals and is empty when not money, missing ids/dates are empty.
 */
export function findingsToCsvRows(findings: Finding[]): FindingCsvRow[] {
  return findings.map((f) => ({
    building_id: f.buildingId,
    meter_id: f.meterId,
    bill_id: f.billId ?? "",
    period_start: f.periodStart ?? "",
    period_end: f.periodEnd ?? "",
    check: f.check,
    severity: f.severity,
    amount_at_stake: f.amountAtStake === null ? "" : roundCents(f.amountAtStake).toFixed(2),
    message: f.message,
  }));
}

/** findings.csv text: header, then one CRLF-terminated line per finding. */
export function findingsToCsvText(findings: Finding[]): string {
  const lines = [FINDINGS_CSV_COLUMNS.join(",")];
  for (const row of findingsToCsvRows(findings)) lines.push(FINDINGS_CSV_COLUMNS.map((c) => csvField(row[c])).join(","));
  return lines.join("\r\n") + "\r\n";
}

export interface FindingJson {
  building_id: string;
  meter_id: string;
  bill_id: string | null;
  period_start: string | null;
  period_end: string | null;
  check: string;
  severity: string;
  amount_at_stake: number | null;
  message: string;
  title: string;
  evidence: Evidence;
  related_bill_ids: string[];
}

/** findings.json objects: the CSV keys (amount a number or null) plus title and evidence. */
export function toFindingsJson(findings: Finding[]): FindingJson[] {
  return findings.map((f) => ({
    building_id: f.buildingId,
    meter_id: f.meterId,
    bill_id: f.billId,
    period_start: f.periodStart,
    period_end: f.periodEnd,
    check: f.check,
    severity: f.severity,
    amount_at_stake: f.amountAtStake === null ? null : roundCents(f.amountAtStake),
    message: f.message,
    title: f.title,
    evidence: f.evidence,
    related_bill_ids: f.relatedBillIds ?? [],
  }));
}

export interface BillRecomputedRow {
  building_id: string;
  meter_id: string;
  bill_id: string;
  period_start: string;
  period_end: string;
  billed_total: string;
  computed_total: string;
  difference: string;
  exact: string;
}

/**
 * bills-recomputed.csv rows: every bill, computed total and difference (billed − computed) with
 * two decimals; empty when the bill could not be priced. `exact` says whether every line was exact.
 */
export function billsRecomputedRows(bills: Bill[], buildingOfMeter: (meterId: string) => string, priced: { get(billId: string): Pick<ComputedBill, "total" | "exact"> | null | undefined }): BillRecomputedRow[] {
  return bills.map((b) => {
    const c = priced.get(b.billId) ?? null;
    return {
      building_id: buildingOfMeter(b.meterId),
      meter_id: b.meterId,
      bill_id: b.billId,
      period_start: b.periodStart,
      period_end: b.periodEnd,
      billed_total: roundCents(b.total).toFixed(2),
      computed_total: c === null ? "" : roundCents(c.total).toFixed(2),
      difference: c === null ? "" : roundCents(b.total - c.total).toFixed(2),
      exact: c === null ? "" : c.exact ? "yes" : "no",
    };
  });
}
