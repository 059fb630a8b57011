/**
 * Building block of the time-of-week-and-temperature regression (Mathieu, Price,
 * Kiliccote & Piette 2011, IEEE Trans. Smart Grid 2(3)): the piecewise-linear temperature
 * components. The time-of-week index is src/core/time's `intervalOfWeek`.
 */
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
