/**
 * Building the corrected bills that money findings rest on (see CorrectedBill in types.ts).
 * One helper per way a bill is corrected, so every check words and rounds them the same way.
 */
import type { Bill } from "../domain/types.ts";
import type { ComputedBill } from "../tariff/index.ts";
import type { CorrectedBill } from "./types.ts";
import { roundCents } from "../core/money.ts";

/** The bill re-priced through a tariff (on the quantities named in `correctedOn`). */
export function repricedCorrection(bill: Bill, corrected: ComputedBill, usage: number, demandKw: number | null, correctedOn: string): CorrectedBill {
  return {
    billId: bill.billId,
    periodStart: bill.periodStart,
    periodEnd: bill.periodEnd,
    billedTotal: roundCents(bill.total),
    correctedTotal: roundCents(corrected.total),
    corrected,
    usage,
    demandKw: demandKw ?? corrected.billingDemandKw,
    correctedOn,
  };
}

/**
 * The printed bill with some amount taken off (a printed line corrected to the tariff's amount,
 * or removed): corrected total = billed − `overcharge`. `reference` is the bill re-priced on its
 * billed quantities, shown beside the printed lines.
 */
export function adjustedCorrection(bill: Bill, overcharge: number, reference: ComputedBill | null, correctedOn: string): CorrectedBill {
  return {
    billId: bill.billId,
    periodStart: bill.periodStart,
    periodEnd: bill.periodEnd,
    billedTotal: roundCents(bill.total),
    correctedTotal: roundCents(bill.total - overcharge),
    corrected: reference,
    usage: bill.usage,
    demandKw: bill.demandKw,
    correctedOn,
  };
}

/** A bill that should not have been issued at all (a duplicate): corrected total 0. */
export function voidCorrection(bill: Bill, correctedOn: string): CorrectedBill {
  return {
    billId: bill.billId,
    periodStart: bill.periodStart,
    periodEnd: bill.periodEnd,
    billedTotal: roundCents(bill.total),
    correctedTotal: 0,
    corrected: null,
    usage: null,
    demandKw: null,
    correctedOn,
  };
}

/** billed − corrected summed over the corrected bills, to the cent. */
export function claimOf(corrections: readonly CorrectedBill[]): number {
  return roundCents(corrections.reduce((s, c) => s + roundCents(c.billedTotal - c.correctedTotal), 0));
}
