import { describe, expect, it } from "vitest";
import { fitIntervalBaseline } from "../../../src/model/interval/fitIntervalBaseline.ts";
import { hourlyFrame } from "../../../src/model/interval/hourlyFrame.ts";
import type { IntervalSeries } from "../../../src/domain/types.ts";
import { ModelInputError } from "../../../src/model/errors.ts";
import { GUIDELINE14_LIMITS } from "../../../src/model/stats.ts";
import { syntheticOffice } from "./syntheticOffice.ts";

const H = 3_600_000;
function slice(s: IntervalSeries, a: number, b: number): IntervalSeries {
  return { ...s, startMs: s.startMs.slice(a, b), values: s.values.slice(a, b) };
}
const fast = { gbdt: { nTrees: 150 }, cv: { folds: 3, validationHours: 336 }, now: () => 0 };

describe("fitIntervalBaseline on a fictional office (invented data)", () => {
  // 16 weeks: train on the first 12, hold out the next 4.
  const d = syntheticOffice({ days: 112, seed: 21, weatherSeed: 5 });
  const cut = 84 * 96;
  const input = { meterId: "SYN-1", series: slice(d.series, 0, cut), mask: null, weather: d.weather, zone: d.zone, floorAreaM2: 4000, options: fast };
  const b = fitIntervalBaseline(input);
  const test = hourlyFrame(slice(d.series, cut, d.series.values.length), null, d.weather, d.zone);
  const pred = b.predictHourly(d.weather, test.hourStartMs[0]!, test.hourStartMs[test.hourStartMs.length - 1]! + H);

  it("reports every model with kind, cv_rmse, nmbe, r2, n, p on training and on each fold", () => {
    expect(b.summary.models.map((m) => m.kind)).toEqual(["towt", "towt-monthly", "gbdt", "gbdt+log1p"]);
    for (const m of b.summary.models) {
      expect(m.train!.n).toBe(84 * 24);
      expect(m.train!.p).toBeGreaterThan(0);
      expect(Object.keys(m.train!).sort()).toEqual(["cv_rmse", "n", "nmbe", "p", "r2"]);
      expect(m.folds).toHaveLength(3);
      expect(m.folds.every((f) => f.n === 336 && f.problem === null)).toBe(true);
      expect(m.cv!.n).toBe(3 * 336);
    }
    expect(b.summary.models[0]!.train!.p).toBeGreaterThan(168); // TOWT: 168 indicators + temperature terms
  });

  it("chooses an ensemble only with a margin ≥ 1 % over the best single model, and says which won", () => {
    const c = b.summary.chosen;
    if (c.kind === "ensemble") {
      expect(c.margin_pct).toBeGreaterThanOrEqual(1);
      expect(c.members!.reduce((s, m) => s + m.weight, 0)).toBeCloseTo(1, 12);
      expect(c.versus_kind).toBe(b.chosen.ensemble!.bestSingleKind);
    } else {
      expect(["towt", "towt-monthly", "gbdt", "gbdt+log1p"]).toContain(c.kind);
      expect(b.chosen.ensemble!.gainPct).toBeLessThan(1);
    }
    expect(c.cv!.cv_rmse).toBeLessThan(GUIDELINE14_LIMITS.hourly.cvRmsePct);
    expect(Math.abs(c.cv!.nmbe)).toBeLessThan(GUIDELINE14_LIMITS.hourly.nmbeAbsPct);
  });

  it("beats the naive mean-by-hour-of-week baseline on the 4 held-out weeks by at least 25 % (the issue's goal)", () => {
    const train = hourlyFrame(input.series, null, d.weather, d.zone);
    const sum = new Float64Array(168);
    const cnt = new Float64Array(168);
    train.kwh.forEach((v, i) => {
      sum[train.hourOfWeek[i]!]! += v;
      cnt[train.hourOfWeek[i]!]!++;
    });
    let seModel = 0;
    let seNaive = 0;
    test.kwh.forEach((y, i) => {
      seModel += (y - pred.kwh[i]!) ** 2;
      const h = test.hourOfWeek[i]!;
      seNaive += (y - sum[h]! / cnt[h]!) ** 2;
    });
    expect(Math.sqrt(seModel)).toBeLessThan(0.75 * Math.sqrt(seNaive));
  });

  it("the 80 % band holds roughly 80 % of held-out hours (loose: 4 autocorrelated weeks; 0.65 … 0.95)", () => {
    let inside = 0;
    test.kwh.forEach((y, i) => {
      if (y >= pred.lowerKwh[i]! && y <= pred.upperKwh[i]!) inside++;
    });
    const share = inside / test.kwh.length;
    expect(share).toBeGreaterThan(0.65);
    expect(share).toBeLessThan(0.95);
    expect(b.bandSource).toBe("cross-validation");
  });

  it("predicts NaN (counted) for hours without weather", () => {
    const end = d.weather.startMs + d.weather.tempC.length * H;
    const p = b.predictHourly(d.weather, end - 2 * H, end + 3 * H);
    expect(p.kwh.length).toBe(5);
    expect(p.missingWeatherHours).toBe(3);
    expect(Number.isNaN(p.kwh[4]!)).toBe(true);
  });

  it("is deterministic (same inputs and clock → identical summary)", () => {
    expect(JSON.stringify(fitIntervalBaseline(input).summary)).toBe(JSON.stringify(b.summary));
  });
});

