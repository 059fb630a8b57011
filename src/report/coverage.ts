/** Which edge months of a chart are only partly covered by billing periods. */
import { formatMonth } from "./format.ts";

/**
 * A sentence naming the first and/or last calendar month that bills cover only in part (their
 * bars look low for that reason alone), or "" when both edges are whole months.
 * @example partialMonthsNote([{ periodStart: "2024-01-05", periodEnd: "2025-03-05" }]) // "Jan 2024 and Mar 2025 are only partly covered by bills."
 */
export function partialMonthsNote(periods: readonly { periodStart: string; periodEnd: string }[]): string {
  if (periods.length === 0) return "";
  let first = periods[0].periodStart;
  let last = periods[0].periodEnd;
  for (const p of periods) {
    if (p.periodStart < first) first = p.periodStart;
    if (p.periodEnd > last) last = p.periodEnd;
  }
  const partial: string[] = [];
  if (!first.endsWith("-01")) partial.push(formatMonth(first.slice(0, 7)));
  // `last` is exclusive: a period ending on the 1st covers its previous month whole.
  if (!last.endsWith("-01")) partial.push(formatMonth(last.slice(0, 7)));
  if (partial.length === 0) return "";
  return `${partial.join(" and ")} ${partial.length === 1 ? "is" : "are"} only partly covered by bills.`;
}
