/** Each detector on small hand-built series (hand-computed expectations). */
import { describe, expect, it } from "vitest";
import {
  detectConstantRuns,
  detectMissing,
  detectNegatives,
  detectResets,
  detectSpikes,
  detectWeatherGaps,
  detectZeroRuns,
  parseCleaningConfig,
  resolveDetectConfig,
  DEFAULT_DETECT_CONFIG,
  typicalLevel,
} from "../../../src/clean/detect/index.ts";
import type { IntervalSeries } from "../../../src/domain/types.ts";
import { gauss, HOUR_MS, rng } from "./syntheticOffice.ts";

const T0 = Date.UTC(2025, 0, 6); // a Monday, 00:00 UTC

function mk(values: number[], intervalMinutes = 15, startMs = T0): IntervalSeries {
  return {
    meterId: "X",
    intervalMinutes,
    startMs: Float64Array.from(values, (_, i) => startMs + i * intervalMinutes * 60_000),
    values: Float64Array.from(values),
  };
}

describe("detectMissing", () => {
  it("starts 00:00, 00:15, 01:00 → 00:30–01:00 missing, 2 intervals", () => {
    const s: IntervalSeries = { meterId: "X", intervalMinutes: 15, startMs: Float64Array.from([T0, T0 + 15 * 60_000, T0 + HOUR_MS]), values: Float64Array.from([1, 1, 1]) };
    const d = detectMissing(s);
    expect(d).toHaveLength(1);
    expect(d[0]).toMatchObject({ kind: "missing", startMs: T0 + 30 * 60_000, endMs: T0 + HOUR_MS, intervals: 2, action: "excluded" });
  });
  it("a regular grid has no gaps; minIntervals hides short ones", () => {
    expect(detectMissing(mk([1, 2, 3]))).toEqual([]);
    const s: IntervalSeries = { meterId: "X", intervalMinutes: 60, startMs: Float64Array.from([T0, T0 + 3 * HOUR_MS]), values: Float64Array.from([1, 1]) };
    expect(detectMissing(s)[0]!.intervals).toBe(2);
    expect(detectMissing(s, { minIntervals: 3 })).toEqual([]);
  });
});

describe("detectNegatives", () => {
  it("groups adjacent negatives and skips indices already explained", () => {
    const d = detectNegatives(mk([5, -1, -2, 6, -0.5]));
    expect(d.map((x) => [x.startMs, x.intervals])).toEqual([[T0 + 15 * 60_000, 2], [T0 + 60 * 60_000, 1]]);
    expect(d[0]!.detail).toMatch(/-2/);
    expect(detectNegatives(mk([5, -1, 6]), {}, Uint8Array.from([0, 1, 0]))).toEqual([]);
    expect(detectNegatives(mk([5, -0.5, 6]), { tolerance: 1 })).toEqual([]);
  });
});

describe("detectResets", () => {
  it("level 50: −5000 between normal readings is a reset; −60 is not (below 2 × level deep)", () => {
    expect(detectResets(mk([40, -5000, 45]), 50).map((d) => d.startMs)).toEqual([T0 + 15 * 60_000]);
    expect(detectResets(mk([40, -60, 45]), 50)).toEqual([]);
  });
  it("two large negatives in a row are not a reset (left to detectNegatives)", () => {
    expect(detectResets(mk([40, -5000, -5000, 45]), 50)).toEqual([]);
  });
  it("a catch-up after zeros: 600 ≥ 3 × 50 right after three zeros", () => {
    const d = detectResets(mk([40, 0, 0, 0, 600, 40]), 50);
    expect(d).toHaveLength(1);
    expect(d[0]).toMatchObject({ kind: "reset", startMs: T0 + 4 * 15 * 60_000, intervals: 1 });
    expect(d[0]!.detail).toMatch(/3 zero reading/);
  });
  it("a catch-up after a gap; the same value after a normal reading is not a reset", () => {
    const s: IntervalSeries = { meterId: "X", intervalMinutes: 15, startMs: Float64Array.from([T0, T0 + HOUR_MS]), values: Float64Array.from([40, 600]) };
    expect(detectResets(s, 50)[0]!.detail).toMatch(/gap/);
    expect(detectResets(mk([40, 45, 600, 40]), 50)).toEqual([]);
  });
});

