/**
 * Alignment scan on invented data (syntheticOffice.ts): an office in America/New_York with a
 * 07:00–19:00 weekday schedule and a cooling response to temperature. Sign convention under
 * test: suggestedOffsetHours = meter timestamp − true time.
 */
import { TimeInputError } from "../../src/core/errors.ts";
import { describe, expect, it } from "vitest";
import { suggestAlignment } from "../../src/clean/alignment.ts";
import { detectAnomalies } from "../../src/clean/detect/index.ts";
import { indexAt, makeOffice, shiftStamps, ZONE } from "./detect/syntheticOffice.ts";

describe("suggestAlignment", () => {
  for (const seed of [42, 1, 2, 3]) {
    it(`no offset → 0 despite the weekly schedule; stamps 3 h late → +3, strong (seed ${seed})`, () => {
      const { series, weather } = makeOffice({ seed });
      const at0 = suggestAlignment(series, weather, ZONE);
      expect(at0.suggestedOffsetHours).toBe(0);
      expect(at0.strong).toBe(true);
      expect(at0.evidence.scoreAtBest).toBe(at0.evidence.scoreAtZero);

      const late = suggestAlignment(shiftStamps(series, 3), weather, ZONE);
      expect(late.suggestedOffsetHours).toBe(3);
      expect(late.strong).toBe(true);
      expect(late.evidence.scoreAtBest).toBeGreaterThan(late.evidence.scoreAtZero);
      expect(late.evidence.days).toBe(56);
      expect(late.evidence.note).toMatch(/3 h late; subtract 3 h/);
      expect(late.meterId).toBe("M1");
    });
  }

  it("why periodic parts are removed: a plain load–temperature correlation picks the wrong hour here", () => {
    // Same data, no offset. Correlating raw hourly load with temperature at H − h peaks where the
    // 07:00–19:00 schedule's middle meets the 15:00 temperature peak, not at 0.
    const { series, weather } = makeOffice({ seed: 42 });
    const hourly = new Map<number, number>();
    series.startMs.forEach((t, i) => {
      const h = Math.floor(t / 3_600_000);
      hourly.set(h, (hourly.get(h) ?? 0) + series.values[i]!);
    });
    const w0 = weather.startMs / 3_600_000;
    const naive = (h: number): number => {
      const xs: number[] = [];
      const ys: number[] = [];
      for (const [H, load] of hourly) {
        xs.push(load);
        ys.push(weather.tempC[H - h - w0]!);
      }
      const mx = xs.reduce((a, b) => a + b) / xs.length;
      const my = ys.reduce((a, b) => a + b) / ys.length;
      let sxy = 0, sxx = 0, syy = 0;
      xs.forEach((x, i) => {
        sxy += (x - mx) * (ys[i]! - my);
        sxx += (x - mx) ** 2;
        syy += (ys[i]! - my) ** 2;
      });
      return sxy / Math.sqrt(sxx * syy);
    };
    const offsets = Array.from({ length: 29 }, (_, k) => k - 14);
    const naiveBest = offsets.reduce((b, h) => (naive(h) > naive(b) ? h : b), 0);
    expect(naiveBest).not.toBe(0);
    expect(suggestAlignment(series, weather, ZONE).suggestedOffsetHours).toBe(0);
  });

  it("the evidence lists every offset −14…+14 and the runner-up", () => {
    const { series, weather } = makeOffice({ seed: 5 });
    const r = suggestAlignment(shiftStamps(series, 3), weather, ZONE);
    expect(r.evidence.scores.map((s) => s.offsetHours)).toEqual(Array.from({ length: 29 }, (_, k) => k - 14));
    expect(r.evidence.method).toBe("partial-r2-time-of-week");
    expect(r.evidence.secondBestOffset).not.toBe(3);
    expect(r.evidence.margin).toBeGreaterThan(0);
    expect(r.evidence.jackknifeAgreeing).toBe(r.evidence.jackknifeRuns);
  });

  it("local clock times stored as UTC (summer New York, UTC−4) show as −4 and are named", () => {
    const { series, weather } = makeOffice({ seed: 8 });
    const r = suggestAlignment(shiftStamps(series, -4), weather, ZONE);
    expect(r.suggestedOffsetHours).toBe(-4);
    expect(r.evidence.note).toMatch(/local clock times stored as UTC/);
  });

  it("interval-end stamping: hourly data reads as +1; 15-minute data is below a whole-hour scan's resolution (0)", () => {
    const hourly = makeOffice({ seed: 9, intervalMinutes: 60 });
    const endStamped = suggestAlignment(shiftStamps(hourly.series, 1), hourly.weather, ZONE);
    expect(endStamped.suggestedOffsetHours).toBe(1);
    expect(endStamped.evidence.note).toMatch(/interval-end/);
    const q = makeOffice({ seed: 9 });
    expect(suggestAlignment(shiftStamps(q.series, 0.25), q.weather, ZONE).suggestedOffsetHours).toBe(0);
  });

  it("a load with a schedule but no weather response is never a strong suggestion", () => {
    for (const seed of [1, 2, 3]) {
      const { series, weather } = makeOffice({ seed, coolingPerDegree: 0 });
      const r = suggestAlignment(series, weather, ZONE);
      expect(r.strong).toBe(false);
      expect(r.evidence.scoreAtBest).toBeLessThan(0.05);
    }
  });

  it("flagged intervals passed as a mask are left out and the offset is still found", () => {
    const { series, weather } = makeOffice({ seed: 4 });
    const v = Float64Array.from(series.values);
    const a = indexAt(series, 10, 8);
    for (let i = a; i < a + 48; i++) v[i] = 0;
    v[indexAt(series, 20, 12)] = 5000;
    const faulty = shiftStamps({ ...series, values: v }, 3);
    const { mask } = detectAnomalies(faulty);
    expect(mask.reduce((s, m) => s + m, 0)).toBe(49);
    expect(suggestAlignment(faulty, weather, ZONE, { mask }).suggestedOffsetHours).toBe(3);
  });

  it("short data is not strong; no overlap with the weather gives 0 and says why", () => {
    const { series, weather } = makeOffice({ seed: 6, weeks: 2 });
    const short = suggestAlignment(series, weather, ZONE);
    expect(short.evidence.days).toBeLessThan(28);
    expect(short.strong).toBe(false);
    const far = { ...weather, startMs: weather.startMs + 400 * 86_400_000 };
    const none = suggestAlignment(series, far, ZONE);
    expect(none.suggestedOffsetHours).toBe(0);
    expect(none.strong).toBe(false);
    expect(none.evidence.note).toMatch(/do not overlap/);
  });

  it("rejects an unknown time zone with a TimeInputError", () => {
    const { series, weather } = makeOffice({ seed: 6, weeks: 1 });
    expect(() => suggestAlignment(series, weather, "Mars/Olympus")).toThrow(TimeInputError);
  });
});
