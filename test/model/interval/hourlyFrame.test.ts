import { describe, expect, it } from "vitest";
import { hourlyFrame } from "../../../src/model/interval/hourlyFrame.ts";
import { hourGrid, hourlyFeaturesAt } from "../../../src/model/interval/hourlyFeatures.ts";
import type { IntervalSeries, WeatherSeries } from "../../../src/domain/types.ts";
import { ModelInputError } from "../../../src/model/errors.ts";

const H = 3_600_000;
// 2024-07-01 is a Monday; 05:00 UTC = 00:00 CDT in America/Chicago.
const T0 = Date.UTC(2024, 6, 1, 5);

function weatherFrom(startMs: number, temps: number[]): WeatherSeries {
  return { stationId: "W", startMs, tempC: Float64Array.from(temps), filled: new Uint8Array(temps.length) };
}

function quarterHourly(hours: number, value = 1): IntervalSeries {
  const n = hours * 4;
  return {
    meterId: "M1",
    intervalMinutes: 15,
    startMs: Float64Array.from({ length: n }, (_, i) => T0 + i * 900_000),
    values: new Float64Array(n).fill(value),
  };
}

describe("hourlyFrame: aggregation and accounting (hand-computed)", () => {
  const weather = weatherFrom(T0 - 48 * H, Array.from({ length: 200 }, (_, i) => 20 + (i % 5)));

  it("sums four 15-minute values per hour and applies the multiplier", () => {
    const s = quarterHourly(10, 0.25);
    const f = hourlyFrame(s, null, weather, "America/Chicago", { multiplier: 4 });
    expect(f.accounting.hoursSpanned).toBe(10);
    expect(f.accounting.hoursUsed).toBe(10);
    expect(Array.from(f.kwh)).toEqual(new Array(10).fill(4)); // 4 × 0.25 × 4
    expect(f.accounting.intervalsUsed).toBe(40);
  });

  it("excludes hours with a masked, non-finite or missing interval, each counted once, and hours without weather", () => {
    const s = quarterHourly(10);
    const mask = new Uint8Array(40);
    mask[1] = 1; // hour 0 masked
    s.values[9] = Number.NaN; // hour 2 non-finite
    mask[10] = 1; // hour 2 also masked → counted as masked (first reason)
    s.values[13] = Number.POSITIVE_INFINITY; // hour 3 non-finite
    // hour 5: drop one interval → incomplete
    const keep = Array.from({ length: 40 }, (_, i) => i).filter((i) => i !== 21);
    const s2: IntervalSeries = { ...s, startMs: Float64Array.from(keep, (i) => s.startMs[i]!), values: Float64Array.from(keep, (i) => s.values[i]!) };
    const m2 = Uint8Array.from(keep, (i) => mask[i]!);
    const w = weatherFrom(weather.startMs, Array.from(weather.tempC));
    w.tempC[48 + 7] = Number.NaN; // hour 7 has no temperature
    const f = hourlyFrame(s2, m2, w, "America/Chicago");
    expect(f.accounting.excluded).toEqual({ masked: 2, nonFinite: 1, incomplete: 1, noWeather: 1 });
    expect(f.accounting.hoursUsed).toBe(5);
    expect(f.accounting.hoursUsed + 2 + 1 + 1 + 1).toBe(f.accounting.hoursSpanned);
    expect(Array.from(f.hourStartMs, (ms) => (ms - T0) / H)).toEqual([1, 4, 6, 8, 9]);
    // the weather gap at hour 7 blanks nearby Savitzky–Golay windows: those rows fell back
    expect(f.accounting.derivedFeatureFallbacks).toBeGreaterThan(0);
  });

  it("rejects interval lengths that do not divide an hour and a wrong-length mask", () => {
    const s = { ...quarterHourly(2), intervalMinutes: 45 };
    expect(() => hourlyFrame(s, null, weather, "America/Chicago")).toThrow(ModelInputError);
    expect(() => hourlyFrame(quarterHourly(2), new Uint8Array(3), weather, "America/Chicago")).toThrow(/mask/);
  });
});

describe("hourly features", () => {
  const temps = Array.from({ length: 24 * 400 }, (_, i) => 10 + 0.5 * (i % 24));
  const weather = weatherFrom(Date.UTC(2023, 11, 1), temps);

  it("day of year is the local date's ordinal (hand-computed: 2024 is a leap year, 1 July = day 183)", () => {
    // 2024-07-01 05:00 UTC = 00:00 CDT → day 31+29+31+30+31+30+1 = 183; one hour earlier it is
    // still 30 June locally (182) although UTC says 1 July; 2025-01-01 05:59 UTC = 23:59 CST on 31 Dec 2024 → 366.
    const t = hourlyFeaturesAt(weather, "America/Chicago", [T0, T0 - H, Date.UTC(2025, 0, 1, 5)]).features;
    expect(Array.from(t.dayOfYear)).toEqual([183, 182, 366]);
    expect(Array.from(t.month)).toEqual([7, 6, 12]);
  });

  it("hour of week is local and DST-aware; holidays use observed dates (2024-07-04 is a Thursday)", () => {
    const t = hourlyFeaturesAt(weather, "America/Chicago", [T0, Date.UTC(2024, 6, 4, 15), Date.UTC(2024, 10, 4, 6)]).features;
    expect(t.hourOfWeek[0]).toBe(0); // Monday 00:00 CDT
    expect(t.hourOfWeek[1]).toBe(3 * 24 + 10); // Thursday 10:00 CDT
    expect(t.holiday[1]).toBe(1);
    expect(t.holiday[0]).toBe(0);
    expect(t.hourOfWeek[2]).toBe(0); // after fall-back: Monday 2024-11-04 00:00 CST = 06:00 UTC
  });

  it("lag, rolling mean and Savitzky–Golay slope on a linear ramp (hand-computed)", () => {
    // inside one day the ramp rises 0.5 °C/h; a quadratic SG fit reproduces a line exactly
    const ms = weather.startMs + (24 * 10 + 12) * H; // hour 12 of a day: window 9…15 stays on the ramp
    const t = hourlyFeaturesAt(weather, "UTC", [ms]).features;
    expect(t.tempC[0]).toBe(16);
    expect(t.tempSmoothC[0]).toBeCloseTo(16, 12);
    expect(t.tempSlopeCPerHour[0]).toBeCloseTo(0.5, 12);
    expect(t.tempLagC[0]).toBe(14.5);
    // trailing 24 h of a repeating 0…23 ramp: mean of 10 + 0.5·k over k = 0…23 = 15.75
    expect(t.tempRollingMeanC[0]).toBeCloseTo(15.75, 12);
  });

  it("hourGrid starts at the next top of the hour", () => {
    expect(Array.from(hourGrid(1, 2 * H + 1))).toEqual([H, 2 * H]);
  });
});
