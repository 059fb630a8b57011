/**
 * Real NOAA temperatures for the benchmarks, from the files the vega-datasets npm package
 * ships (a devDependency):
 *  - seattle-weather.csv: one row per day 2012-01-01 … 2015-12-31 at Seattle, columns
 *    date, precipitation (mm), temp_max (°C), temp_min (°C), wind (m/s), weather (a word);
 *  - seattle-weather-hourly-normals.csv: NOAA 1981–2010 hourly climate normals for Seattle,
 *    one row per hour of a 365-day year labelled 2010, columns date, pressure (hPa),
 *    temperature (°C), wind (m/s).
 * Parsing is pure (text in, rows and problems out); only `readNoaaFile` touches the disk.
 * Hourly values are built from the daily max/min with the project's diurnal method
 * (hourFromDailyMaxMin in src/ingest/weatherGrid.ts, via buildWeatherSeries).
 */
import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { buildWeatherSeries, type DailyReading } from "../../src/ingest/weatherGrid.ts";
import { formatIssue, type InputIssue } from "../../src/core/issues.ts";
import type { WeatherSeries } from "../../src/domain/types.ts";

/** Folder of the vega-datasets data files, resolved from this module (not the working directory). */
export const VEGA_DATA_DIR = fileURLToPath(new URL("../../node_modules/vega-datasets/data/", import.meta.url));

/** Result of a parse: good rows, every problem row reported, and the count of data rows read. */
export interface NoaaParse<T> {
  rows: T[];
  /** Problems as `file:line:column: error: message (hint: …)`; rowsRead = rows.length + problems.length. */
  problems: string[];
  rowsRead: number;
}

/** One hour of the NOAA hourly normals: local standard-time label as written, and °C. */
export interface HourlyNormal {
  /** `YYYY-MM-DDTHH:MM:SS` as in the file (the year is a placeholder, 2010). */
  label: string;
  tempC: number;
}

/** Reads one file from the vega-datasets data folder (the only I/O of this module). */
export function readNoaaFile(fileName: string): string {
  return readFileSync(VEGA_DATA_DIR + fileName, "utf8");
}

/** Splits CSV text into header cells and numbered data lines (no quoted fields in these files). */
function splitCsv(text: string): { header: string[]; lines: { line: number; cells: string[] }[] } {
  const raw = text.replace(/^\uFEFF/, "").split(/\r?\n/);
  const header = (raw[0] ?? "").split(",").map((s) => s.trim());
  const lines: { line: number; cells: string[] }[] = [];
  for (let i = 1; i < raw.length; i++) {
    if (raw[i]!.trim() === "") continue;
    lines.push({ line: i + 1, cells: raw[i]!.split(",") });
  }
  return { header, lines };
}

function issue(file: string, line: number, column: number, message: string, hint: string): string {
  const i: InputIssue = { file, line, column, severity: "error", message, hint };
  return formatIssue(i);
}

/** Column index of `name` in the header, or a whole-file problem. */
function column(header: string[], name: string, file: string): number | string {
  const k = header.indexOf(name);
  return k >= 0 ? k : issue(file, 1, 0, `missing column "${name}"`, `the header is ${header.join(",")}`);
}

/** Numeric cell with its 1-based column for problem reports. */
function numberAt(cells: string[], k: number): number {
  const s = (cells[k] ?? "").trim();
  return s === "" ? Number.NaN : Number(s);
}

/**
 * Parses seattle-weather.csv into daily max/min readings (°C). A row is rejected (and
 * reported) when the date is not `YYYY-MM-DD`, a temperature is not a number, or
 * temp_max < temp_min.
 * @example parseDailyMaxMinCsv("date,temp_max,temp_min\n2012-01-01,12.8,5.0\n", "f.csv").rows[0] // { date: "2012-01-01", tmaxC: 12.8, tminC: 5 }
 */
