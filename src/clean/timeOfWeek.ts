/**
 * Building blocks of the time-of-week-and-temperature regression (Mathieu, Price,
 * Kiliccote & Piette 2011, IEEE Trans. Smart Grid 2(3)): a local time-of-week index for
 * the indicator variables, and the piecewise-linear temperature components.
 */
import { DateTime } from "luxon";
import { CleanInputError } from "./errors.ts";

/** Knots of the piecewise-linear temperature term in the published form, °F. */
export const DEFAULT_TOWT_KNOTS_F: readonly number[] = [40, 50, 60, 70, 80];

/**
 * Split a temperature into piecewise-linear components at increasing knots B₁ < … < B_K:
 *   T₁ = min(T, B₁),  Tⱼ = min(max(T − Bⱼ₋₁, 0), Bⱼ − Bⱼ₋₁) for j = 2…K,  T_{K+1} = max(T − B_K, 0).
 * The components sum to T, so a regression on them fits a continuous piecewise-linear curve.
 * Knots and temperature must share a unit (the published knots are °F).
 * @throws CleanInputError on non-increasing knots or a non-finite temperature.
 * @example temperatureComponents(67) // [40, 10, 10, 7, 0, 0]
 */
export function temperatureComponents(temp: number, knots: readonly number[] = DEFAULT_TOWT_KNOTS_F): number[] {
  if (!Number.isFinite(temp)) throw new CleanInputError(`temperature must be finite, got ${temp}`);
  if (knots.length === 0) throw new CleanInputError("need at least one knot");
  for (let i = 1; i < knots.length; i++) {
    if (!(knots[i] > knots[i - 1])) throw new CleanInputError(`knots must increase strictly: ${knots.join(", ")}`);
  }
  const out = [Math.min(temp, knots[0])];
  for (let j = 1; j < knots.length; j++) out.push(Math.min(Math.max(temp - knots[j - 1], 0), knots[j] - knots[j - 1]));
  out.push(Math.max(temp - knots[knots.length - 1], 0));
  return out;
}

/**
 * Index of the interval of the local week containing a UTC instant: Monday 00:00 local
 * starts interval 0. With the default 60-minute interval the result is the hour of week
 * 0 … 167. Local time follows the IANA zone's rules, so on a spring-forward day the skipped
 * local hour never occurs and on a fall-back day one local hour occurs twice (both
 * instants get the same index).
 * @throws CleanInputError on an unknown zone, a non-finite instant, or an interval that does not divide a day.
 * @example hourOfWeek(Date.UTC(2024, 0, 1, 14), "America/New_York") // Monday 09:00 EST → 9
 */
export function intervalOfWeek(utcMs: number, zone: string, intervalMinutes = 60): number {
  if (!Number.isFinite(utcMs)) throw new CleanInputError(`instant must be a finite epoch time, got ${utcMs}`);
  if (!(Number.isInteger(intervalMinutes) && intervalMinutes > 0 && 1440 % intervalMinutes === 0)) {
    throw new CleanInputError(`interval must be a whole number of minutes dividing a day, got ${intervalMinutes}`);
  }
  const local = DateTime.fromMillis(utcMs, { zone });
  if (!local.isValid) throw new CleanInputError(`unknown time zone "${zone}" (${local.invalidExplanation ?? "invalid"}); use an IANA name like America/Chicago`);
  const minuteOfWeek = (local.weekday - 1) * 1440 + local.hour * 60 + local.minute;
  return Math.floor(minuteOfWeek / intervalMinutes);
}

/** Hour of the local week, 0 (Monday 00:00–00:59) … 167. See {@link intervalOfWeek}. */
export function hourOfWeek(utcMs: number, zone: string): number {
  return intervalOfWeek(utcMs, zone, 60);
}
