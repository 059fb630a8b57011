import { describe, expect, it } from "vitest";
import { pooledGbdtSpec } from "../../../src/model/interval/pooled.ts";
import type { PooledModel } from "../../../src/model/interval/pooled.ts";
import type { HourlyFrame } from "../../../src/model/interval/types.ts";

const H = 3_600_000;
function frame(startHour: number, hours: number, level: (h: number) => number): HourlyFrame {
  const n = hours;
  const hs = Array.from({ length: n }, (_, i) => startHour + i);
  return {
    hourStartMs: Float64Array.from(hs, (h) => h * H), hourOfWeek: Uint8Array.from(hs, (h) => h % 168), holiday: new Uint8Array(n),
    tempC: Float64Array.from(hs, (h) => 10 + (h % 24)), tempSmoothC: Float64Array.from(hs, (h) => 10 + (h % 24)),
    tempSlopeCPerHour: new Float64Array(n), tempLagC: Float64Array.from(hs, (h) => 10 + (h % 24)), tempRollingMeanC: new Float64Array(n).fill(21.5),
    dayOfYear: Uint16Array.from(hs, (h) => 1 + Math.floor(h / 24) % 365), month: Uint8Array.from(hs, (h) => new Date(h * H).getUTCMonth() + 1),
    kwh: Float64Array.from(hs, level),
    accounting: { intervalsRead: n, intervalsUsed: n, hoursSpanned: n, hoursUsed: n, excluded: { masked: 0, nonFinite: 0, incomplete: 0, noWeather: 0 }, derivedFeatureFallbacks: 0 },
  };
}

describe("pooled GBDT (invented data)", () => {
  // The shape: day 2 … night 1; member A is 10× the target, B 3×; A's level doubles after hour 1000.
  const shape = (h: number): number => (h % 24 >= 8 && h % 24 < 18 ? 2 : 1);
  const target = frame(1000, 336, shape);
  const a = frame(0, 1500, (h) => 10 * shape(h) * (h >= 1000 ? 2 : 1));
  const b = frame(0, 1500, (h) => 3 * shape(h));

  it("scales each member by its mean over the target's window and uses no member hour after the target's last", () => {
    const m = pooledGbdtSpec("T", [{ meterId: "A", frame: a }, { meterId: "B", frame: b }], { nTrees: 50 }).fit(target) as PooledModel;
    expect(m.meterIds).toEqual(["T", "A", "B"]);
    const tMean = target.kwh.reduce((s, v) => s + v, 0) / 336;
    expect(m.scalesKwh[0]).toBeCloseTo(tMean, 12);
    expect(m.scalesKwh[1]).toBeCloseTo(20 * tMean, 12); // window hours 1000…1335: A = 20 × shape
    expect(m.scalesKwh[2]).toBeCloseTo(3 * tMean, 12);
    expect(m.rowsByMeter).toEqual([336, 1336, 1336]);
  });

  it("predicts the target's own level (bias < 1 %) and the shared day/night shape (ratio 2 within 10 %)", () => {
    // members with a steady level (A's mid-history doubling would leak into the shared shape)
    const steadyA = frame(0, 1500, (h) => 10 * shape(h));
    const m = pooledGbdtSpec("T", [{ meterId: "A", frame: steadyA }, { meterId: "B", frame: b }], { nTrees: 200, learningRate: 0.2 }).fit(target);
    const p = m.predict(target);
    const sum = (xs: ArrayLike<number>, keep: (i: number) => boolean): number => Array.from(xs).reduce((s, v, i) => (keep(i) ? s + v : s), 0);
    const all = (): boolean => true;
    expect(Math.abs(sum(p, all) / sum(target.kwh, all) - 1)).toBeLessThan(0.01);
    const day = (i: number): boolean => shape(1000 + i) === 2;
    const ratio = (sum(p, day) / 140) / (sum(p, (i) => !day(i)) / 196); // 14 days × 10 day hours, 14 × 14 night hours
    expect(Math.abs(ratio / 2 - 1)).toBeLessThan(0.1);
  });

  it("refuses when no member has hours before the target's last", () => {
    const late = frame(5000, 400, shape);
    expect(() => pooledGbdtSpec("T", [{ meterId: "L", frame: late }]).fit(target)).toThrow(/no pool member/);
  });
});