describe("detectZeroRuns / detectConstantRuns on short series (compared by hour of day)", () => {
  // 5 days of hourly data, 1 kWh at night (00–06), 10 during the day.
  const day = (d: number) => Array.from({ length: 24 }, (_, h) => (h < 6 ? 1 : 10 + ((d * 7 + h * 3) % 5)));
  const days = [0, 1, 2, 3, 4].map(day).flat();

  it("minimum run: 4 zero hours are checked, 3 are not", () => {
    const v4 = days.slice();
    for (let h = 30; h < 34; h++) v4[h] = 0; // day 1, 06:00–10:00
    expect(detectZeroRuns(mk(v4, 60)).map((d) => [d.startMs, d.intervals])).toEqual([[T0 + 30 * HOUR_MS, 4]]);
    const v3 = days.slice();
    for (let h = 30; h < 33; h++) v3[h] = 0;
    expect(detectZeroRuns(mk(v3, 60))).toEqual([]);
  });
  it("a constant nonzero value held for 5 hours in the day is a constant run; zeros are not", () => {
    const v = days.slice();
    for (let h = 58; h < 63; h++) v[h] = 12.5; // day 2, 10:00–15:00
    const d = detectConstantRuns(mk(v, 60));
    expect(d.map((x) => [x.kind, x.startMs, x.intervals])).toEqual([["constant-run", T0 + 58 * HOUR_MS, 5]]);
    expect(detectZeroRuns(mk(v, 60))).toEqual([]);
  });
  it("the constant 1 kWh every night (00–06) is the building's habit, not a stuck register", () => {
    expect(detectConstantRuns(mk(days, 60))).toEqual([]);
  });
  it("... but the same nights are reported when the habit is configured away (usualShare > 1, chance rule off)", () => {
    expect(detectConstantRuns(mk(days, 60), { usualShare: 1.01 })).toEqual([]); // the repeat chance still explains them
    expect(detectConstantRuns(mk(days, 60), { usualShare: 1.01, maxChanceRuns: 1e9 })).toHaveLength(5);
  });
  it("runs longer than alwaysFlagHours are reported whatever the history", () => {
    const v = Array.from({ length: 24 * 5 }, () => 0);
    expect(detectZeroRuns(mk(v, 60))).toHaveLength(1);
    // Below the always-report length it is still reported: the run covers every day, so no
    // other day is left to show that these hours are usually zero.
    expect(detectZeroRuns(mk(v, 60), { alwaysFlagHours: 1000 })).toHaveLength(1);
  });
  it("a run never bridges a gap in time", () => {
    const s: IntervalSeries = {
      meterId: "X",
      intervalMinutes: 60,
      startMs: Float64Array.from([0, 1, 2, 5, 6, 7], (h) => T0 + h * HOUR_MS),
      values: Float64Array.from([0, 0, 0, 0, 0, 0]),
    };
    expect(detectZeroRuns(s)).toEqual([]);
  });
});

describe("detectSpikes", () => {
  const u = rng(3);
  const g = gauss(u);
  // Two days of 15-minute data with a gradual morning ramp 05:00–08:00 from 2 to 100.
  const values = Array.from({ length: 192 }, (_, i) => {
    const h = (i % 96) / 4;
    const base = h < 5 ? 2 : h < 8 ? 2 + ((h - 5) / 3) * 98 : h < 19 ? 100 : 2;
    return base * (1 + 0.03 * g());
  });
  const level = typicalLevel(mk(values));

  it("an ordinary ramp-up and its noise give no spike", () => {
    expect(detectSpikes(mk(values), level)).toEqual([]);
  });
  it("a single reading of 400 at noon is a spike up; a drop to 1 is a spike down", () => {
    const v = values.slice();
    v[48] = 400;
    v[150] = 1;
    const d = detectSpikes(mk(v), level);
    expect(d.map((x) => [x.startMs, x.intervals])).toEqual([[T0 + 48 * 15 * 60_000, 1], [T0 + 150 * 15 * 60_000, 1]]);
    expect(d[0]!.detail).toMatch(/spike up/);
    expect(d[1]!.detail).toMatch(/spike down/);
  });
  it("a bump below the level floor (25 % of p90) is not a spike, however many σ", () => {
    const v = values.slice();
    v[10] = 2 + 0.2 * level; // night reading: many σ above 2, but under 0.25 × level
    expect(detectSpikes(mk(v), level)).toEqual([]);
    v[10] = 2 + 0.3 * level;
    expect(detectSpikes(mk(v), level)).toHaveLength(1);
  });
});

describe("detectWeatherGaps", () => {
  it("NaN runs are excluded gaps, filled runs interpolated gaps, counted in hours", () => {
    const w = {
      stationId: "WX",
      startMs: T0,
      tempC: Float64Array.from([10, NaN, NaN, 13, 14, 15, 16]),
      filled: Uint8Array.from([0, 0, 0, 0, 1, 1, 0]),
    };
    expect(detectWeatherGaps(w).map((d) => [d.kind, d.action, d.startMs, d.endMs, d.intervals, d.meterId, d.stationId])).toEqual([
      ["weather-gap", "excluded", T0 + HOUR_MS, T0 + 3 * HOUR_MS, 2, null, "WX"],
      ["weather-gap", "interpolated", T0 + 4 * HOUR_MS, T0 + 6 * HOUR_MS, 2, null, "WX"],
    ]);
  });
});

describe("configuration", () => {
  it("fills unspecified settings from the defaults and keeps the given ones", () => {
    const c = resolveDetectConfig({ spike: { sigmas: 10 } });
    expect(c.spike.sigmas).toBe(10);
    expect(c.spike.halfWindowHours).toBe(DEFAULT_DETECT_CONFIG.spike.halfWindowHours);
    expect(c.zeroRun).toEqual(DEFAULT_DETECT_CONFIG.zeroRun);
  });
});

describe("parseCleaningConfig (portfolio.yaml `cleaning:`)", () => {
  it("maps snake_case keys onto the config and reports unknown keys and bad values with their path", () => {
    const { config, issues } = parseCleaningConfig({
      zero_run: { min_run_hours: 6, always_flag_hours: 48 },
      spike: { sigmas: "eight", half_window_hours: 2 },
      spikes: {},
      reset: { catch_up_levels: -1, colour: 3 },
    });
    expect(config).toEqual({ zeroRun: { minRunHours: 6, alwaysFlagHours: 48 }, spike: { halfWindowHours: 2 } });
    expect(issues.map((i) => i.path)).toEqual(["cleaning.spike.sigmas", "cleaning.spikes", "cleaning.reset.catch_up_levels", "cleaning.reset.colour"]);
    expect(resolveDetectConfig(config).zeroRun.minRunHours).toBe(6);
  });
  it("absent means defaults; a non-mapping is one issue", () => {
    expect(parseCleaningConfig(undefined)).toEqual({ config: {}, issues: [] });
    expect(parseCleaningConfig([1]).issues).toHaveLength(1);
  });
});
