/**
 * weather/*.csv (hourly `station_id,timestamp,temperature_c|_f` or daily
 * `station_id,date,tmax_c,tmin_c` / `_f`) and weather/normals/*.csv (hourly) → readings per
 * station, ready for buildWeatherSeries. The layout is chosen from each file's header.
 */
import { realpath } from "node:fs/promises";
import { dirname } from "node:path";
import { quoteValue } from "../core/issues.ts";
import { openInputFile } from "./inputFile.ts";
import { MAX_YEAR, MIN_YEAR } from "./limits.ts";
import type { FileContext } from "./fileContext.ts";
import { readCsvTable, type Row } from "./csvTable.ts";
import { TIMESTAMP_HINT, newTimestampScratch, parseTimestampString } from "./timestamp.ts";
import type { DailyReading, HourlyReading } from "./weatherGrid.ts";
import { sharedResolver } from "../core/time/index.ts";
import { fToC } from "../core/units.ts";


export interface StationReadings {
  hourly: HourlyReading[];
  daily: DailyReading[];
}

export type WeatherLayout = "hourly" | "daily" | "unknown";

/**
 * Reads the first line of a file (header) without reading the whole file; any line ending.
 * Returns null after reporting when the file is not a readable regular file.
 */
async function readHeaderLine(path: string, ctx: FileContext): Promise<string | null> {
  const rootReal = ctx.rootReal ?? (await realpath(dirname(path)).catch(() => dirname(path)));
  const opened = await openInputFile(rootReal, path);
  if (!opened.ok) {
    ctx.error(0, 0, opened.missing ? "file disappeared while the portfolio was read" : opened.message, opened.missing ? "run again" : opened.hint);
    return null;
  }
  try {
    const buf = Buffer.alloc(4096);
    const { bytesRead } = await opened.handle.read(buf, 0, buf.length, 0);
    const text = buf.subarray(0, bytesRead).toString("utf8").replace(/^\uFEFF/, "");
    return text.split(/\r\n|\r|\n/)[0] ?? "";
  } catch {
    return "";
  } finally {
    await opened.handle.close().catch(() => undefined);
  }
}

/** Which layout a header announces, and the temperature unit. */
function weatherLayoutOf(header: string): { layout: WeatherLayout; unit: "c" | "f" } {
  const cols = header.split(",").map((c) => c.trim().replace(/^"|"$/g, "").toLowerCase());
  if (cols.includes("timestamp")) {
    if (cols.includes("temperature_c")) return { layout: "hourly", unit: "c" };
    if (cols.includes("temperature_f")) return { layout: "hourly", unit: "f" };
  }
  if (cols.includes("date")) {
    if (cols.includes("tmax_c") || cols.includes("tmin_c")) return { layout: "daily", unit: "c" };
    if (cols.includes("tmax_f") || cols.includes("tmin_f")) return { layout: "daily", unit: "f" };
  }
  return { layout: "unknown", unit: "c" };
}

/** Plausible outdoor air temperatures on Earth, °C (records are about −89 and +57). */
const PLAUSIBLE = (c: number): boolean => c >= -90 && c <= 60;

/**
 * Reads one weather file into `byStation`. `zoneOfStation` gives the zone used for timestamps
 * without offset (null: UTC, with one warning per file). `allowDaily` is false for normals.
 */
