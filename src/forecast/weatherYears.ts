/**
 * Historical weather years of a station as monthly mean temperatures, and the scenario
 * temperatures built from them.
 *
 * A weather year is a calendar year of the station's history with at least 20 days of hourly
 * data in each of its 12 months (when no year is complete, every year with any usable month is
 * used and its missing months take the typical temperature). Scenario temperature for a month:
 *
 *   T = typical_m + (T_{year,m} − mean over weather years of T_{·,m})
 *
 * i.e. each year's anomaly added to the typical month, so the scenarios centre on the typical
 * year (normals when given) while carrying the year-to-year spread of the history.
 */
import { LocalMonthCalendar } from "../core/time/index.ts";
import type { WeatherSeries } from "../domain/types.ts";
import { cToF } from "../core/units.ts";

const HOUR_MS = 3_600_000;
const MIN_HOURS = 20 * 24;

export interface WeatherYear {
  year: number;
  /** Mean temperature per calendar month (index 0 = January) in the model's unit; NaN = too few hours. */
  monthlyTemp: number[];
}

/**
 * Calendar years of `weather` (local to `zone`) with monthly mean temperatures, using only
 * hours before `untilMs` (so a backtest cannot see the future). Every year with a usable month
 * is returned; scenarioYears picks the ones used as scenarios.
 */
export function weatherYears(weather: WeatherSeries | undefined, zone: string, unit: "C" | "F", untilMs = Infinity): WeatherYear[] {
  if (!weather || weather.tempC.length === 0) return [];
  const byYear = new Map<number, { sum: number[]; count: number[] }>();
  const endMs = Math.min(untilMs, weather.startMs + weather.tempC.length * HOUR_MS);
  for (const m of new LocalMonthCalendar(zone).between(weather.startMs, endMs)) {
    const year = Number(m.month.slice(0, 4));
    const month = Number(m.month.slice(5, 7));
    const from = Math.max(0, Math.ceil((m.startMs - weather.startMs) / HOUR_MS));
    const to = Math.min(weather.tempC.length, Math.ceil((Math.min(m.endMs, endMs) - weather.startMs) / HOUR_MS));
    const acc = byYear.get(year) ?? { sum: new Array<number>(12).fill(0), count: new Array<number>(12).fill(0) };
    for (let i = from; i < to; i++) {
      const t = weather.tempC[i]!;
      if (Number.isFinite(t)) {
        acc.sum[month - 1]! += t;
        acc.count[month - 1]!++;
      }
    }
    byYear.set(year, acc);
  }
  const years: WeatherYear[] = [...byYear]
    .sort((a, b) => a[0] - b[0])
    .map(([year, acc]) => ({
      year,
      monthlyTemp: acc.sum.map((s, m) => {
        if (acc.count[m]! < MIN_HOURS) return NaN;
        const c = s / acc.count[m]!;
        return unit === "F" ? cToF(c) : c;
      }),
    }))
    .filter((y) => y.monthlyTemp.some(Number.isFinite));
  return years;
}

/** The years used as scenarios: the complete ones, or every year when none is complete. */
export function scenarioYears(years: readonly WeatherYear[]): WeatherYear[] {
  const complete = years.filter((y) => y.monthlyTemp.every(Number.isFinite));
  return complete.length > 0 ? complete : [...years];
}

/**
 * Scenario temperatures: for each weather year, 12 monthly temperatures = typical + anomaly
 * (see the module comment). A month a year lacks gets the typical temperature. With no weather
 * years the single scenario is the typical year itself.
 * @example typical [5, …], years with January 3 and 7 → January scenarios 3 and 7 (+ typical 5 − mean 5)
 */
export function scenarioTemperatures(typical: readonly number[], allYears: readonly WeatherYear[]): number[][] {
  const years = scenarioYears(allYears);
  if (years.length === 0) return [[...typical]];
  const mean = typical.map((_, m) => {
    const xs = years.map((y) => y.monthlyTemp[m]!).filter(Number.isFinite);
    return xs.length > 0 ? xs.reduce((a, b) => a + b, 0) / xs.length : NaN;
  });
  return years.map((y) => typical.map((t, m) => (Number.isFinite(y.monthlyTemp[m]!) ? t + y.monthlyTemp[m]! - mean[m]! : t)));
}