describe("short-history meter with a pool (invented data)", () => {
  const weatherSeed = 77;
  const pool = [
    syntheticOffice({ days: 84, seed: 8, weatherSeed, occupiedKw: 150, baseKw: 70 }),
    syntheticOffice({ days: 84, seed: 9, weatherSeed, occupiedKw: 40, baseKw: 15 }),
  ].map((o, k) => ({ meterId: `POOL-${k}`, frame: hourlyFrame(o.series, null, o.weather, o.zone) }));
  const short = syntheticOffice({ days: 84, seed: 10, weatherSeed, occupiedKw: 60, baseKw: 30 });
  const cut = 28 * 96; // four weeks of history
  const b = fitIntervalBaseline({
    meterId: "SHORT",
    series: slice(short.series, 0, cut),
    mask: null,
    weather: short.weather,
    zone: short.zone,
    floorAreaM2: null,
    options: { pool, gbdt: { nTrees: 150 }, now: () => 0 },
  });

  it("uses the pooled model below 8 weeks and says why", () => {
    expect(b.shortHistory).toBe(true);
    expect(b.summary.chosen.kind).toBe("pooled-gbdt");
    expect(b.summary.chosen.reason).toMatch(/4\.0 weeks .*pooled model across 3 meters/);
    expect(b.summary.models.map((m) => m.kind)).toContain("pooled-gbdt");
  });

  it("puts the meter on its own scale: held-out 4 weeks within 10 % CV(RMSE) and ±5 % bias", () => {
    const test = hourlyFrame(slice(short.series, cut, cut + 28 * 96), null, short.weather, short.zone);
    const p = b.predictHourly(short.weather, test.hourStartMs[0]!, test.hourStartMs[test.hourStartMs.length - 1]! + H);
    let se = 0;
    let bias = 0;
    let sum = 0;
    test.kwh.forEach((y, i) => {
      se += (y - p.kwh[i]!) ** 2;
      bias += y - p.kwh[i]!;
      sum += y;
    });
    const meanY = sum / test.kwh.length;
    expect((100 * Math.sqrt(se / test.kwh.length)) / meanY).toBeLessThan(10);
    expect(Math.abs((100 * bias) / sum)).toBeLessThan(5);
  });

  it("without a pool, a short meter still gets a model (its own), chosen on short folds", () => {
    const own = fitIntervalBaseline({ meterId: "SHORT", series: slice(short.series, 0, cut), mask: null, weather: short.weather, zone: short.zone, floorAreaM2: null, options: { gbdt: { nTrees: 100 }, now: () => 0 } });
    expect(own.summary.models.map((m) => m.kind)).toEqual(["towt", "gbdt", "gbdt+log1p"]);
    expect(own.summary.models[0]!.folds).toHaveLength(2);
    expect(own.summary.chosen.kind).not.toBe("pooled-gbdt");
  });
});

describe("fitIntervalBaseline default folds on a year of data (invented office)", () => {
  it("places the 4 validation blocks in 4 different quarters and trains each on the rest of the year", () => {
    const d = syntheticOffice({ days: 365, seed: 8, weatherSeed: 9 });
    const b = fitIntervalBaseline({ meterId: "YEAR", series: d.series, mask: null, weather: d.weather, zone: d.zone, floorAreaM2: null, options: { gbdt: { nTrees: 60 }, tryLog1p: false, now: () => 0 } });
    const folds = b.summary.models[0]!.folds;
    expect(folds).toHaveLength(4);
    // Blocks centred in quarters of the last 364 days: Feb, May, Aug, Nov (hand-computed from the rule).
    expect(folds.map((f) => Math.floor(new Date(f.start).getUTCMonth() / 3))).toEqual([0, 1, 2, 3]);
    // Blocked training (less than a year precedes the first block): 8,760 − 672 − 2·24 hours.
    for (const f of folds) expect(f.n_train).toBe(b.summary.hours_used - 672 - 48);
    expect(b.bandSource).toBe("cross-validation");
    expect(b.summary.models.map((m) => m.kind)).toEqual(["towt", "towt-monthly", "gbdt"]);
  });
});

describe("fitIntervalBaseline input problems", () => {
  it("a fully masked meter is a ModelInputError naming the meter and the exclusion counts", () => {
    const d = syntheticOffice({ days: 3, seed: 2 });
    const mask = new Uint8Array(d.series.values.length).fill(1);
    expect(() => fitIntervalBaseline({ meterId: "M-X", series: d.series, mask, weather: d.weather, zone: d.zone, floorAreaM2: null })).toThrow(ModelInputError);
    expect(() => fitIntervalBaseline({ meterId: "M-X", series: d.series, mask, weather: d.weather, zone: d.zone, floorAreaM2: null })).toThrow(/M-X.*"masked":72/);
  });
});
