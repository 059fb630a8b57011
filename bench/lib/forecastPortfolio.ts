/**
 * Synthetic portfolios for the forecast's backtests (tests and `npm run bench`): the meters of
 * bench/lib/syntheticPortfolio.ts (known physics, seeded noise) driven by REAL temperatures —
 * NOAA daily max/min at Seattle 2012–2015 (vega-datasets seattle-weather.csv) made hourly by the
 * project's diurnal method — billed by calendar month and priced through small invented tariffs.
 * The station's normals are NOAA's 1981–2010 hourly normals for Seattle (vega-datasets
 * seattle-weather-hourly-normals.csv). Buildings, meters and prices are invented.
 *
 * Variants (all seeded, same inputs → same portfolio):
 *  - `seattle`: the five bench meters, four years of bills;
 *  - `seattle-drift`: the same with use drifting (a retrofit cuts the school's heating by a
 *    fifth from 2014, the shop's base load grows 4 % a year), so "same month last year" is not
 *    trivially right and neither is the model fitted on older years;
 *  - `seattle-short`: `seattle` plus a meter with only 14 months of bills (no track record).
 */
import { DateTime } from "luxon";
import type { Bill, Building, Meter, Portfolio, WeatherSeries } from "../../src/domain/types.ts";
import { DEFAULT_SETTINGS } from "../../src/ingest/portfolioYaml.ts";
import { loadTariff, priceBill, type Tariff } from "../../src/tariff/index.ts";
import { hourlyFromDailyMaxMin, parseDailyMaxMinCsv, parseHourlyNormalsCsv, readNoaaFile } from "./noaaWeather.ts";
import { BENCH_PROFILES, domainRecords, generateMeter, localHours, monthlyBills, type MeterProfile } from "./syntheticPortfolio.ts";

const ZONE = "America/Los_Angeles";
const STATION = "NOAA-SEATTLE";
const HOUR_MS = 3_600_000;

export type SyntheticVariant = "seattle" | "seattle-drift" | "seattle-short";
export const SYNTHETIC_VARIANTS: readonly SyntheticVariant[] = ["seattle", "seattle-drift", "seattle-short"];
/** Last day of data of every variant. */
export const SYNTHETIC_AS_OF = "2015-12-31";

const ELECTRIC_TARIFF = `
id: syn-electric
name: Invented general service
commodity: electricity
usage_unit: kWh
currency: USD
versions:
  - from: 2010-01-01
    charges:
      - label: Customer charge
        fixed: 25
      - label: Energy
        blocks:
          - { up_to: 20000, rate: 0.11 }
          - { rate: 0.09 }
  - from: 2014-07-01
    charges:
      - label: Customer charge
        fixed: 27
      - label: Energy
        blocks:
          - { up_to: 20000, rate: 0.115 }
          - { rate: 0.095 }
`;

const GAS_TARIFF = `
id: syn-gas
name: Invented gas service
commodity: gas
usage_unit: therm
currency: USD
versions:
  - from: 2010-01-01
    charges:
      - label: Customer charge
        fixed: 15
      - label: Gas
        energy: 0.95
`;

function tariffOf(yaml: string): Tariff {
  const { tariff, issues } = loadTariff(yaml, "synthetic.yaml");
  if (!tariff) throw new Error(`synthetic tariff did not load: ${issues.map((i) => i.message).join("; ")}`);
  return tariff;
}

/** Seattle hourly temperatures 2012–2015 (NOAA daily max/min → hourly). */
export function seattleWeather(): WeatherSeries {
  const daily = parseDailyMaxMinCsv(readNoaaFile("seattle-weather.csv"), "seattle-weather.csv");
  const series = hourlyFromDailyMaxMin(STATION, daily.rows, ZONE);
  if (!series) throw new Error("seattle-weather.csv gave no hours");
  return series;
}

