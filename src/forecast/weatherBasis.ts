/**
 * Weather bases: what "typical weather" means for the forecast's centre. The forecast does not
 * assume one; rolling-origin backtests choose among these candidates (backtest.ts):
 *
 *   normals    the station's normals file (weather/normals); a station without one keeps the
 *              average of its history (so the basis can be compared on every meter);
 *   recent-10  the mean per calendar month of the most recent 10 complete years of history;
 *   recent-15  the same over the most recent 15 complete years;
 *   all-years  every complete historical year as a scenario, centred on their own mean.
 *
 * "As available": with fewer years than the window, recent-10 and recent-15 use every complete
 * year there is. Candidates that come out identical (same years) are reported once, under the
 * first name (see `weatherBasisCandidates`). The scenarios always carry the year-to-year spread
 * of every complete historical year (weatherYears.ts: typical + each year's anomaly), so the
 * basis moves the centre, not the spread.
 */
import type { WeatherYear } from "./weatherYears.ts";
import { scenarioYears } from "./weatherYears.ts";

export type WeatherBasisId = "normals" | "recent-10" | "recent-15" | "all-years";

export const WEATHER_BASES: readonly WeatherBasisId[] = ["normals", "recent-10", "recent-15", "all-years"];

/** Plain words for each basis, for the page. */
export const WEATHER_BASIS_LABEL: Record<WeatherBasisId, string> = {
  normals: "the normals file (weather/normals; the history's average for a station without one)",
  "recent-10": "the mean of the most recent 10 years of weather history",
  "recent-15": "the mean of the most recent 15 years of weather history",
  "all-years": "every historical weather year as a scenario (centred on their mean)",
};

/** How many recent complete years a basis averages (null: normals; Infinity: all years). */
function windowOf(basis: WeatherBasisId): number | null {
  return basis === "normals" ? null : basis === "recent-10" ? 10 : basis === "recent-15" ? 15 : Infinity;
}

/**
 * The complete years a history basis averages: the most recent `window` complete years (all of
 * them when fewer). Empty for normals or when there is no complete year.
 * @example basisYears("recent-10", years 2001…2020) // 2011…2020
 */
export function basisYears(basis: WeatherBasisId, years: readonly WeatherYear[]): number[] {
  const w = windowOf(basis);
  if (w === null) return [];
  const complete = years.filter((y) => y.monthlyTemp.every(Number.isFinite)).map((y) => y.year).sort((a, b) => a - b);
  return complete.slice(Math.max(0, complete.length - w));
}

/**
 * Typical temperature per calendar month (index 0 = January, model unit) under `basis`; null
 * when the basis is not available (no normals file, or no complete year of history).
 * @example typicalForBasis("recent-10", years, null) // mean of the last 10 complete years, per month
 */
export function typicalForBasis(basis: WeatherBasisId, years: readonly WeatherYear[], normals: readonly number[] | null): number[] | null {
  if (basis === "normals") return normals ? [...normals] : null;
  const chosen = new Set(basisYears(basis, years));
  if (chosen.size === 0) return null;
  const used = years.filter((y) => chosen.has(y.year));
  return Array.from({ length: 12 }, (_, m) => used.reduce((s, y) => s + y.monthlyTemp[m]!, 0) / used.length);
}

export interface BasisCandidate {
  basis: WeatherBasisId;
  /** Complete years averaged (empty for normals). */
  years: number[];
  /** Other basis names that came out identical and are folded into this one. */
  sameAs: WeatherBasisId[];
}

/**
 * The distinct bases available for a station's history (and normals): candidates with the same
 * years are merged into the first. @example 3 complete years, a normals file → normals; recent-10 (same as recent-15, all-years)
 */
export function weatherBasisCandidates(years: readonly WeatherYear[], hasNormals: boolean): BasisCandidate[] {
  const out: BasisCandidate[] = [];
  if (hasNormals) out.push({ basis: "normals", years: [], sameAs: [] });
  for (const basis of WEATHER_BASES) {
    if (basis === "normals") continue;
    const ys = basisYears(basis, scenarioYears(years));
    if (ys.length === 0) continue;
    const twin = out.find((c) => c.basis !== "normals" && c.years.join() === ys.join());
    if (twin) twin.sameAs.push(basis);
    else out.push({ basis, years: ys, sameAs: [] });
  }
  return out;
}
