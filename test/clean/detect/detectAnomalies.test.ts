/**
 * The acceptance story of issue 5 on invented data (see syntheticOffice.ts): an office load
 * with planted faults must yield exactly those faults, with the right kind, start and length;
 * its clean twin — ordinary nights near zero, low weekends — must yield nothing.
 */
import { DateTime } from "luxon";
import { describe, expect, it } from "vitest";
import { detectAnomalies } from "../../../src/clean/detect/index.ts";
import type { IntervalSeries } from "../../../src/domain/types.ts";
import { dropRange, indexAt, makeOffice, ZONE } from "./syntheticOffice.ts";

interface Planted {
  kind: string;
  startMs: number;
  intervals: number;
}

function plantFaults(clean: IntervalSeries): { series: IntervalSeries; planted: Planted[] } {
  const v = Float64Array.from(clean.values);
  const t = clean.startMs;
  const planted: Planted[] = [];
  const at = (day: number, hour: number): number => indexAt(clean, day, hour);

  // 12-hour zero outage on a Tuesday, 07:00–19:00 local.
  const z = at(8, 7);
  for (let i = z; i < z + 48; i++) v[i] = 0;
  planted.push({ kind: "zero-run", startMs: t[z]!, intervals: 48 });
  // Register stuck for 10 hours on a Wednesday from 08:00.
  const c = at(16, 8);
  for (let i = c; i < c + 40; i++) v[i] = v[c]!;
  planted.push({ kind: "constant-run", startMs: t[c]!, intervals: 40 });
  // Three spikes: a daytime jump, a night jump, a daytime drop (a negative spike).
  for (const [day, hour, value] of [[21, 11, 400], [31, 3, 60], [36, 14, 1]] as const) {
    const s = at(day, hour);
    v[s] = value;
    planted.push({ kind: "spike", startMs: t[s]!, intervals: 1 });
  }
  // A small negative reading (not a reset: far below the typical level).
  const neg = at(39, 10);
  v[neg] = -3;
  planted.push({ kind: "negative", startMs: t[neg]!, intervals: 1 });
  // A register reset: one huge negative delta between normal readings.
  const r = at(45, 13);
  v[r] = -50_000;
  planted.push({ kind: "reset", startMs: t[r]!, intervals: 1 });
  // A 2-hour hole in the data on a Monday, 09:00–11:00.
  const g = at(42, 9);
  planted.push({ kind: "missing", startMs: t[g]!, intervals: 8 });
  const series = dropRange({ ...clean, values: v }, g, g + 8);
  planted.sort((a, b) => a.startMs - b.startMs);
  return { series, planted };
}

describe("detectAnomalies on an 8-week office with planted faults", () => {
  for (const seed of [42, 7, 2026]) {
    it(`finds each planted fault with the right kind, start and length (seed ${seed})`, () => {
      const { series, planted } = plantFaults(makeOffice({ seed }).series);
      const { detections, mask } = detectAnomalies(series);
      const found = detections.map((d) => ({ kind: d.kind, startMs: d.startMs, intervals: d.intervals }));
      expect(found).toEqual(planted);
      for (const d of detections) {
        expect(d.meterId).toBe("M1");
        expect(d.endMs).toBe(d.startMs + d.intervals * 15 * 60_000);
        expect(d.action).toBe("excluded");
        expect(d.detail.length).toBeGreaterThan(10);
      }
      // The mask covers exactly the flagged intervals present in the data (missing ones have none).
      const flagged = planted.filter((p) => p.kind !== "missing").reduce((s, p) => s + p.intervals, 0);
      expect(mask.reduce((s, m) => s + m, 0)).toBe(flagged);
      expect(mask.length).toBe(series.values.length);
    });
  }

  it("the clean twin (nights ~0, low weekends, morning ramp-ups) yields no detections", () => {
    for (const seed of [42, 7, 2026, 1, 99]) {
      const { series } = makeOffice({ seed });
      const { detections, mask } = detectAnomalies(series);
      expect(detections).toEqual([]);
      expect(mask.every((m) => m === 0)).toBe(true);
    }
  });

  it("never changes the readings it inspects", () => {
    const { series } = plantFaults(makeOffice({ seed: 3 }).series);
    const before = Float64Array.from(series.values);
    detectAnomalies(series);
    expect(series.values).toEqual(before);
  });
});

describe("a building that is truly off when closed", () => {
  it("exact zeros every night and weekend are its schedule, not outages", () => {
    const { series } = makeOffice({ seed: 11, offWhenClosed: true });
    expect(series.values[indexAt(series, 5, 12)]).toBe(0); // a Saturday noon reads exactly 0
    expect(detectAnomalies(series).detections).toEqual([]);
  });

  it("an outage joining two off nights is reported for the working hours only (usual edges trimmed)", () => {
    const { series } = makeOffice({ seed: 11, offWhenClosed: true });
    const v = Float64Array.from(series.values);
    const a = indexAt(series, 15, 7); // Tuesday of week 3, 07:00–19:00
    for (let i = a; i < a + 48; i++) v[i] = 0;
    const { detections } = detectAnomalies({ ...series, values: v });
    expect(detections.map((d) => [d.kind, d.startMs, d.intervals])).toEqual([["zero-run", series.startMs[a], 48]]);
    expect(detections[0]!.detail).toMatch(/left out/);
  });
});

// Speed is measured by `npm run bench` (bench/cleaning.ts), not asserted here: timed unit tests
// fail on busy machines without telling anything about correctness.
describe("a year of data", () => {
  it("runs over a year of 15-minute data and still finds the planted faults", () => {
    const { series, planted } = plantFaults(makeOffice({ weeks: 52, seed: 5 }).series);
    expect(series.values.length).toBeGreaterThan(34_900);
    const { detections, mask } = detectAnomalies(series);
    const found = detections.map((d) => ({ kind: d.kind, startMs: d.startMs, intervals: d.intervals }));
    for (const p of planted) expect(found).toContainEqual(p);
    expect(mask.length).toBe(series.values.length);
  });
});