/** NOAA 1981–2010 hourly normals for Seattle as a one-year hourly series (labels are local standard time, year 2010). */
export function seattleNormals(): WeatherSeries {
  const parsed = parseHourlyNormalsCsv(readNoaaFile("seattle-weather-hourly-normals.csv"), "seattle-weather-hourly-normals.csv");
  const first = DateTime.fromISO(parsed.rows[0]!.label, { zone: "UTC-8" });
  const tempC = Float64Array.from(parsed.rows.map((r) => r.tempC));
  return { stationId: STATION, startMs: first.toMillis(), tempC, filled: new Uint8Array(tempC.length) };
}

/** Use multiplier of a drifting meter in a given year (1 when the variant has no drift). */
function driftOf(variant: SyntheticVariant, meterId: string, year: number): number {
  if (variant !== "seattle-drift") return 1;
  if (meterId === "BENCH-SCHOOL-E") return year >= 2014 ? 0.8 : 1;
  if (meterId === "BENCH-RETAIL-E") return 1.04 ** (year - 2012);
  return 1;
}

/**
 * A synthetic portfolio (see the module comment). Bills are calendar months, priced through the
 * tariff in force, rounded to the cent.
 * @example syntheticForecastPortfolio("seattle").bills.length // 5 meters × 48 months
 */
export function syntheticForecastPortfolio(variant: SyntheticVariant, weather = seattleWeather(), normals: WeatherSeries | null = seattleNormals()): Portfolio<Tariff> {
  const electric = tariffOf(ELECTRIC_TARIFF);
  const gas = tariffOf(GAS_TARIFF);
  const hours = localHours("2012-01-01", 1461, ZONE);
  const profiles: MeterProfile[] = [...BENCH_PROFILES];
  if (variant === "seattle-short") profiles.push({ ...BENCH_PROFILES[0]!, meterId: "BENCH-ANNEX-E", buildingId: "BENCH-ANNEX", buildingName: "Bench Annex", seed: 106, base: 12, occupiedLoad: 40 });
  const buildings = new Map<string, Building>();
  const meters: Meter[] = [];
  const bills: Bill[] = [];
  for (const p of profiles) {
    const { building, meter } = domainRecords(p, ZONE, STATION);
    buildings.set(building.buildingId, building);
    const tariffId = p.commodity === "gas" ? gas.id : electric.id;
    meters.push({ ...meter, tariffId });
    const g = generateMeter(p, weather, hours);
    const values = g.series.values.map((v, i) => v * driftOf(variant, p.meterId, DateTime.fromMillis(g.series.startMs[i]!, { zone: ZONE }).year));
    const series = { ...g.series, values };
    const first = p.meterId === "BENCH-ANNEX-E" ? "2014-11" : "2012-01";
    const count = p.meterId === "BENCH-ANNEX-E" ? 14 : 48;
    for (const b of monthlyBills(series, ZONE, first, count).bills) {
      const usage = Math.round(b.usage);
      const priced = priceBill(p.commodity === "gas" ? gas : electric, {
        periodStart: b.periodStart, periodEnd: b.periodEnd, timezone: ZONE, usage, usageUnit: p.unit, demandKw: null, powerFactor: null,
        intervals: null, previousBillingDemandsKw: [], loadShapeByHourOfWeek: null,
      });
      bills.push({ ...b, usage, total: Math.round(priced.total * 100) / 100 });
    }
  }
  const settings = { name: `Synthetic ${variant}`, ...structuredClone(DEFAULT_SETTINGS), asOf: SYNTHETIC_AS_OF, forecastMonths: 12 };
  settings.degreeDayBase = { heating: 18, cooling: 18, unit: "C" };
  return {
    root: `synthetic:${variant}`,
    settings,
    buildings: [...buildings.values()],
    meters,
    bills,
    billLines: [],
    intervals: new Map(),
    weather: new Map([[STATION, weather]]),
    normals: normals ? new Map([[STATION, normals]]) : new Map(),
    tariffs: new Map([[electric.id, electric], [gas.id, gas]]),
    report: { files: [] },
  };
}

/** Hours in a series (for a sanity check in the bench). */
export function hoursOf(w: WeatherSeries): number {
  return Math.round((w.tempC.length * HOUR_MS) / HOUR_MS);
}
