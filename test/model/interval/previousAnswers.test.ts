/**
 * The hourly baseline was made cheaper in CPU (shared fold tables, shared binned tree columns,
 * fitted values kept from boosting, allocation-free TOWT rows, a precomputed ensemble search);
 * these tests pin what must not move with such work: on the demo's interval meters (the build's
 * settings, through the pipeline's read → as-of cut → screening → fitBuildingIntervalBaselines)
 * and on the hourly benchmark's meters (bench/intervalBaseline.ts: NOAA Seattle 2013, default
 * settings, 2014 predicted), the chosen model, its members and exponent are the same, and its
 * CV(RMSE), NMBE and predictions stay within stated tolerances of the values recorded below.
 *
 * Expected values: previous implementation, commit 828f8dc (recorded with a scratch run of
 * fitIntervalBaseline before the change; the change itself reproduced them bit for bit).
 * Tolerances (common practice): CV(RMSE) and NMBE within 0.05 percentage points — half the
 * 0.1 % step the pages show them in, so no shown figure moves by more than its last digit;
 * the predicted total over the window within 0.1 %, and single hours within 1 % — far below
 * the meters' hourly CV(RMSE) of 3–17 %, i.e. well inside the models' own error.
 */
import { describe, expect, it } from "vitest";
import { loadPortfolio } from "../../../src/ingest/index.ts";
import { cutAtAsOf } from "../../../src/pipeline/asOf.ts";
import { assessIntervalMeters } from "../../../src/clean/index.ts";
import { fitBuildingIntervalBaselines } from "../../../src/model/interval/buildingBaselines.ts";
import { fitIntervalBaseline } from "../../../src/model/interval/fitIntervalBaseline.ts";
import type { IntervalBaseline } from "../../../src/model/interval/fitIntervalBaseline.ts";
import type { WeatherSeries } from "../../../src/domain/types.ts";
import { localMidnightMs, daysBetween } from "../../../src/core/time/index.ts";
import { BENCH_PROFILES, generateMeter, localHours } from "../../../bench/lib/syntheticPortfolio.ts";
import { hourlyFromDailyMaxMin, parseDailyMaxMinCsv, readNoaaFile } from "../../../bench/lib/noaaWeather.ts";

interface Previous {
  kind: string;
  members: { kind: string; weight: number }[] | null;
  exponent: number | null;
  cvRmsePct: number;
  nmbePct: number;
  /** Σ predicted kWh over the window, and how many hours had a prediction. */
  predictedSum: number;
  predictedHours: number;
  /** Predictions at hours 0, 970, 1940, 3880, 5820 and 7760 of the window. */
  atHours: number[];
}

const SAMPLE_HOURS = [0, 970, 1940, 3880, 5820, 7760];
const CV_TOL_PP = 0.05;
const SUM_TOL = 1e-3;
const HOUR_TOL = 1e-2;

// Previous implementation, commit 828f8dc: demo meters, build settings, window = the meter's data.
const DEMO_PREVIOUS: Record<string, Previous> = {
  "TWR-E": {
    kind: "ensemble",
    members: [{ kind: "towt", weight: 0.1 }, { kind: "gbdt", weight: 0.9 }],
    exponent: 0.5,
    cvRmsePct: 3.6397281630800133,
    nmbePct: 0.4566370696651052,
    predictedSum: 5106440.922777749,
    predictedHours: 10850,
    atHours: [360.77263907229724, 367.68168538340666, 263.6222843998819, 255.40789966158476, 1024.4009519247452, 1156.0689273259907],
  },
  "LAB-E": {
    kind: "ensemble",
    members: [{ kind: "towt", weight: 0.2 }, { kind: "towt-monthly", weight: 0.4 }, { kind: "gbdt", weight: 0.4 }],
    exponent: 1,
    cvRmsePct: 2.8634904107171084,
    nmbePct: -0.4599679790077802,
    predictedSum: 4666173.520201943,
    predictedHours: 10946,
    atHours: [392.5920829856367, 369.5924101341751, 325.9808426791402, 344.0751397773141, 682.6731301022915, 702.2393743061649],
  },
  "WHS-E": {
    kind: "ensemble",
    members: [{ kind: "towt", weight: 0.3 }, { kind: "towt-monthly", weight: 0.1 }, { kind: "gbdt", weight: 0.6 }],
    exponent: 0.5,
    cvRmsePct: 3.1257368522843616,
    nmbePct: 0.7324177853762459,
    predictedSum: 1366077.677513789,
    predictedHours: 10890,
    atHours: [48.55771592922526, 166.67261198042019, 225.63882581376785, 171.06072387055755, 166.1969430000969, 113.11707780120102],
  },
};

