import { addDays, daysBetween, type CalendarMonth } from "../core/time/index.ts";
/**
 * Price drift after the last tariff version: the file knows no rates beyond it, so the
 * forecast assumes the commodity's yearly `escalation` (portfolio.yaml) compounds:
 *
 *   base   = the later of (the last version's `from`) and (the day after as-of)
 *   years  = max(0, days from base to the middle of the forecast month) / 365.25
 *   factor = (1 + e) ^ years, multiplying the month's priced total (every line, taxes included)
 *
 * Why the day after as-of and not always the last version's start: bills up to as-of were
 * priced at the file's rates, so those rates are known to hold until then — a 2022 version
 * still in force at the end of 2025 must not be inflated by four years of drift in 2026.
 * A future-dated last version moves the base to its own start. The middle of the month stands
 * for the month because drift is assumed continuous.
 */

/**
 * (1 + rate)^(days/365.25), 1 when `days` ≤ 0.
 * @example escalationFactorForDays(0.03, 547.875) // 1.03^1.5 = 1.045336…
 */
export function escalationFactorForDays(rate: number, days: number): number {
  if (!(days > 0) || rate === 0) return 1;
  return Math.pow(1 + rate, days / 365.25);
}

/**
 * The date escalation compounds from (see the module comment).
 * @example escalationBase("2022-01-01", "2025-12-31") // "2026-01-01"; escalationBase("2026-07-01", "2025-12-31") // "2026-07-01"
 */
export function escalationBase(lastVersionFrom: string, asOf: string): string {
  const next = addDays(asOf, 1);
  return lastVersionFrom > next ? lastVersionFrom : next;
}

/**
 * Escalation factor for one forecast month. Days are counted from `base` to the month's
 * midpoint (start + days/2, which may be a half day).
 * @example escalationFactorForMonth(0.03, "2026-01-01", calendarMonth("2026-07")) // 1.03^((181 + 15.5)/365.25)
 */
export function escalationFactorForMonth(rate: number, base: string, month: CalendarMonth): number {
  const days = daysBetween(base, month.start) + month.days / 2;
  return escalationFactorForDays(rate, days);
}
