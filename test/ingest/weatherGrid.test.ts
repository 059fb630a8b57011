import { describe, expect, it } from "vitest";
import { FILL_FROM_DAILY, FILL_INTERPOLATED, FILL_MEASURED, buildWeatherSeries, hourFromDailyMaxMin } from "../../src/ingest/weatherGrid.ts";
import { fToC as fahrenheitToCelsius } from "../../src/core/units.ts";

const H = 3600000;

describe("hourFromDailyMaxMin (stated method; values hand-computed)", () => {
  it("hits Tmin at 06:00, Tmax at 15:00 and the mean half-way (10:30 and 22:30)", () => {
    expect(hourFromDailyMaxMin(20, 10, 6)).toBeCloseTo(10, 12);
    expect(hourFromDailyMaxMin(20, 10, 15)).toBeCloseTo(20, 12);
    expect(hourFromDailyMaxMin(20, 10, 10.5)).toBeCloseTo(15, 12);
    expect(hourFromDailyMaxMin(20, 10, 22.5)).toBeCloseTo(15, 12);
    // 00:00 is 9 of the 15 falling hours after 15:00: 15 + 5·cos(9π/15) = 15 − 5·0.309017 = 13.4549.
    expect(hourFromDailyMaxMin(20, 10, 0)).toBeCloseTo(13.454915, 5);
  });
});

describe("fahrenheitToCelsius", () => {
  it("matches the fixed points of the two scales (water boils 212 °F = 100 °C, freezes 32 °F = 0 °C; −40 is equal)", () => {
    expect(fahrenheitToCelsius(212)).toBe(100);
    expect(fahrenheitToCelsius(32)).toBe(0);
    expect(fahrenheitToCelsius(-40)).toBe(-40);
  });
});

describe("buildWeatherSeries", () => {
  const t0 = Date.UTC(2024, 0, 1, 0);
  it("puts hourly data on a UTC hour grid, snaps to the nearest hour, fills short gaps, keeps long ones", () => {
    const hourly = [
      { instantMs: t0, tempC: 0 },
      { instantMs: t0 + H - 7 * 60000, tempC: 2 }, // 00:53 → 01:00
      // 02:00, 03:00 missing (2 h ≤ 3): filled 3, 4 from 2 → 5
      { instantMs: t0 + 4 * H, tempC: 5 },
      // 05:00–08:00 missing (4 h > 3): kept
      { instantMs: t0 + 9 * H, tempC: 1 },
    ];
    const r = buildWeatherSeries("S1", hourly, [], "UTC", 3)!;
    expect(r.series.startMs).toBe(t0);
    expect(Array.from(r.series.tempC.slice(0, 5))).toEqual([0, 2, 3, 4, 5]);
    expect(r.series.tempC.slice(5, 9).every(Number.isNaN)).toBe(true);
    expect(Array.from(r.series.filled.slice(0, 5))).toEqual([FILL_MEASURED, FILL_MEASURED, FILL_INTERPOLATED, FILL_INTERPOLATED, FILL_MEASURED]);
    expect(r.gaps).toEqual([
      { stationId: "S1", startMs: t0 + 2 * H, endMs: t0 + 4 * H, hours: 2, action: "interpolated" },
      { stationId: "S1", startMs: t0 + 5 * H, endMs: t0 + 9 * H, hours: 4, action: "kept" },
    ]);
  });

  it("daily max/min fill only local days without hourly data", () => {
    const zone = "America/Chicago"; // UTC−6 in January
    const hourly = [{ instantMs: Date.UTC(2024, 0, 1, 6), tempC: 7 }]; // 2024-01-01 00:00 local
    const daily = [
      { date: "2024-01-01", tmaxC: 30, tminC: 20 }, // ignored: the day has hourly data
      { date: "2024-01-02", tmaxC: 20, tminC: 10 },
    ];
    const r = buildWeatherSeries("S1", hourly, daily, zone, 0)!;
    const at = (ms: number) => (ms - r.series.startMs) / H;
    const six = at(Date.UTC(2024, 0, 2, 12)); // 06:00 local on the 2nd
    const fifteen = at(Date.UTC(2024, 0, 2, 21)); // 15:00 local
    expect(r.series.tempC[six]).toBeCloseTo(10, 12);
    expect(r.series.tempC[fifteen]).toBeCloseTo(20, 12);
    expect(r.series.filled[six]).toBe(FILL_FROM_DAILY);
    expect(r.series.tempC[0]).toBe(7);
    // Hours 01:00–23:00 of the 1st have neither hourly nor daily data: one kept gap of 23 h.
    expect(r.gaps).toEqual([{ stationId: "S1", startMs: Date.UTC(2024, 0, 1, 7), endMs: Date.UTC(2024, 0, 2, 6), hours: 23, action: "kept" }]);
    expect(r.series.tempC.length).toBe(1 + 23 + 24);
  });

  it("returns null without data", () => {
    expect(buildWeatherSeries("S1", [], [], "UTC", 6)).toBeNull();
  });
});