export async function readWeatherFile(
  path: string,
  ctx: FileContext,
  byStation: Map<string, StationReadings>,
  zoneOfStation: (stationId: string) => string | null,
  allowDaily: boolean,
): Promise<void> {
  const header = await readHeaderLine(path, ctx);
  if (header === null) return;
  if (header.trim() === "") {
    ctx.error(0, 0, "file is empty (no header row)", "remove the file, or add a header such as station_id,timestamp,temperature_c and rows");
    return;
  }
  const { layout, unit } = weatherLayoutOf(header);
  if (layout === "unknown" || (layout === "daily" && !allowDaily)) {
    ctx.error(1, 0, allowDaily
      ? "weather file header is neither hourly (station_id,timestamp,temperature_c|temperature_f) nor daily (station_id,date,tmax_c,tmin_c or _f)"
      : "normals file header must be station_id,timestamp,temperature_c (or temperature_f)",
    "name the columns in the first line; the unit is part of the temperature column name");
    return;
  }
  const toC = unit === "f" ? fToC : (x: number) => x;
  const stationOf = (id: string): StationReadings => {
    let s = byStation.get(id);
    if (!s) {
      s = { hourly: [], daily: [] };
      byStation.set(id, s);
    }
    return s;
  };
  const temp = (row: Row, name: string): number | null => {
    const v = row.number(name, true);
    if (v === null) return null;
    const c = toC(v);
    if (!PLAUSIBLE(c)) {
      row.problem(name, `${name} ${v} is not a plausible outdoor temperature`, "check the unit in the column name (_c or _f)");
      return null;
    }
    return c;
  };

  if (layout === "hourly") {
    const tcol = unit === "f" ? "temperature_f" : "temperature_c";
    const ts = newTimestampScratch();
    const lastInstant = new Map<string, number>();
    let warnedUtc = false;
    await readCsvTable(path, ctx, { required: ["station_id", "timestamp", tcol], optional: [] }, (row) => {
      const station = row.text("station_id", true);
      const text = row.text("timestamp", true);
      const c = temp(row, tcol);
      if (text === null || station === null) return;
      if (!parseTimestampString(text, ts)) {
        row.problem("timestamp", `timestamp ${quoteValue(text)} ${ts.error}`, TIMESTAMP_HINT);
        return;
      }
      let instant: number;
      if (ts.offsetMinutes === ts.offsetMinutes) instant = ts.wallMs - ts.offsetMinutes * 60000;
      else {
        const zone = zoneOfStation(station);
        if (zone === null) {
          if (!warnedUtc) {
            warnedUtc = true;
            ctx.warn(row.line, row.column("timestamp"), `no building uses station ${station}; timestamps without offset are read as UTC`,
              "add Z or an offset like -05:00 to the timestamps");
          }
          instant = ts.wallMs;
        } else {
          instant = sharedResolver(zone).resolve(ts.wallMs, lastInstant.get(station) ?? Number.NaN);
          if (Number.isNaN(instant)) {
            row.problem("timestamp", `local time ${text} does not exist in ${zone} (clocks jump forward for daylight saving time)`,
              "write weather timestamps with a UTC offset");
            return;
          }
        }
      }
      if (!(instant >= Date.UTC(MIN_YEAR, 0, 1) && instant < Date.UTC(MAX_YEAR + 1, 0, 1))) {
        row.problem("timestamp", `timestamp ${quoteValue(text)} is outside the years ${MIN_YEAR}–${MAX_YEAR}`, "check the year");
        return;
      }
      if (row.failed || c === null) return;
      lastInstant.set(station, instant);
      stationOf(station).hourly.push({ instantMs: instant, tempC: c });
    });
    return;
  }

  const maxCol = unit === "f" ? "tmax_f" : "tmax_c";
  const minCol = unit === "f" ? "tmin_f" : "tmin_c";
  await readCsvTable(path, ctx, { required: ["station_id", "date", maxCol, minCol], optional: [] }, (row) => {
    const station = row.text("station_id", true);
    const date = row.date("date", true);
    const tmax = temp(row, maxCol);
    const tmin = temp(row, minCol);
    if (tmax !== null && tmin !== null && tmin > tmax) row.problem(minCol, `${minCol} is above ${maxCol}`, "swap the two values?");
    if (row.failed || station === null || date === null || tmax === null || tmin === null) return;
    stationOf(station).daily.push({ date, tmaxC: tmax, tminC: tmin });
  });
}
