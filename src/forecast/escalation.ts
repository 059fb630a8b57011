/**
 * Price drift after the last tariff version: the file knows no rates beyond it, so the
 * forecast assumes the commodity's yearly `escalation` (portfolio.yaml) compounds from the day
 * the last version took effect.
 *
 *   factor = (1 + e) ^ (years),  years = max(0, days from the last version's `from` to the
 *            middle of the forecast month) / 365.25
 *
 * and the factor multiplies the month's priced total (every line, taxes included). The middle
 * of the month stands for the month because drift is assumed continuous.
 */
import { daysBetween } from "../core/time.ts";
import type { CalendarMonth } from "./months.ts";

/**
 * (1 + rate)^(days/365.25), 1 when `days` ≤ 0.
 * @example escalationFactorForDays(0.03, 547.875) // 1.03^1.5 = 1.045336…
 */
export function escalationFactorForDays(rate: number, days: number): number {
  if (!(days > 0) || rate === 0) return 1;
  return Math.pow(1 + rate, days / 365.25);
}

/**
 * Escalation factor for one forecast month, given the first day of the tariff's last version.
 * Days are counted to the month's midpoint (start + days/2, which may be a half day).
 * @example escalationFactorForMonth(0.03, "2025-07-01", calendarMonth("2026-01")) // (1.03)^((184+15.5)/365.25)
 */
export function escalationFactorForMonth(rate: number, lastVersionFrom: string, month: CalendarMonth): number {
  const days = daysBetween(lastVersionFrom, month.start) + month.days / 2;
  return escalationFactorForDays(rate, days);
}
