/**
 * The backtest prices one P50 path per distinct typical year: bases that give the same typical
 * year (the Seattle history is 2012–2015, so recent-10, recent-15 and all-years average the same
 * four years) share it. Pinned against each basis backtested on its own, where no sharing can
 * happen: the paths must be the very same numbers (exact equality; common practice for a
 * reuse that claims bit-identical results).
 */
import { describe, expect, it } from "vitest";
import { rollingBacktest, WEATHER_BASES, type RollingBacktest, type WeatherBasisId } from "../../src/forecast/index.ts";
import { SYNTHETIC_AS_OF, syntheticForecastPortfolio } from "../../bench/lib/forecastPortfolio.ts";

/** Per origin, each meter's P50 path at `basis` (null when the basis left it out). */
const pathsOf = (b: RollingBacktest, basis: WeatherBasisId) => b.meters.map((ms) => ms.map((m) => [m.meterId, m.p50ByBasis[basis] ?? null] as const));

describe("backtest P50 paths of bases with the same typical year", () => {
  for (const variant of ["seattle", "seattle-drift"] as const) {
    it(`${variant}: every basis's paths equal those of the basis backtested alone`, () => {
      const portfolio = syntheticForecastPortfolio(variant);
      const together = rollingBacktest(portfolio, { asOf: SYNTHETIC_AS_OF, grid: [1] });
      let compared = 0;
      for (const basis of WEATHER_BASES) {
        const alone = rollingBacktest(portfolio, { asOf: SYNTHETIC_AS_OF, grid: [1], bases: [basis] });
        const expected = pathsOf(alone, basis);
        expect(pathsOf(together, basis)).toEqual(expected);
        compared += expected.flat().filter(([, p]) => p !== null).length;
      }
      expect(compared).toBeGreaterThan(0);
      // The twins are really there (otherwise this test would not exercise the sharing).
      expect(together.bases.some((s) => s.sameAs.length > 0)).toBe(true);
    }, 180_000);
  }
});
