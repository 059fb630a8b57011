/**
 * Lookups every check shares, built once per audit run from the AuditInput.
 */
import type { Bill, BillLine, Building, Meter } from "../domain/types.ts";
import { findDuplicates, type DuplicatePair } from "./checks/duplicate-bill.ts";
import { resolveTolerances } from "./tolerances.ts";
import type { AuditInput, AuditTolerances, Finding } from "./types.ts";

export interface AuditContext {
  input: AuditInput;
  tol: AuditTolerances;
  currency: string;
  meters: Map<string, Meter>;
  buildings: Map<string, Building>;
  /** Bills per meter, by period start, then period end, then input line. */
  billsByMeter: Map<string, Bill[]>;
  linesByBill: Map<string, BillLine[]>;
  /** Duplicate pairs per the duplicate-bill rule; the `duplicate` side is left out of sequence checks. */
  duplicates: DuplicatePair[];
  duplicateIds: Set<string>;
}

/** Bills of one meter in service order. */
export function sortBills(bills: Bill[]): Bill[] {
  return [...bills].sort(
    (a, b) =>
      a.periodStart.localeCompare(b.periodStart) ||
      a.periodEnd.localeCompare(b.periodEnd) ||
      a.source.line - b.source.line ||
      a.billId.localeCompare(b.billId),
  );
}

/** Builds the shared lookups (pure; the input is not mutated). */
export function buildContext(input: AuditInput): AuditContext {
  const p = input.portfolio;
  const billsByMeter = new Map<string, Bill[]>();
  for (const bill of p.bills) {
    const list = billsByMeter.get(bill.meterId) ?? [];
    list.push(bill);
    billsByMeter.set(bill.meterId, list);
  }
  for (const [id, list] of billsByMeter) billsByMeter.set(id, sortBills(list));
  const linesByBill = new Map<string, BillLine[]>();
  for (const line of p.billLines) {
    const list = linesByBill.get(line.billId) ?? [];
    list.push(line);
    linesByBill.set(line.billId, list);
  }
  const duplicates = [...billsByMeter.values()].flatMap((bills) => findDuplicates(bills));
  return {
    input,
    tol: resolveTolerances(p.settings.tolerances, input.tolerances),
    currency: p.settings.currency,
    meters: new Map(p.meters.map((m) => [m.meterId, m])),
    buildings: new Map(p.buildings.map((b) => [b.buildingId, b])),
    billsByMeter,
    linesByBill,
    duplicates,
    duplicateIds: new Set(duplicates.map((d) => d.duplicate.billId)),
  };
}

/** Bills of a meter in service order with duplicates left out. */
export function billsInSequence(ctx: AuditContext, meterId: string): Bill[] {
  return (ctx.billsByMeter.get(meterId) ?? []).filter((b) => !ctx.duplicateIds.has(b.billId));
}

/** Building id of a meter ("" when the meter is unknown, which ingest prevents). */
export function buildingOf(ctx: AuditContext, meterId: string): string {
  return ctx.meters.get(meterId)?.buildingId ?? "";
}

type FindingBody = Omit<Finding, "buildingId" | "meterId" | "billId" | "periodStart" | "periodEnd">;

/** A finding about one bill: identity fields taken from the bill. */
export function billFinding(ctx: AuditContext, bill: Bill, body: FindingBody): Finding {
  return {
    buildingId: buildingOf(ctx, bill.meterId),
    meterId: bill.meterId,
    billId: bill.billId,
    periodStart: bill.periodStart,
    periodEnd: bill.periodEnd,
    ...body,
  };
}
