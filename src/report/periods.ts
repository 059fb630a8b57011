/**
 * Calendar arithmetic for the report: the trailing 12-month window and spreading a billing
 * period over calendar months by days (the same day-proration rule the tariff engine uses).
 */
import type { Bill, PortfolioSettings } from "../domain/types.ts";
import { dayNumberToIsoDate, isoDateToDayNumber } from "./format.ts";

/** Half-open window of calendar days `[start, end)`, ISO dates. */
export interface DayWindow {
  start: string;
  end: string;
}

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
 * The trailing 12 months the index reports on: ends the day after `as_of` when set, else at
 * the latest bill end; starts 12 calendar months earlier. Null when there are no bills.
 * @example trailingYear({asOf: "2025-12-31"}, bills) // { start: "2025-01-01", end: "2026-01-01" }
 */
export function trailingYear(settings: Pick<PortfolioSettings, "asOf">, bills: readonly Bill[]): DayWindow | null {
  let end: string | null = null;
  if (settings.asOf) {
    end = dayNumberToIsoDate(isoDateToDayNumber(settings.asOf) + 1);
  } else {
    for (const b of bills) if (end === null || b.periodEnd > end) end = b.periodEnd;
  }
  if (end === null) return null;
  return { start: addMonthsIso(end, -12), end };
}

/** Days of `[start, end)` inside `window` (0 when disjoint). */
export function overlapDays(start: string, end: string, window: DayWindow): number {
  const s = Math.max(isoDateToDayNumber(start), isoDateToDayNumber(window.start));
  const e = Math.min(isoDateToDayNumber(end), isoDateToDayNumber(window.end));
  return Math.max(0, e - s);
}

/** Billing days of a half-open period. */
export function periodDays(start: string, end: string): number {
  return isoDateToDayNumber(end) - isoDateToDayNumber(start);
}

/**
 * Share of a billing-period amount that falls in `window`, prorated by days.
 * @example prorateToWindow(310, "2025-12-15", "2026-01-15", {start:"2025-01-01", end:"2026-01-01"}) // 170
 */
export function prorateToWindow(amount: number, start: string, end: string, window: DayWindow): number {
  const days = periodDays(start, end);
  if (days <= 0) return 0;
  return (amount * overlapDays(start, end, window)) / days;
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
