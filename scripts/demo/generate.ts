/**
 * Builds the whole demo portfolio in memory: relative path → file text. Pure apart from the
 * deterministic PRNG; the same call always returns the same map.
 */
import type { MeterBills } from "./bills.ts";
import { buildMeterBills } from "./bills.ts";
import type { ZoneCalendar } from "./calendar.ts";
import { buildZoneCalendar, usFederalHolidays } from "./calendar.ts";
import { BUILDINGS, METERS, SIM_END, SIM_START, STATIONS, buildingOf, stationOf } from "./definition.ts";
import { billLinesCsv, billsCsv, buildingsCsv, intervalFiles, metersCsv, portfolioYaml } from "./files.ts";
import { simulateElectricKwh, simulateGasThermsPerDay, simulateWaterGalPerDay } from "./loads.ts";
import type { MeterSeries } from "./metering.ts";
import { intervalCounts } from "./metering.ts";
import { loadDemoTariff } from "./pricing.ts";
import type { PlantedProblem } from "./problems.ts";
import { plantProblems } from "./problems.ts";
import { readDates } from "./read-schedule.ts";
import { readmeText } from "./readme.ts";
import { TARIFF_FILES } from "./tariffs.ts";
import { dailyMeanTempC, intervalTempC, normalsCsv, simulateHourlyTempC, weatherCsv } from "./weather.ts";

export interface DemoOutput {
  /** Relative path (with `/`) → file text. */
  files: Map<string, string>;
  problems: PlantedProblem[];
  /** Per meter, the bills as written (for tests). */
  meterBills: Map<string, MeterBills>;
}

/**
 * Generates every file of data/demo.
 * @example generateDemo().files.get("portfolio.yaml")
 */
export function generateDemo(): DemoOutput {
  const holidays = new Set<string>();
  for (let y = 2022; y <= 2026; y++) for (const d of usFederalHolidays(y)) holidays.add(d);

  const files = new Map<string, string>();
  const calendars = new Map<string, ZoneCalendar>();
  const temps = new Map<string, { interval: Float64Array; dailyMean: Float64Array }>();
  for (const station of STATIONS) {
    const cal = calendars.get(station.zone) ?? buildZoneCalendar(station.zone, SIM_START, SIM_END, holidays);
    calendars.set(station.zone, cal);
    const hourly = simulateHourlyTempC(station, cal);
    temps.set(station.stationId, { interval: intervalTempC(hourly, cal.startMs.length), dailyMean: dailyMeanTempC(hourly, cal) });
    files.set(`weather/${station.stationId}.csv`, weatherCsv(station, cal, hourly));
    if (station.normals) files.set(`weather/normals/${station.stationId}.csv`, normalsCsv(station, cal));
  }

  const tariffs = new Map(TARIFF_FILES.map((f) => [f.id, loadDemoTariff(f)] as const));
  for (const f of TARIFF_FILES) files.set(`tariffs/${f.fileName}`, f.text);

  const meterBills = new Map<string, MeterBills>();
  for (const meter of METERS) {
    const building = buildingOf(meter);
    const station = stationOf(building);
    const cal = calendars.get(station.zone) as ZoneCalendar;
    const t = temps.get(station.stationId) as { interval: Float64Array; dailyMean: Float64Array };
    const series: MeterSeries = { meter, cal, kwh: null, counts: null, daily: null };
    if (meter.electric) {
      series.kwh = simulateElectricKwh(meter.meterId, building, meter.electric, cal, t.interval);
      if (meter.interval) series.counts = intervalCounts(series.kwh, meter.multiplier, meter.interval.decimals);
    } else if (meter.gas) {
      series.daily = simulateGasThermsPerDay(meter.meterId, building, meter.gas, cal, t.dailyMean);
    } else if (meter.water) {
      series.daily = simulateWaterGalPerDay(meter.meterId, building, meter.water, cal);
    }
    const tariff = tariffs.get(meter.tariffId);
    if (!tariff) throw new Error(`demo: meter ${meter.meterId} names unknown tariff ${meter.tariffId}`);
    meterBills.set(meter.meterId, buildMeterBills(series, tariff, readDates(meter.meterId)));
  }

  const intervalNotes: string[] = [];
  for (const mb of meterBills.values()) {
    if (!mb.intervalFrom || !mb.intervalTo) continue;
    const written = intervalFiles(mb.series, mb.intervalFrom, mb.intervalTo);
    for (const [name, text] of written) files.set(`intervals/${name}`, text);
    const m = mb.series.meter;
    const layout = m.interval?.layout === "local-no-offset" ? "local time without offset (the repeated autumn hour appears twice)" : m.interval?.layout === "offset-split-by-year" ? "with UTC offsets, one file per year" : "with UTC offsets";
    intervalNotes.push(`${m.meterId} (${buildingOf(m).buildingId}), multiplier ${m.multiplier}, ${mb.intervalFrom} to ${mb.intervalTo}, ${layout}: ${[...written.keys()].map((k) => `intervals/${k}`).join(", ")}`);
  }

  const { bills, problems } = plantProblems(meterBills, (id) => {
    const m = METERS.find((x) => x.meterId === id);
    if (!m) throw new Error(`demo: unknown meter ${id}`);
    return m.buildingId;
  });
  const allBills = METERS.flatMap((m) => bills.get(m.meterId) ?? []);
  const printing = new Set(METERS.filter((m) => m.printsLines).map((m) => m.meterId));

  files.set("portfolio.yaml", portfolioYaml());
  files.set("buildings.csv", buildingsCsv(BUILDINGS));
  files.set("meters.csv", metersCsv(METERS));
  files.set("bills.csv", billsCsv(allBills));
  files.set("bill_lines.csv", billLinesCsv(allBills.filter((b) => printing.has(b.meterId))));
  files.set("README.md", readmeText(problems, intervalNotes));

  const sorted = new Map([...files].sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0)));
  return { files: sorted, problems, meterBills };
}
