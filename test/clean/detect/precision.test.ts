/**
 * Cleaning precision (issue 12, item 5) on invented meters (syntheticMeters.ts, seeded): a year
 * of clean readings of five kinds of ordinary behaviour must raise no flag, and the same meters
 * with planted faults must have each fault found with its kind. Sources of the expectations: the
 * faults are planted by construction (their positions are the expected values); "no flag on a
 * clean meter" is the definition of a false flag. The thresholds themselves follow common
 * practice for robust outlier screening (median and MAD-based σ, Hampel-style; Rousseeuw &
 * Croux 1993 for the 1.4826 factor).
 */
import { describe, expect, it } from "vitest";
import { detectAnomalies } from "../../../src/clean/detect/index.ts";
import { meterResolution } from "../../../src/clean/detect/resolution.ts";
import { logChanceOfRun, repeatCounts } from "../../../src/clean/detect/runChance.ts";
import { makeMeter, makeYearWeather, METER_KINDS, METER_ZONE, plantFaults, RESOLUTION } from "./syntheticMeters.ts";

const SEEDS = [1, 2, 3];

describe("a year of clean readings raises no flag", () => {
  for (const seed of SEEDS) {
    it(`five meter kinds, seed ${seed}`, () => {
      const weather = makeYearWeather(seed);
      for (const kind of METER_KINDS) {
        const series = makeMeter(kind, seed, weather);
        const { detections } = detectAnomalies(series, {}, { timezone: METER_ZONE });
        expect(detections.map((d) => `${d.kind} ${new Date(d.startMs).toISOString()} ${d.detail}`), kind).toEqual([]);
      }
    }, 60_000);
  }
});

describe("planted faults on the same meters are found", () => {
  for (const seed of SEEDS) {
    it(`five 25× spikes, a stuck register and an outage on each kind, seed ${seed}`, () => {
      const weather = makeYearWeather(seed);
      for (const kind of METER_KINDS) {
        const { series, planted } = plantFaults(makeMeter(kind, seed, weather), kind);
        const { detections, mask } = detectAnomalies(series, {}, { timezone: METER_ZONE });
        for (const p of planted) {
          // A 1 kWh-per-pulse meter on a small load reads 0–5 and repeats itself at every hour:
          // a register stuck at its daytime value, or zeros beside its zero nights, are not
          // distinguishable from its ordinary readings there, so only its spikes are required.
          if (kind === "pulse-meter" && p.kind !== "spike") continue;
          const where = `${kind} ${p.kind} at ${new Date(series.startMs[p.at]!).toISOString()}`;
          for (let i = p.at; i < p.at + p.intervals; i++) expect(mask[i], where).toBe(1);
          const d = detections.find((x) => x.startMs <= series.startMs[p.at]! && series.startMs[p.at]! < x.endMs);
          // on the pulse meter a 25× reading right after zero readings is a catch-up, which the
          // reset detector claims first (resets.ts: ≥ 3 × the typical level after zeros)
          const allowed = p.kind === "spike" && kind === "pulse-meter" ? ["spike", "reset"] : [p.kind];
          expect(allowed, where).toContain(d?.kind);
        }
        // and nothing else
        const covered = (startMs: number, endMs: number) =>
          planted.some((p) => startMs < series.startMs[p.at + p.intervals - 1]! + 900_000 && series.startMs[p.at]! < endMs);
        expect(detections.filter((d) => !covered(d.startMs, d.endMs)).map((d) => d.detail), kind).toEqual([]);
      }
    }, 60_000);
  }
});

