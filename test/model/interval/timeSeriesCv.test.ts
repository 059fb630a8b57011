import { describe, expect, it } from "vitest";
import { crossValidate, timeSeriesFolds } from "../../../src/model/interval/timeSeriesCv.ts";
import type { HourlyFrame, HourlyModelSpec } from "../../../src/model/interval/types.ts";
import { ModelInputError } from "../../../src/model/errors.ts";

const H = 3_600_000;

function frameOf(n: number, gapAt: number[] = []): HourlyFrame {
  const hours = Array.from({ length: n + gapAt.length }, (_, i) => i).filter((i) => !gapAt.includes(i));
  const m = hours.length;
  const z = () => new Float64Array(m);
  return {
    hourStartMs: Float64Array.from(hours, (h) => h * H), hourOfWeek: Uint8Array.from(hours, (h) => h % 168),
    holiday: new Uint8Array(m), tempC: z(), tempSmoothC: z(), tempSlopeCPerHour: z(), tempLagC: z(), tempRollingMeanC: z(), dayOfYear: Uint16Array.from(hours, (h) => 1 + (Math.floor(h / 24) % 365)), month: Uint8Array.from(hours, (h) => new Date(h * H).getUTCMonth() + 1),
    kwh: Float64Array.from(hours, (h) => 10 + (h % 24)),
    accounting: { intervalsRead: m, intervalsUsed: m, hoursSpanned: m, hoursUsed: m, excluded: { masked: 0, nonFinite: 0, incomplete: 0, noWeather: 0 }, derivedFeatureFallbacks: 0 },
  };
}

describe("expanding-window folds (hand-computed)", () => {
  it("100 hours, 3 folds of 10 h: blocks [70,80), [80,90), [90,100), training everything before", () => {
    const f = timeSeriesFolds(frameOf(100).hourStartMs, { folds: 3, validationHours: 10 });
    expect(f.map((d) => [d.trainEnd, d.validStart, d.validEnd])).toEqual([[70, 70, 80], [80, 80, 90], [90, 90, 100]]);
    expect(f[2]!.validEndMs).toBe(100 * H);
  });
  it("blocks are in time, not row counts: a gap of missing hours shortens a block", () => {
    const frame = frameOf(95, [72, 73, 74, 75, 76]); // hours 0…99 without 72–76
    const f = timeSeriesFolds(frame.hourStartMs, { folds: 3, validationHours: 10 });
    expect(f[0]!.validEnd - f[0]!.validStart).toBe(5);
    expect(f[1]!.validEnd - f[1]!.validStart).toBe(10);
  });
});

describe("spread and blocked folds (hand-computed)", () => {
  it("100 hours, 2 folds of 10 h spread: blocks centred in halves [20,30) and [70,80); blocked training leaves a 5 h gap", () => {
    // W = max(2·10, min(364 d, 100 h)) = 100; block j starts at round((j + ½)·100/2 − 10/2) = 20, 70
    const f = timeSeriesFolds(frameOf(100).hourStartMs, { folds: 2, validationHours: 10, placement: "spread", scheme: "auto", gapHours: 5 });
    expect(f.map((d) => [d.trainEnd, d.validStart, d.validEnd, d.trainResume])).toEqual([[15, 20, 30, 35], [65, 70, 80, 85]]);
    expect(f.every((d) => d.scheme === "blocked")).toBe(true); // "auto": only 20 h precede the first block
  });
  it("\"auto\" trains expanding once a year of data precedes the first block (two years, 4 × 4 weeks)", () => {
    // end = 17520 h; W = 8736; first start = 17520 − 8736 + round(0.5·2184 − 336) = 9540 h ≥ 8736 h
    const f = timeSeriesFolds(frameOf(17520).hourStartMs, { placement: "spread", scheme: "auto" });
    expect(f.map((d) => d.validStart)).toEqual([9540, 11724, 13908, 16092]);
    expect(f.every((d) => d.scheme === "expanding" && d.trainEnd === d.validStart && d.trainResume === 17520)).toBe(true);
  });
  it("blocked folds train on both sides of the block, never on the block or its gap", () => {
    const seen: Float64Array[] = [];
    const spy: HourlyModelSpec = {
      kind: "spy",
      fit(train) {
        seen.push(train.hourStartMs);
        return { kind: "spy", parameterCount: 1, predict: (f) => new Float64Array(f.tempC.length).fill(21.5) };
      },
    };
    const r = crossValidate(frameOf(24 * 30), spy, { folds: 3, validationHours: 48, minTrainRows: 24, placement: "spread", scheme: "blocked", gapHours: 12 });
    r.folds.forEach((fold, j) => {
      const hours = Array.from(seen[j]!, (ms) => ms / H);
      const a = fold.validStartMs / H;
      const b = fold.validEndMs / H;
      expect(hours.some((h) => h < a - 12) && hours.some((h) => h >= b + 12)).toBe(true);
      expect(hours.every((h) => h < a - 12 || h >= b + 12)).toBe(true);
      expect(fold.nTrain).toBe(24 * 30 - 48 - 24);
    });
  });
});

describe("crossValidate", () => {
  it("a block with n ≤ p has no Guideline 14 statistic (n − p ≤ 0) but its rows still count in the pooled ones", () => {
    const wide: HourlyModelSpec = {
      kind: "wide",
      fit: () => ({ kind: "wide", parameterCount: 40, predict: (f) => new Float64Array(f.tempC.length).fill(20) }),
    };
    const r = crossValidate(frameOf(200), wide, { folds: 2, validationHours: 30, minTrainRows: 20 });
    expect(r.folds.map((f) => f.problem)).toEqual(["validation block has 30 hours, not more than p = 40", "validation block has 30 hours, not more than p = 40"]);
    expect(r.pooled?.n).toBe(60);
  });

  it("never trains on the block's hours or later, and scores every block", () => {
    const seen: number[] = [];
    const spy: HourlyModelSpec = {
      kind: "spy",
      fit(train) {
        seen.push(train.hourStartMs[train.hourStartMs.length - 1]!);
        return { kind: "spy", parameterCount: 1, predict: (f) => new Float64Array(f.tempC.length).fill(21.5) };
      },
    };
    const r = crossValidate(frameOf(24 * 30), spy, { folds: 4, validationHours: 48, minTrainRows: 24 });
    const starts = r.folds.map((f) => f.validStartMs);
    seen.forEach((last, j) => expect(last).toBeLessThan(starts[j]!));
    expect(r.validationRows.length).toBe(4 * 48);
    expect(r.folds.every((f) => f.stats !== null)).toBe(true);
    // y = 10 + hour of day, prediction 21.5 = its mean → NMBE 0 over whole days
    expect(Math.abs(r.pooled!.nmbePct)).toBeLessThan(1e-9);
  });
  it("skips folds with too little training and records fit failures instead of stopping", () => {
    let calls = 0;
    const flaky: HourlyModelSpec = {
      kind: "flaky",
      fit() {
        calls++;
        if (calls === 1) throw new ModelInputError("singular design");
        return { kind: "flaky", parameterCount: 2, predict: (f) => new Float64Array(f.tempC.length).fill(20) };
      },
    };
    const r = crossValidate(frameOf(100), flaky, { folds: 3, validationHours: 30, minTrainRows: 20 });
    expect(r.folds[0]!.problem).toMatch(/only 10 training hours/);
    expect(r.folds[1]!.problem).toBe("singular design");
    expect(r.folds[2]!.stats?.n).toBe(30);
    expect(r.validationRows.length).toBe(30);
  });
});
