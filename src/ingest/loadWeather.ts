/**
 * The weather part of ingest: reads weather/*.csv and weather/normals/*.csv, resolves each
 * station's time zone from the buildings using it, builds the hourly series and reports gaps
 * and buildings whose station has no data.
 */
import { appendAll, type InputIssue } from "../core/issues.ts";
import type { Building, WeatherSeries } from "../domain/types.ts";
import type { FileContext } from "./fileContext.ts";
import { readWeatherFile, type StationReadings } from "./readWeather.ts";
import { buildWeatherSeries, type WeatherGap } from "./weatherGrid.ts";

export interface WeatherFolderInput {
  buildings: readonly Building[];
  maxGapHours: number;
  /** Sorted regular-file names with one of `exts` in a folder given as path parts below the portfolio folder (empty when absent). */
  listFiles: (parts: string[], exts: readonly string[]) => Promise<string[]>;
  /** Absolute path / issue label of a path inside the portfolio folder. */
  abs: (...parts: string[]) => string;
  label: (...parts: string[]) => string;
  /** Opens / closes a file's report in the caller's bookkeeping. */
  open: (file: string) => FileContext;
  close: (ctx: FileContext) => void;
}

export interface WeatherFolderResult {
  weather: Map<string, WeatherSeries>;
  normals: Map<string, WeatherSeries>;
  gaps: WeatherGap[];
  /** Gap reports and missing-station warnings (file issues go through `close`). */
  issues: InputIssue[];
}

/**
 * Loads all weather of a portfolio folder. Timestamps without offset are read in the zone of
 * the first building using the station (a warning when those buildings' zones differ).
 */
export async function loadWeatherFolder(input: WeatherFolderInput): Promise<WeatherFolderResult> {
  const { buildings, maxGapHours, listFiles, abs, label, open, close } = input;
  const issues: InputIssue[] = [];
  const gaps: WeatherGap[] = [];
  const zonesOfStation = new Map<string, string[]>();
  for (const b of buildings) {
    const list = zonesOfStation.get(b.weatherStation) ?? [];
    if (!list.includes(b.timezone)) list.push(b.timezone);
    zonesOfStation.set(b.weatherStation, list);
  }
  const zoneWarned = new Set<string>();
  /** First file each station was read from, so gap reports can name a file. */
  const fileOfStation = new Map<string, string>();

  const readStations = async (sub: string[], allowDaily: boolean): Promise<Map<string, StationReadings>> => {
    const byStation = new Map<string, StationReadings>();
    for (const name of await listFiles(sub, [".csv"])) {
      const ctx = open(label(...sub, name));
      await readWeatherFile(abs(...sub, name), ctx, byStation, (station) => {
        const zones = zonesOfStation.get(station);
        if (!zones) return null;
        if (zones.length > 1 && !zoneWarned.has(station)) {
          zoneWarned.add(station);
          ctx.warn(0, 0, `buildings using station ${station} are in different time zones (${zones.join(", ")}); local timestamps are read in ${zones[0]}`,
            "write weather timestamps with a UTC offset");
        }
        return zones[0];
      }, allowDaily);
      for (const station of byStation.keys()) if (!fileOfStation.has(station)) fileOfStation.set(station, ctx.file);
      close(ctx);
    }
    return byStation;
  };
  const toSeries = (byStation: Map<string, StationReadings>, collectGaps: boolean): Map<string, WeatherSeries> => {
    const out = new Map<string, WeatherSeries>();
    for (const [station, r] of [...byStation].sort((a, b) => (a[0] < b[0] ? -1 : 1))) {
      const built = buildWeatherSeries(station, r.hourly, r.daily, zonesOfStation.get(station)?.[0] ?? "UTC", maxGapHours);
      if (!built) continue;
      out.set(station, built.series);
      if (collectGaps) appendAll(gaps, built.gaps);
    }
    return out;
  };

  const weather = toSeries(await readStations(["weather"], true), true);
  const normals = toSeries(await readStations(["weather", "normals"], false), false);
  for (const g of gaps) {
    const span = `${g.hours} hour(s) from ${new Date(g.startMs).toISOString()}`;
    issues.push({
      file: fileOfStation.get(g.stationId) ?? label("weather"), line: 0, column: 0, severity: "warning",
      message: g.action === "interpolated"
        ? `station ${g.stationId}: gap of ${span} filled by linear interpolation`
        : `station ${g.stationId}: gap of ${span} is longer than ${maxGapHours} h and stays missing`,
      hint: g.action === "interpolated" ? "nothing to do; the filled hours are marked" : "add the missing readings, or raise weather_max_gap_hours in portfolio.yaml",
    });
  }
  for (const b of buildings) {
    if (!weather.has(b.weatherStation)) {
      issues.push({ file: b.source.file, line: b.source.line, column: 0, severity: "warning",
        message: `building ${b.buildingId}: weather_station ${b.weatherStation} has no data in weather/`,
        hint: "add the station's readings to weather/ or correct the station id; weather normalization is skipped without them" });
    }
  }
  // Without a normals file the typical year is averaged from the history (inputs contract):
  // fewer than 3 years is allowed, with a warning, because one odd year then weighs heavily.
  const usedStations = new Set(buildings.map((b) => b.weatherStation));
  for (const [stationId, series] of weather) {
    if (!usedStations.has(stationId) || normals.has(stationId)) continue;
    let hours = 0;
    for (let i = 0; i < series.tempC.length; i++) if (Number.isFinite(series.tempC[i])) hours++;
    const years = hours / 8766;
    if (years < MIN_TYPICAL_YEARS) {
      issues.push({ file: fileOfStation.get(stationId) ?? label("weather"), line: 0, column: 0, severity: "warning",
        message: `station ${stationId}: the typical weather year is built from only ${years.toFixed(1)} years of history (fewer than ${MIN_TYPICAL_YEARS}) and no normals file`,
        hint: `add weather/normals/${stationId}.csv (8,760 hourly rows of a typical year) or more years of history` });
    }
  }
  return { weather, normals, gaps, issues };
}

/** Years of history preferred for a typical year built from the station's own data. */
const MIN_TYPICAL_YEARS = 3;