describe("evidence on every detection", () => {
  const weather = makeYearWeather(2);
  const { series } = plantFaults(makeMeter("staging-chiller", 2, weather), "staging-chiller");
  const { detections } = detectAnomalies(series, {}, { timezone: METER_ZONE });
  it("a spike states its reading, the expected range and the resolution", () => {
    const spike = detections.find((d) => d.kind === "spike")!;
    expect(spike.detail).toMatch(/^spike up: [\d.]+ where [\d.-]+ to [\d.]+ is expected \(local median [\d.]+ ± the largest of 8 σ = [\d.]+, 25 % of the typical level = [\d.]+, 50 % of the median = [\d.]+\); .*meter resolution 0\.01$/);
    const [, value, low, high] = /^spike up: ([\d.]+) where ([\d.-]+) to ([\d.]+)/.exec(spike.detail)!.map(Number) as number[];
    expect(value! > high! || value! < low!).toBe(true);
  });
  it("a stuck run states the resolution and the odds of a run that long", () => {
    const stuck = detections.find((d) => d.kind === "constant-run")!;
    expect(stuck.detail).toMatch(/resolution 0\.01\) continues a repeat [\d.]+ % of the time on nearby weeks, so a run this long is expected (essentially never|[\d.e-]+ times) in \d+ readings by chance/);
  });
});

describe("meterResolution", () => {
  it("the smallest step between distinct readings (hand-computed)", () => {
    expect(meterResolution({ values: Float64Array.from([0.1, 0.12, 0.12, 0.16, 0.1]) })).toBeCloseTo(0.02, 12);
    expect(meterResolution({ values: Float64Array.from([5, 5, 5]) })).toBe(0);
    expect(meterResolution({ values: Float64Array.from([1, NaN, 3]) })).toBe(2);
  });
  it("one odd reading off the grid does not set the resolution (5th percentile of the gaps)", () => {
    const values = Float64Array.from({ length: 200 }, (_, i) => i * 0.02);
    values[100] = 2.0031; // off the 0.02 grid
    expect(meterResolution({ values })).toBeCloseTo(0.02, 9);
  });
  it("reads the generator's steps back from each synthetic meter", () => {
    const weather = makeYearWeather(1, 4);
    for (const kind of METER_KINDS) expect(meterResolution(makeMeter(kind, 1, weather, 4)), kind).toBeCloseTo(RESOLUTION[kind], 9);
  });
});

describe("logChanceOfRun", () => {
  // Hourly, 4 weeks, slots by hour of the day. Nights (00–05) repeat 1.0 on every day; days vary.
  const n = 28 * 24;
  const startMs = Float64Array.from({ length: n }, (_, i) => Date.UTC(2024, 0, 1) + i * 3_600_000);
  const values = Float64Array.from({ length: n }, (_, i) => (i % 24 < 6 ? 1 : 10 + (i % 7)));
  const series = { meterId: "X", intervalMinutes: 60, startMs, values };
  const slot = Int32Array.from({ length: n }, (_, i) => i % 24);
  const week = Int32Array.from({ length: n }, (_, i) => Math.floor(i / 168));
  const counts = repeatCounts(series, slot, 24, week, (i) => values[i] !== 0);

  it("a night run like every other night is likely (log P near 0)", () => {
    const a = 14 * 24; // day 14, 00:00–06:00
    const { logP, meanShare } = logChanceOfRun(counts, a, a + 6, 6);
    // 27 other nights, all repeating: each step's share is (27 + prior) / 28 ≥ 27/28
    expect(meanShare).toBeGreaterThanOrEqual(27 / 28);
    expect(logP).toBeGreaterThan(6 * Math.log(27 / 28) - 1e-12);
  });
  it("the same readings held through the day are far too unlikely on this history", () => {
    const held = Float64Array.from(values);
    const a = 14 * 24 + 8;
    for (let i = a; i < a + 5; i++) held[i] = 12;
    const c = repeatCounts({ ...series, values: held }, slot, 24, week, (i) => held[i] !== 0);
    // Days never repeat on other days (consecutive hours differ by 1 mod 7): each step's share is
    // its prior over (observations + 1), at most the pooled repeat share (nights: 5 of 24 pairs)
    // over 28, so the run is expected far less than the 0.001 times the detectors allow.
    const { logP } = logChanceOfRun(c, a, a + 5, 6);
    expect(logP).toBeLessThan(4 * Math.log(1 / 28));
    expect(n * Math.exp(logP)).toBeLessThan(0.001);
  });
});
