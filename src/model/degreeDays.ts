/**
 * Heating and cooling degree-days, any base, any temperature unit (base and temperatures
 * in the same unit; the result is in degree-days of that unit).
 *
 * Three methods, because published figures use different ones:
 * - integration of hourly temperatures: Σₕ max(0, Tb − Tₕ)/24 (the most faithful to the
 *   actual temperature path; runs a little higher than the daily-mean method);
 * - mean-temperature method (US National Weather Service): Tm = (Tmax + Tmin)/2,
 *   HDD = max(0, Tb − Tm), CDD = max(0, Tm − Tb);
 * - UK Met Office max/min method (CIBSE TM41), which credits part-day heating on days whose
 *   range straddles the base.
 */
import { ModelInputError } from "./errors.ts";
import { fToC } from "../core/units.ts";

/** Common bases: 65 °F (US, NOAA/NWS), the same in °C, 15.5 °C (UK), 18 °C (common in Europe). */
export const DEGREE_DAY_BASES = {
  us65F: 65,
  us65FInC: fToC(65),
  uk15_5C: 15.5,
  europe18C: 18,
} as const;


/** Convert degree-days (a temperature difference × days) from °C·day to °F·day: × 1.8. */
export function degreeDaysCToF(degreeDaysC: number): number {
  return degreeDaysC * 1.8;
}

/** Convert degree-days from °F·day to °C·day: ÷ 1.8. */
export function degreeDaysFToC(degreeDaysF: number): number {
  return degreeDaysF / 1.8;
}

export interface DegreeDays {
  heating: number;
  cooling: number;
}

function checkMaxMin(tMax: number, tMin: number, base: number): void {
  if (!Number.isFinite(tMax) || !Number.isFinite(tMin) || !Number.isFinite(base)) {
    throw new ModelInputError(`degree-days need finite temperatures (max ${tMax}, min ${tMin}, base ${base})`);
  }
  if (tMax < tMin) throw new ModelInputError(`daily maximum ${tMax} is below the minimum ${tMin}`);
}

/**
 * One day's degree-days by the mean-temperature method (US National Weather Service).
 * @example degreeDaysMeanMethod(75, 65, 65) // { heating: 0, cooling: 5 }
 * @example degreeDaysMeanMethod(50, 30, 65) // { heating: 25, cooling: 0 }
 */
export function degreeDaysMeanMethod(tMax: number, tMin: number, base: number): DegreeDays {
  checkMaxMin(tMax, tMin, base);
  const tMean = (tMax + tMin) / 2;
  return { heating: Math.max(0, base - tMean), cooling: Math.max(0, tMean - base) };
}

/**
 * One day's heating degree-days by the UK Met Office max/min method (CIBSE TM41):
 *   Tmax ≤ Tb:         Tb − Tm
 *   Tm ≤ Tb < Tmax:    0.5(Tb − Tmin) − 0.25(Tmax − Tb)
 *   Tmin < Tb < Tm:    0.25(Tb − Tmin)
 *   Tmin ≥ Tb:         0
 * @example heatingDegreeDaysUkMaxMin(18, 10, 15.5) // 2.125
 */
export function heatingDegreeDaysUkMaxMin(tMax: number, tMin: number, base: number): number {
  checkMaxMin(tMax, tMin, base);
  const tMean = (tMax + tMin) / 2;
  if (tMax <= base) return base - tMean;
  if (tMean <= base) return 0.5 * (base - tMin) - 0.25 * (tMax - base);
  if (tMin < base) return 0.25 * (base - tMin);
  return 0;
}

/**
 * One day's cooling degree-days by the UK max/min method: the heating formula mirrored
 * about the base (swap the roles of max and min), which gives
 *   Tmin ≥ Tb: Tm − Tb · Tm ≥ Tb > Tmin: 0.5(Tmax − Tb) − 0.25(Tb − Tmin) · Tmax > Tb > Tm: 0.25(Tmax − Tb) · else 0.
 * @example coolingDegreeDaysUkMaxMin(20, 10, 15.5) // 0.25·(20 − 15.5) = 1.125
 */