// Previous implementation, commit 828f8dc: benchmark meters, default settings, trained on 2013, window = 2014.
const BENCH_PREVIOUS: Record<string, Previous> = {
  "BENCH-OFFICE-E": {
    kind: "ensemble",
    members: [{ kind: "towt", weight: 0.6 }, { kind: "gbdt", weight: 0.1 }, { kind: "gbdt+log1p", weight: 0.3 }],
    exponent: 2,
    cvRmsePct: 12.392226697604272,
    nmbePct: -0.39896671818711854,
    predictedSum: 541353.2158902871,
    predictedHours: 8760,
    atHours: [30.3026220606579, 120.3727620367919, 29.931665095625696, 158.9361475968595, 29.841434071489175, 119.19122418768625],
  },
  "BENCH-OFFICE-G": {
    kind: "ensemble",
    members: [{ kind: "towt", weight: 0.2 }, { kind: "towt-monthly", weight: 0.1 }, { kind: "gbdt", weight: 0.2 }, { kind: "gbdt+log1p", weight: 0.5 }],
    exponent: 0.5,
    cvRmsePct: 16.88465272695753,
    nmbePct: -0.5206834886904617,
    predictedSum: 9179.644966519092,
    predictedHours: 8760,
    atHours: [1.3798081007640572, 3.8189271114009524, 0.6327694905233175, 0.7864248843243676, 0.325496350485862, 3.1519597149248355],
  },
  "BENCH-SCHOOL-E": {
    kind: "ensemble",
    members: [{ kind: "towt-monthly", weight: 0.2 }, { kind: "gbdt", weight: 0.3 }, { kind: "gbdt+log1p", weight: 0.5 }],
    exponent: -1,
    cvRmsePct: 17.4888198399036,
    nmbePct: -0.39801945554338364,
    predictedSum: 272700.11049362225,
    predictedHours: 8760,
    atHours: [20.186822816694765, 105.74331733905625, 14.737332259636414, 15.82497137009224, 13.999187174600095, 97.0750458716593],
  },
  "BENCH-RETAIL-E": {
    kind: "ensemble",
    members: [{ kind: "towt-monthly", weight: 0.7 }, { kind: "gbdt+log1p", weight: 0.3 }],
    exponent: -1,
    cvRmsePct: 11.155071113703771,
    nmbePct: -0.6503393958479683,
    predictedSum: 465803.07326146937,
    predictedHours: 8760,
    atHours: [20.181560345832057, 81.96105042899094, 19.93123846359996, 118.25311289835598, 92.19429293346612, 54.92780664346688],
  },
  "BENCH-WAREHOUSE-E": {
    kind: "gbdt+log1p",
    members: null,
    exponent: null,
    cvRmsePct: 15.057616038751483,
    nmbePct: 0.4508180560017073,
    predictedSum: 263295.4869533876,
    predictedHours: 8760,
    atHours: [9.588184399321838, 67.70051814601037, 10.189133020600108, 44.306131338858066, 10.163827931569887, 61.71445132166109],
  },
};

