/**
 * Calendar months: month arithmetic on ISO dates and `YYYY-MM` strings, a zone's local months
 * as UTC instant ranges, and spreading a period's amount over the months it touches by days
 * (a bill of 31 days with 10 of them in March puts 10/31 of its amount in March — the same
 * day-proration rule the tariff engine uses).
 */
import { TimeInputError } from "../errors.ts";
import { daysBetween, isIsoDate, pad2 } from "./dates.ts";
import { localPartsOf } from "./local.ts";
import { localMidnightMs } from "./toUtc.ts";

/** Days in month `month` (1–12) of `year`. */
export function daysInMonth(year: number, month: number): number {
  return new Date(Date.UTC(year, month, 0)).getUTCDate();
}

/**
 * Adds whole calendar months to an ISO date; the day of month is kept, or clamped to the
 * month's last day (2025-03-31 − 1 month → 2025-02-28).
 * @example addMonthsIso("2025-12-31", -12) // "2024-12-31"
 */
export function addMonthsIso(isoDate: string, months: number): string {
  const y = Number(isoDate.slice(0, 4));
  const m = Number(isoDate.slice(5, 7));
  const d = Number(isoDate.slice(8, 10));
  const total = y * 12 + (m - 1) + months;
  const ny = Math.floor(total / 12);
  const nm = total - ny * 12 + 1;
  return `${String(ny).padStart(4, "0")}-${pad2(nm)}-${pad2(Math.min(d, daysInMonth(ny, nm)))}`;
}

/** The month `k` months after (k < 0: before) `month`. @example shiftMonth("2025-01", -12) // "2024-01" */
export function shiftMonth(month: string, k: number): string {
  return addMonthsIso(`${month}-01`, k).slice(0, 7);
}

export interface CalendarMonth {
  /** `YYYY-MM`. */
  month: string;
  /** First day, `YYYY-MM-DD`. */
  start: string;
  /** First day of the next month, `YYYY-MM-DD` (the half-open end, as bills have it). */
  end: string;
  days: number;
  /** 1 = January. */
  calendarMonth: number;
}

/** The calendar month `YYYY-MM`. @throws TimeInputError on a malformed month. */
export function calendarMonth(month: string): CalendarMonth {
  if (!/^\d{4}-\d{2}$/.test(month) || !isIsoDate(`${month}-01`)) throw new TimeInputError(`month must be YYYY-MM, got '${month}'`);
  const year = Number(month.slice(0, 4));
  const m = Number(month.slice(5, 7));
  const start = `${month}-01`;
  return { month, start, end: addMonthsIso(start, 1), days: daysInMonth(year, m), calendarMonth: m };
}

/**
 * The `count` calendar months after the month of `asOf`.
 * @throws TimeInputError when `asOf` is not a YYYY-MM-DD date.
 * @example monthsAfter("2025-12-31", 2).map(m => m.month) // ["2026-01", "2026-02"]
 */
export function monthsAfter(asOf: string, count: number): CalendarMonth[] {
  if (!isIsoDate(asOf)) throw new TimeInputError(`as_of must be YYYY-MM-DD, got '${asOf}'`);
  const out: CalendarMonth[] = [];
  for (let i = 1; i <= count; i++) out.push(calendarMonth(shiftMonth(asOf.slice(0, 7), i)));
  return out;
}

/** One month's part of a spread period. */
export interface MonthPart {
  month: string;
  amount: number;
  /** Days of the period in this month. */
  days: number;
}

/**
 * Spreads a half-open period's amount over the calendar months it touches, by days.
 * @example spreadOverMonths(62, "2025-01-16", "2025-02-17") // Jan 16 days → 31, Feb 16 days → 31
 */
export function spreadOverMonths(amount: number, start: string, end: string): MonthPart[] {
  const days = daysBetween(start, end);
  if (!(days > 0)) return [];
  const out: MonthPart[] = [];
  let monthStart = `${start.slice(0, 7)}-01`;
  while (monthStart < end) {
    const next = addMonthsIso(monthStart, 1);
    const from = start > monthStart ? start : monthStart;
    const to = end < next ? end : next;
    const d = daysBetween(from, to);
    if (d > 0) out.push({ month: monthStart.slice(0, 7), amount: (amount * d) / days, days: d });
    monthStart = next;
  }
  return out;
}

/** A local calendar month of one zone as a UTC instant range. */
export interface LocalMonth {
  /** `YYYY-MM` in the zone. */
  month: string;
  /** First instant of the month (local midnight on the 1st), UTC epoch ms. */
  startMs: number;
  /** First instant of the next month, UTC epoch ms. */
  endMs: number;
}

/** Local months of one zone, computed once per month and cached, so per-instant lookups are two comparisons. */
export class LocalMonthCalendar {
  private readonly cache = new Map<string, LocalMonth>();
  constructor(readonly timezone: string) {}

  /** The local month containing `instantMs`. Example: 2024-03-01T04:59Z in New York → "2024-02". */
  monthOf(instantMs: number): LocalMonth {
    const p = localPartsOf(instantMs, this.timezone);
    return this.month(p.year, p.month);
  }

  /** The month `year`-`month` (1–12). */
  month(year: number, month: number): LocalMonth {
    const key = `${String(year).padStart(4, "0")}-${pad2(month)}`;
    let m = this.cache.get(key);
    if (m === undefined) {
      const start = `${key}-01`;
      m = { month: key, startMs: localMidnightMs(start, this.timezone), endMs: localMidnightMs(addMonthsIso(start, 1), this.timezone) };
      this.cache.set(key, m);
    }
    return m;
  }

  /** The month after `m`. */
  next(m: LocalMonth): LocalMonth {
    const y = Number(m.month.slice(0, 4));
    const mo = Number(m.month.slice(5, 7));
    return mo === 12 ? this.month(y + 1, 1) : this.month(y, mo + 1);
  }

  /** The local months overlapping [fromMs, toMs), in order. */
  *between(fromMs: number, toMs: number): Generator<LocalMonth> {
    for (let m = this.monthOf(fromMs); m.startMs < toMs; m = this.next(m)) yield m;
  }
}
