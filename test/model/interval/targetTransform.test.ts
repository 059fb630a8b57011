import { describe, expect, it } from "vitest";
import { withLog1pTarget, withPerAreaTarget } from "../../../src/model/interval/targetTransform.ts";
import { towtSpec } from "../../../src/model/interval/towt.ts";
import { hourlyFrame } from "../../../src/model/interval/hourlyFrame.ts";
import type { HourlyFrame, HourlyModelSpec } from "../../../src/model/interval/types.ts";
import { syntheticOffice } from "./syntheticOffice.ts";

/** A model that predicts the training mean everywhere (makes the transforms hand-checkable). */
const meanSpec: HourlyModelSpec = {
  kind: "mean",
  fit(train: HourlyFrame) {
    const m = train.kwh.reduce((a, b) => a + b, 0) / train.kwh.length;
    return { kind: "mean", parameterCount: 1, predict: (f) => new Float64Array(f.tempC.length).fill(m) };
  },
};

function frameOf(kwh: number[]): HourlyFrame {
  const n = kwh.length;
  const z = () => new Float64Array(n);
  return {
    hourStartMs: z(), hourOfWeek: new Uint8Array(n), holiday: new Uint8Array(n), tempC: z(), tempSmoothC: z(),
    tempSlopeCPerHour: z(), tempLagC: z(), tempRollingMeanC: z(), dayOfYear: new Uint16Array(n).fill(1), month: new Uint8Array(n).fill(1), kwh: Float64Array.from(kwh),
    accounting: { intervalsRead: n, intervalsUsed: n, hoursSpanned: n, hoursUsed: n, excluded: { masked: 0, nonFinite: 0, incomplete: 0, noWeather: 0 }, derivedFeatureFallbacks: 0 },
  };
}

describe("log1p target (hand-computed)", () => {
  const f = frameOf([0, Math.E ** 2 - 1]); // log1p → [0, 2], mean 1
  it("without smearing back-transforms with expm1: e − 1, below the arithmetic mean (e² − 1)/2 — the bias smearing addresses", () => {
    const spec = withLog1pTarget(meanSpec, { smearing: false });
    const p = spec.fit(f).predict(f);
    expect(p[0]).toBeCloseTo(Math.E - 1, 12);
    expect(p[0]!).toBeLessThan((Math.E ** 2 - 1) / 2);
    expect(spec.kind).toBe("mean+log1p-median");
  });
  it("Duan smearing by default: exp(1)·mean(exp(±1)) − 1 = e·cosh(1) − 1 (Duan 1983, eq. for the smearing estimate; hand-computed)", () => {
    const spec = withLog1pTarget(meanSpec);
    const p = spec.fit(f).predict(f);
    expect(p[0]).toBeCloseTo(Math.E * Math.cosh(1) - 1, 12);
    // e·cosh(1) − 1 = (e² + 1)/2 − 1 = (e² − 1)/2: here the smeared prediction is exactly the arithmetic mean
    expect(p[0]).toBeCloseTo((Math.E ** 2 - 1) / 2, 12);
    expect(spec.kind).toBe("mean+log1p");
    expect(withLog1pTarget(meanSpec, { smearing: true }).fit(f).predict(f)[0]).toBe(p[0]);
  });
  it("rejects targets ≤ −1", () => {
    expect(() => withLog1pTarget(meanSpec).fit(frameOf([-1, 2]))).toThrow(/> −1/);
  });
});

describe("per-floor-area target", () => {
  it("leaves an OLS model's predictions unchanged (least squares is scale-equivariant)", () => {
    const d = syntheticOffice({ days: 35, seed: 4 });
    const frame = hourlyFrame(d.series, null, d.weather, d.zone);
    const a = towtSpec().fit(frame).predict(frame);
    const b = withPerAreaTarget(towtSpec(), 4321).fit(frame).predict(frame);
    for (let i = 0; i < a.length; i += 97) expect(Math.abs(a[i]! - b[i]!)).toBeLessThan(1e-8 * Math.abs(a[i]!));
  });
  it("rejects a non-positive area", () => {
    expect(() => withPerAreaTarget(meanSpec, 0)).toThrow(/floor area/);
  });
});