function expectSameAnswers(b: IntervalBaseline, weather: WeatherSeries, fromMs: number, toMs: number, prev: Previous): void {
  const chosen = b.summary.chosen;
  expect(chosen.kind).toBe(prev.kind);
  expect(chosen.members).toEqual(prev.members);
  expect(chosen.exponent).toBe(prev.exponent);
  expect(Math.abs(chosen.cv!.cv_rmse - prev.cvRmsePct)).toBeLessThanOrEqual(CV_TOL_PP);
  expect(Math.abs(chosen.cv!.nmbe - prev.nmbePct)).toBeLessThanOrEqual(CV_TOL_PP);
  const p = b.predictHourly(weather, fromMs, toMs);
  let sum = 0;
  let hours = 0;
  for (const v of p.kwh) {
    if (Number.isFinite(v)) {
      sum += v;
      hours++;
    }
  }
  expect(hours).toBe(prev.predictedHours);
  expect(Math.abs(sum - prev.predictedSum) / prev.predictedSum).toBeLessThanOrEqual(SUM_TOL);
  SAMPLE_HOURS.forEach((h, k) => expect(Math.abs(p.kwh[h]! - prev.atHours[k]!) / Math.abs(prev.atHours[k]!), `hour ${h}`).toBeLessThanOrEqual(HOUR_TOL));
}

describe("the hourly baseline keeps the previous implementation's answers (commit 828f8dc)", () => {
  it("on the demo's interval meters, with the build's settings", async () => {
    const loaded = await loadPortfolio("data/demo");
    const quality = assessIntervalMeters(cutAtAsOf(loaded.portfolio!).portfolio);
    const portfolio = quality.portfolio;
    const masks = new Map(quality.meters.map((q) => [q.meterId, q.mask]));
    const seen: string[] = [];
    for (const building of portfolio.buildings) {
      for (const outcome of fitBuildingIntervalBaselines(portfolio, building, masks)) {
        const prev = DEMO_PREVIOUS[outcome.meterId];
        expect(prev, `no recorded answer for ${outcome.meterId}`).toBeDefined();
        expect(outcome.problem).toBeNull();
        const series = portfolio.intervals.get(outcome.meterId)!;
        const weather = portfolio.weather.get(building.weatherStation)!;
        expectSameAnswers(outcome.baseline!, weather, series.startMs[0]!, series.startMs[series.startMs.length - 1]! + 3_600_000, prev!);
        seen.push(outcome.meterId);
      }
    }
    expect(seen.sort()).toEqual(Object.keys(DEMO_PREVIOUS).sort());
  }, 120_000);

  it("on the hourly benchmark's meters, with the default settings", () => {
    const zone = "America/Los_Angeles";
    const daily = parseDailyMaxMinCsv(readNoaaFile("seattle-weather.csv"), "seattle-weather.csv");
    const weather = hourlyFromDailyMaxMin("NOAA-SEATTLE", daily.rows, zone)!;
    const y1Ms = localMidnightMs("2013-01-01", zone);
    const y2Ms = localMidnightMs("2014-01-01", zone);
    const endMs = localMidnightMs("2015-01-01", zone);
    const hours = localHours("2013-01-01", daysBetween("2013-01-01", "2015-01-01"), zone);
    expect(BENCH_PROFILES.map((p) => p.meterId).sort()).toEqual(Object.keys(BENCH_PREVIOUS).sort());
    for (const profile of BENCH_PROFILES) {
      const m = generateMeter(profile, weather, hours);
      const keep = Array.from(m.series.startMs, (ms, i) => (ms >= y1Ms && ms < y2Ms ? i : -1)).filter((i) => i >= 0);
      const year1 = { ...m.series, startMs: Float64Array.from(keep, (i) => m.series.startMs[i]!), values: Float64Array.from(keep, (i) => m.series.values[i]!) };
      const b = fitIntervalBaseline({ meterId: profile.meterId, series: year1, mask: null, weather, zone, floorAreaM2: profile.floorAreaM2 });
      expectSameAnswers(b, weather, y2Ms, endMs, BENCH_PREVIOUS[profile.meterId]!);
    }
  }, 120_000);
});
