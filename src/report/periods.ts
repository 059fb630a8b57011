/**
 * Calendar arithmetic for the report: spreading a billing period over calendar months by days
 * (the same day-proration rule the tariff engine uses). The last-12-months window and its
 * proration live in src/pipeline/usageSummary.ts, shared with portfolio.json; re-exported here.
 */
import { formatDate, isoDateToDayNumber } from "./format.ts";
import { overlapDays } from "../pipeline/usageSummary.ts";

export { overlapDays, prorateToWindow, type DayWindow } from "../pipeline/usageSummary.ts";

/** Adds whole calendar months to an ISO date (day of month kept; used on 1st-of-month or read dates). */
export function addMonthsIso(isoDate: string, months: number): string {
  const [y, m, d] = isoDate.split("-").map(Number);
  const total = y * 12 + (m - 1) + months;
  const ny = Math.floor(total / 12);
  const nm = total - ny * 12;
  const lastDay = new Date(Date.UTC(ny, nm + 1, 0)).getUTCDate();
  return `${String(ny).padStart(4, "0")}-${String(nm + 1).padStart(2, "0")}-${String(Math.min(d, lastDay)).padStart(2, "0")}`;
}

/**
 * Words for the "last 12 months" every page uses (one rule, src/pipeline/usageSummary.ts):
 * per meter, the 365 days up to its last read, ending no later than the as-of date.
 * @example last12MonthsText("2025-12-31") // "the 12 months up to each meter's last read, ending no later than Dec 31, 2025"
 */
export function last12MonthsText(asOf: string | null): string {
  if (asOf === null) return "no bills";
  return `the 12 months up to each meter's last read, ending no later than ${formatDate(asOf)}`;
}

/** Billing days of a half-open period. */
export function periodDays(start: string, end: string): number {
  return isoDateToDayNumber(end) - isoDateToDayNumber(start);
}

/**
 * Spreads a period amount over the calendar months it touches, by days.
 * @example spreadOverMonths(62, "2025-01-16", "2025-02-17") // [{month:"2025-01", amount:30.06…}, {month:"2025-02", amount:31.93…}]
 */
export function spreadOverMonths(amount: number, start: string, end: string): { month: string; amount: number }[] {
  const days = periodDays(start, end);
  if (days <= 0) return [];
  const out: { month: string; amount: number }[] = [];
  let monthStart = `${start.slice(0, 7)}-01`;
  while (monthStart < end) {
    const next = addMonthsIso(monthStart, 1);
    const d = overlapDays(start, end, { start: monthStart, end: next });
    if (d > 0) out.push({ month: monthStart.slice(0, 7), amount: (amount * d) / days });
    monthStart = next;
  }
  return out;
}
