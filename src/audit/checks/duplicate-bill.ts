/**
 * duplicate-bill — the same service period billed twice on one meter.
 *
 * Rule: two bills of a meter are duplicates when they have the same period, or when they have
 * the same usage and total and overlap by at least half of the shorter period (a re-sent bill
 * with shifted dates). The later one (by statement date, then input line) is the duplicate.
 * Severity error (money plainly at risk); amount at stake = the duplicate's total.
 */
import { voidCorrection } from "../corrections.ts";
import type { Bill } from "../../domain/types.ts";
import type { AuditContext } from "../context.ts";
import { billFinding } from "../context.ts";
import { maxDate, minDate } from "../dates.ts";
import { formatQty } from "../format.ts";
import type { Finding } from "../types.ts";
import { daysBetween } from "../../core/time/index.ts";
import { moneyText, roundCents, toCents } from "../../core/money.ts";

export interface DuplicatePair {
  original: Bill;
  duplicate: Bill;
}

function isLater(a: Bill, b: Bill): boolean {
  const sa = a.statementDate ?? "";
  const sb = b.statementDate ?? "";
  if (sa !== sb && sa !== "" && sb !== "") return sa > sb;
  return a.source.line > b.source.line || (a.source.line === b.source.line && a.billId > b.billId);
}

function looksDuplicated(a: Bill, b: Bill): boolean {
  if (a.periodStart === b.periodStart && a.periodEnd === b.periodEnd) return true;
  if (a.usage !== b.usage || toCents(a.total) !== toCents(b.total)) return false;
  const overlap = daysBetween(maxDate(a.periodStart, b.periodStart), minDate(a.periodEnd, b.periodEnd));
  const shorter = Math.min(daysBetween(a.periodStart, a.periodEnd), daysBetween(b.periodStart, b.periodEnd));
  return overlap > 0 && overlap * 2 >= shorter;
}

/**
 * Duplicate pairs among one meter's bills. Each duplicate is paired with the earliest bill it
 * repeats; a bill already found to be a duplicate is never an original.
 * @example findDuplicates([a, aAgain]) // [{ original: a, duplicate: aAgain }]
 */
export function findDuplicates(bills: Bill[]): DuplicatePair[] {
  const pairs: DuplicatePair[] = [];
  const taken = new Set<string>();
  for (let i = 0; i < bills.length; i++) {
    if (taken.has(bills[i].billId)) continue;
    for (let j = i + 1; j < bills.length; j++) {
      if (taken.has(bills[j].billId)) continue;
      if (bills[j].periodStart >= bills[i].periodEnd) break; // sorted by start: no later overlap
      if (!looksDuplicated(bills[i], bills[j])) continue;
      const [original, duplicate] = isLater(bills[j], bills[i]) ? [bills[i], bills[j]] : [bills[j], bills[i]];
      pairs.push({ original, duplicate });
      taken.add(duplicate.billId);
      if (duplicate === bills[i]) break;
    }
  }
  return pairs;
}

/** Findings for every duplicate pair found when the context was built. */
export function checkDuplicateBill(ctx: AuditContext): Finding[] {
  return ctx.duplicates.map(({ original, duplicate }) => {
    const same = original.periodStart === duplicate.periodStart && original.periodEnd === duplicate.periodEnd;
    return billFinding(ctx, duplicate, {
      check: "duplicate-bill",
      severity: "error",
      amountAtStake: roundCents(duplicate.total),
      title: "Bill charged twice",
      message:
        `Bill ${duplicate.billId} repeats bill ${original.billId} ` +
        (same ? `for the same service period ${duplicate.periodStart} to ${duplicate.periodEnd}` :
          `with the same usage and total over an overlapping period`) +
        `, so paying both pays ${moneyText(duplicate.total, ctx.currency)} twice.`,
      evidence: {
        rows: [
          { label: "Period", billed: `${duplicate.periodStart} to ${duplicate.periodEnd}`, expected: `${original.periodStart} to ${original.periodEnd}` },
          { label: "Usage", billed: duplicate.usage, expected: original.usage, difference: formatQty(duplicate.usage - original.usage) },
          { label: "Total", billed: roundCents(duplicate.total), expected: roundCents(original.total), difference: roundCents(duplicate.total - original.total) },
        ],
        notes: [`"Billed" is the duplicate ${duplicate.billId}; "expected" is the first bill ${original.billId}.`],
      },
      relatedBillIds: [original.billId],
      corrections: [voidCorrection(duplicate, `nothing: the service period was already billed on ${original.billId}`)],
    });
  });
}
