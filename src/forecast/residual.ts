/**
 * Calendar-month adjustment of a change-point forecast: what the weather model leaves out
 * month by month (school terms, holidays, seasonal operation, a recent change in use).
 *
 * For every calendar month the bills cover completely (bills spread over months by days) and
 * the station has that month's mean temperature T:
 *
 *   residual = billed use per day − ŷ(T)        (ŷ = the meter's change-point model)
 *
 * and the adjustment of calendar month m is the mean residual of month m over
 *   - `all-years`: every such month known at the as-of date, or
 *   - `last-year`: only the 12 months up to the as-of date.
 * A month with no residual gets 0. With `last-year` the forecast is "same month last year,
 * weather-normalized by the model": ŷ(T_typical) + use_last − ŷ(T_last). Which of none /
 * all-years / last-year is used is chosen by the rolling-origin backtests (backtest.ts).
 */
import type { Bill } from "../domain/types.ts";
import type { ChangePointFit } from "../model/index.ts";
import { billsKnownAt } from "./portfolioInputs.ts";
import { spreadBillsByMonth } from "./months.ts";
import type { WeatherYear } from "./weatherYears.ts";
import { addMonthsIso } from "../core/time/index.ts";

export type MonthAdjustment = "none" | "all-years" | "last-year";
export const MONTH_ADJUSTMENTS: readonly MonthAdjustment[] = ["none", "all-years", "last-year"];

export const MONTH_ADJUSTMENT_LABEL: Record<MonthAdjustment, string> = {
  none: "none (the weather model alone)",
  "all-years": "each calendar month's average departure from the weather model over the history",
  "last-year": "each calendar month's departure from the weather model last year (same month last year, weather-normalized)",
};

/**
 * Adjustment per calendar month (index 0 = January), use per day in the meter's unit; null for
 * `none` (see the module comment). Estimated reads are left out.
 * @example residualByCalendarMonth(fit, bills, years, "2024-12-31", "last-year")[0] // January 2024's use/day − ŷ(January 2024's mean temperature)
 */
export function residualByCalendarMonth(
  fit: ChangePointFit, bills: readonly Bill[], years: readonly WeatherYear[], asOf: string, mode: MonthAdjustment,
): number[] | null {
  if (mode === "none") return null;
  // The backtests ask again for the same meter and origin (each adjustment scored, then the
  // bands of the chosen one): kept per fit, bills, weather years, as-of date and mode.
  let byFit = residualsByFit.get(fit);
  if (byFit === undefined) residualsByFit.set(fit, (byFit = []));
  for (const r of byFit) if (r.bills === bills && r.years === years && r.asOf === asOf && r.mode === mode) return r.residual;
  const residual = computeResidual(fit, bills, years, asOf, mode);
  byFit.push({ bills, years, asOf, mode, residual });
  return residual;
}

const residualsByFit = new WeakMap<ChangePointFit, { bills: readonly Bill[]; years: readonly WeatherYear[]; asOf: string; mode: MonthAdjustment; residual: number[] }[]>();

function computeResidual(
  fit: ChangePointFit, bills: readonly Bill[], years: readonly WeatherYear[], asOf: string, mode: Exclude<MonthAdjustment, "none">,
): number[] {
  const from = mode === "last-year" ? addMonthsIso(asOf, -12).slice(0, 7) : "";
  const known = billsKnownAt(bills, asOf).filter((b) => b.readType !== "estimated");
  const sums = new Array<number>(12).fill(0);
  const counts = new Array<number>(12).fill(0);
  for (const [month, s] of spreadBillsByMonth(known, (b) => b.usage)) {
    if (s.coveredDays < s.days || month <= from) continue;
    const year = Number(month.slice(0, 4));
    const m = Number(month.slice(5, 7)) - 1;
    const t = years.find((y) => y.year === year)?.monthlyTemp[m];
    if (t === undefined || !Number.isFinite(t)) continue;
    sums[m]! += s.amount / s.days - fit.predict(t);
    counts[m]!++;
  }
  return sums.map((x, m) => (counts[m]! > 0 ? x / counts[m]! : 0));
}