export function parseDailyMaxMinCsv(text: string, file: string): NoaaParse<DailyReading> {
  const { header, lines } = splitCsv(text);
  const cols = ["date", "temp_max", "temp_min"].map((c) => column(header, c, file));
  const missing = cols.filter((c): c is string => typeof c === "string");
  if (missing.length > 0) return { rows: [], problems: missing, rowsRead: lines.length };
  const [kDate, kMax, kMin] = cols as number[];
  const rows: DailyReading[] = [];
  const problems: string[] = [];
  for (const { line, cells } of lines) {
    const date = (cells[kDate!] ?? "").trim();
    const tmaxC = numberAt(cells, kMax!);
    const tminC = numberAt(cells, kMin!);
    if (!/^\d{4}-\d{2}-\d{2}$/.test(date)) problems.push(issue(file, line, kDate! + 1, `date "${date}" is not YYYY-MM-DD`, "write the day as 2013-01-31"));
    else if (!Number.isFinite(tmaxC)) problems.push(issue(file, line, kMax! + 1, `temp_max "${cells[kMax!] ?? ""}" is not a number`, "°C, e.g. 12.8"));
    else if (!Number.isFinite(tminC)) problems.push(issue(file, line, kMin! + 1, `temp_min "${cells[kMin!] ?? ""}" is not a number`, "°C, e.g. 5.0"));
    else if (tmaxC < tminC) problems.push(issue(file, line, kMax! + 1, `temp_max ${tmaxC} is below temp_min ${tminC}`, "check whether the two columns are swapped"));
    else rows.push({ date, tmaxC, tminC });
  }
  return { rows, problems, rowsRead: lines.length };
}

/**
 * Parses seattle-weather-hourly-normals.csv into hourly normal temperatures (°C).
 * @example parseHourlyNormalsCsv("date,pressure,temperature,wind\n2010-01-01T01:00:00,1016.6,4.0,3.8\n", "n.csv").rows[0].tempC // 4
 */
export function parseHourlyNormalsCsv(text: string, file: string): NoaaParse<HourlyNormal> {
  const { header, lines } = splitCsv(text);
  const cols = ["date", "temperature"].map((c) => column(header, c, file));
  const missing = cols.filter((c): c is string => typeof c === "string");
  if (missing.length > 0) return { rows: [], problems: missing, rowsRead: lines.length };
  const [kDate, kTemp] = cols as number[];
  const rows: HourlyNormal[] = [];
  const problems: string[] = [];
  for (const { line, cells } of lines) {
    const label = (cells[kDate!] ?? "").trim();
    const tempC = numberAt(cells, kTemp!);
    if (!/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2})?$/.test(label)) problems.push(issue(file, line, kDate! + 1, `"${label}" is not a local date-time`, "write it as 2010-01-01T01:00:00"));
    else if (!Number.isFinite(tempC)) problems.push(issue(file, line, kTemp! + 1, `temperature "${cells[kTemp!] ?? ""}" is not a number`, "°C, e.g. 4.0"));
    else rows.push({ label, tempC });
  }
  return { rows, problems, rowsRead: lines.length };
}

/**
 * Hourly temperature on a UTC hour grid from daily max/min: every local day (in `zone`) gets
 * 24 (23/25 on DST days) hourly values by hourFromDailyMaxMin — minimum at 06:00, maximum at
 * 15:00 local, half-cosine between them (src/ingest/weatherGrid.ts). Returns null when `daily`
 * is empty.
 * @example hourlyFromDailyMaxMin("SEA", [{ date: "2012-01-01", tmaxC: 12.8, tminC: 5 }], "America/Los_Angeles") // 24 hours, 06:00 PST = 5.0 °C
 */
export function hourlyFromDailyMaxMin(stationId: string, daily: readonly DailyReading[], zone: string): WeatherSeries | null {
  // Gaps longer than 6 hours stay missing; the Seattle file has every day, so none are expected.
  const built = buildWeatherSeries(stationId, [], daily, zone, 6);
  return built ? built.series : null;
}

/** Mean of the finite values (NaN when none). */
export function meanFinite(values: ArrayLike<number>): number {
  let s = 0;
  let n = 0;
  for (let i = 0; i < values.length; i++) {
    const v = values[i]!;
    if (Number.isFinite(v)) {
      s += v;
      n++;
    }
  }
  return n > 0 ? s / n : Number.NaN;
}
