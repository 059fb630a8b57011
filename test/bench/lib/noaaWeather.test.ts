import { describe, expect, it } from "vitest";
import { DateTime } from "luxon";
import {
  hourlyFromDailyMaxMin,
  meanFinite,
  parseDailyMaxMinCsv,
  parseHourlyNormalsCsv,
  readNoaaFile,
} from "../../../bench/lib/noaaWeather.ts";

const ZONE = "America/Los_Angeles";

describe("NOAA Seattle files of vega-datasets", () => {
  const daily = parseDailyMaxMinCsv(readNoaaFile("seattle-weather.csv"), "seattle-weather.csv");
  const normals = parseHourlyNormalsCsv(readNoaaFile("seattle-weather-hourly-normals.csv"), "seattle-weather-hourly-normals.csv");
  const w = hourlyFromDailyMaxMin("SEA", daily.rows, ZONE)!; // built once: luxon per local day is slow

  it("reads every day 2012-01-01 … 2015-12-31 with no problem rows", () => {
    // Calendar arithmetic: 2012 is a leap year, so 366 + 3 × 365 = 1461 days.
    expect(daily.problems).toEqual([]);
    expect(daily.rowsRead).toBe(1461);
    expect(daily.rows).toHaveLength(1461);
    expect(daily.rows[0]).toEqual({ date: "2012-01-01", tmaxC: 12.8, tminC: 5.0 }); // first data line of the file, read by eye
    expect(daily.rows.at(-1)).toEqual({ date: "2015-12-31", tmaxC: 5.6, tminC: -2.1 }); // last line of the file
  });

  it("reads the hourly normals: one 365-day year less its first hour (8759 rows, 01:00 Jan 1 … 23:00 Dec 31)", () => {
    expect(normals.problems).toEqual([]);
    expect(normals.rows).toHaveLength(8759);
    expect(normals.rows[0]).toEqual({ label: "2010-01-01T01:00:00", tempC: 4.0 });
  });

  it("both files are in °C: the 2012–2015 daily mean agrees with the 1981–2010 NOAA hourly normals", () => {
    // vega-datasets' datapackage.json describes both files as metric. A unit mix-up (°F) would
    // put one mean near 52 and the other near 11; real years differ from the normals by ≲ 1.5 K.
    const dailyMean = meanFinite(daily.rows.map((r) => (r.tmaxC + r.tminC) / 2));
    const normalMean = meanFinite(normals.rows.map((r) => r.tempC));
    expect(normalMean).toBeGreaterThan(8);
    expect(normalMean).toBeLessThan(14);
    expect(Math.abs(dailyMean - normalMean)).toBeLessThan(1.5);
  });

  it("builds one hourly value per local hour for the four years, none missing", () => {
    // 1461 local days × 24 h: the 23-hour spring days and 25-hour autumn days cancel per year.
    expect(w.tempC.length).toBe(1461 * 24);
    expect(w.startMs).toBe(DateTime.fromISO("2012-01-01T00:00", { zone: ZONE }).toMillis());
    expect(Array.from(w.tempC).every(Number.isFinite)).toBe(true);
  });

  it("hand-checked day 2012-01-01 (Tmax 12.8, Tmin 5.0): minimum at 06:00, maximum at 15:00, half-cosines between", () => {
    const at = (hh: number): number => w.tempC[Math.round((DateTime.fromISO(`2012-01-01T${String(hh).padStart(2, "0")}:00`, { zone: ZONE }).toMillis() - w.startMs) / 3_600_000)]!;
    // Hand-computed: mid 8.9, amplitude 3.9.
    expect(at(6)).toBeCloseTo(5.0, 10);
    expect(at(15)).toBeCloseTo(12.8, 10);
    expect(at(12)).toBeCloseTo(8.9 - 3.9 * Math.cos((Math.PI * 6) / 9), 10); // 10.85
    expect(at(12)).toBeCloseTo(10.85, 2);
    expect(at(0)).toBeCloseTo(8.9 + 3.9 * Math.cos((Math.PI * 9) / 15), 10); // 7.695
    expect(at(0)).toBeCloseTo(7.695, 2);
  });
});

describe("parse problems are reported with file:line:column and every row is accounted for", () => {
  it("bad number, bad date, max below min", () => {
    const text = "date,precipitation,temp_max,temp_min\n2013-01-01,0,10,2\n2013-01-02,0,abc,2\n13/01/03,0,9,1\n2013-01-04,0,1,5\n";
    const r = parseDailyMaxMinCsv(text, "w.csv");
    expect(r.rows).toHaveLength(1);
    expect(r.rowsRead).toBe(4);
    expect(r.rows.length + r.problems.length).toBe(r.rowsRead);
    expect(r.problems[0]).toMatch(/^w\.csv:3:3: error: temp_max "abc" is not a number/);
    expect(r.problems[1]).toMatch(/^w\.csv:4:1: error: date "13\/01\/03"/);
    expect(r.problems[2]).toMatch(/^w\.csv:5:3: error: temp_max 1 is below temp_min 5/);
  });

  it("a missing column is a whole-file problem", () => {
    const r = parseDailyMaxMinCsv("date,temp_max\n2013-01-01,3\n", "w.csv");
    expect(r.rows).toEqual([]);
    expect(r.problems).toHaveLength(1);
    expect(r.problems[0]).toMatch(/^w\.csv:1:0: error: missing column "temp_min"/);
  });

  it("normals: a non-numeric temperature is reported", () => {
    const r = parseHourlyNormalsCsv("date,pressure,temperature,wind\n2010-01-01T01:00:00,1016.6,x,3.8\n", "n.csv");
    expect(r.rows).toEqual([]);
    expect(r.problems[0]).toMatch(/^n\.csv:2:3: error: temperature "x"/);
  });
});
