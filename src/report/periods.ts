/**
 * The report's "last 12 months" in words. The window and its proration live in
 * src/report/usageSummary.ts, shared with portfolio.json; re-exported here.
 */
import { formatDate } from "./format.ts";

export { overlapDays, prorateToWindow, type DayWindow } from "./usageSummary.ts";

/**
 * Words for the "last 12 months" every page uses (one rule, src/report/usageSummary.ts):
 * per meter, the 365 days up to its last read, ending no later than the as-of date.
 * @example last12MonthsText("2025-12-31") // "the 12 months up to each meter's last read, ending no later than Dec 31, 2025"
 */
export function last12MonthsText(asOf: string | null): string {
  if (asOf === null) return "no bills";
  return `the 12 months up to each meter's last read, ending no later than ${formatDate(asOf)}`;
}