export function coolingDegreeDaysUkMaxMin(tMax: number, tMin: number, base: number): number {
  checkMaxMin(tMax, tMin, base);
  return heatingDegreeDaysUkMaxMin(-tMin, -tMax, -base);
}

/**
 * Degree-days by integrating hourly temperatures: Σ max(0, Tb − Tₕ)/24 (and the cooling
 * mirror). Each value stands for one hour.
 * @throws ModelInputError on a non-finite temperature (mask or fill gaps first).
 * @example degreeDaysFromHourly([...Array(12).fill(60), ...Array(12).fill(70)], 65) // { heating: 2.5, cooling: 2.5 }
 */
export function degreeDaysFromHourly(tempsHourly: ArrayLike<number>, base: number): DegreeDays {
  let heating = 0;
  let cooling = 0;
  for (let i = 0; i < tempsHourly.length; i++) {
    const t = tempsHourly[i];
    if (!Number.isFinite(t)) throw new ModelInputError(`hour ${i}: temperature is missing or not finite`);
    heating += Math.max(0, base - t);
    cooling += Math.max(0, t - base);
  }
  return { heating: heating / 24, cooling: cooling / 24 };
}

/** An hourly series on a regular UTC grid (the shape of the domain's WeatherSeries). */
export interface HourlyTemps {
  /** Start of the first hour, UTC epoch ms. */
  startMs: number;
  /** One temperature per hour; NaN = missing. */
  temps: ArrayLike<number>;
}

export interface PeriodDegreeDays extends DegreeDays {
  /** Hours of the period covered by a finite temperature (fractional at unaligned edges). */
  hoursCovered: number;
  /** Hours of the period with no temperature: NaN values or beyond the series. */
  hoursMissing: number;
  /**
   * Degree-days scaled up for the missing hours (heating · total/covered), for callers that
   * accept that estimate; NaN when nothing is covered. Report `hoursMissing` beside it.
   */
  heatingScaled: number;
  coolingScaled: number;
}

const HOUR_MS = 3_600_000;

/**
 * Degree-days over an arbitrary period [startMs, endMs) from an hourly series by
 * integration. Hours that straddle a period edge count by their overlap fraction. Missing
 * hours are not filled: they are counted in `hoursMissing`, never silently dropped.
 * @throws ModelInputError when endMs ≤ startMs.
 * @example degreeDaysForPeriod({ startMs: 0, temps: hourly }, 0, 86_400_000, 65).heating
 */
export function degreeDaysForPeriod(series: HourlyTemps, startMs: number, endMs: number, base: number): PeriodDegreeDays {
  if (!(endMs > startMs)) throw new ModelInputError(`period end must be after its start (${startMs} … ${endMs})`);
  const totalHours = (endMs - startMs) / HOUR_MS;
  const first = Math.max(0, Math.floor((startMs - series.startMs) / HOUR_MS));
  const last = Math.min(series.temps.length - 1, Math.ceil((endMs - series.startMs) / HOUR_MS) - 1);
  let heating = 0;
  let cooling = 0;
  let covered = 0;
  for (let i = first; i <= last; i++) {
    const h0 = series.startMs + i * HOUR_MS;
    const overlap = (Math.min(h0 + HOUR_MS, endMs) - Math.max(h0, startMs)) / HOUR_MS;
    if (overlap <= 0) continue;
    const t = series.temps[i];
    if (!Number.isFinite(t)) continue;
    covered += overlap;
    heating += overlap * Math.max(0, base - t);
    cooling += overlap * Math.max(0, t - base);
  }
  heating /= 24;
  cooling /= 24;
  const scale = covered > 0 ? totalHours / covered : Number.NaN;
  return {
    heating,
    cooling,
    hoursCovered: covered,
    hoursMissing: totalHours - covered,
    heatingScaled: heating * scale,
    coolingScaled: cooling * scale,
  };
}
