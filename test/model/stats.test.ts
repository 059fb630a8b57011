import { describe, expect, it } from "vitest";
import { compensatedSum, cvRmsePct, GUIDELINE14_LIMITS, guideline14Stats, mean, nmbePct, rSquared } from "../../src/model/stats.ts";
import { ModelInputError } from "../../src/model/errors.ts";

describe("compensatedSum", () => {
  it("keeps small terms that a naive loop loses (Neumaier 1974 example, hand-computed)", () => {
    expect(compensatedSum([1, 1e100, 1, -1e100])).toBe(2);
    let naive = 0;
    for (const v of [1, 1e100, 1, -1e100]) naive += v;
    expect(naive).toBe(0); // proves the case is a real one
  });
  it("sums 35,040 quarter-hour readings of 0.1 exactly to 3504 (hand-computed)", () => {
    const v = new Float64Array(35040).fill(0.1);
    expect(compensatedSum(v)).toBe(3504);
  });
  it("mean of 1..4 is 2.5 and rejects empty input", () => {
    expect(mean([1, 2, 3, 4])).toBe(2.5);
    expect(() => mean([])).toThrow(ModelInputError);
  });
});

describe("ASHRAE Guideline 14 statistics", () => {
  // Worked check from the project's references (computed from the Guideline 14 definitions):
  // y = [100,110,120,130], ŷ = [102,108,121,127], p = 2 → CV(RMSE) 2.6087 %, NMBE +0.8696 %.
  const y = [100, 110, 120, 130];
  const yHat = [102, 108, 121, 127];
  it("CV(RMSE) divides by n − p (Guideline 14 worked check)", () => {
    // SSE = 4+4+1+9 = 18; sqrt(18/2) = 3; ȳ = 115 → 300/115 = 2.608695…
    expect(cvRmsePct(y, yHat, 2)).toBeCloseTo(2.6087, 4);
    expect(cvRmsePct(y, yHat, 2)).toBeCloseTo(300 / 115, 12);
  });
  it("NMBE is positive when the model under-predicts (Guideline 14 worked check)", () => {
    // Σ(y − ŷ) = −2+2−1+3 = 2 → 100·2/(2·115) = 0.869565…
    expect(nmbePct(y, yHat, 2)).toBeCloseTo(0.8696, 4);
    expect(nmbePct([10, 10], [9, 9], 0)).toBeGreaterThan(0);
  });
  it("R² = 1 − SSE/SST (hand-computed: SST = 500 → 1 − 18/500 = 0.964)", () => {
    expect(rSquared(y, yHat)).toBeCloseTo(0.964, 12);
    expect(Number.isNaN(rSquared([5, 5, 5], [5, 5, 5]))).toBe(true);
  });
  it("limits are the Guideline 14 calibration limits (read)", () => {
    expect(GUIDELINE14_LIMITS.monthly).toEqual({ cvRmsePct: 15, nmbeAbsPct: 5 });
    expect(GUIDELINE14_LIMITS.hourly).toEqual({ cvRmsePct: 30, nmbeAbsPct: 10 });
    const s = guideline14Stats(y, yHat, 2, "monthly");
    expect(s.passes).toBe(true);
    expect(s.rmse).toBeCloseTo(3, 12);
    expect(guideline14Stats([100, 100, 100, 100], [70, 130, 70, 130], 2, "monthly").passes).toBe(false);
  });
  it("rejects n ≤ p, mismatched lengths and zero mean", () => {
    expect(() => cvRmsePct([1, 2], [1, 2], 2)).toThrow(ModelInputError);
    expect(() => nmbePct([1, 2, 3], [1, 2], 1)).toThrow(ModelInputError);
    expect(() => cvRmsePct([1, -1, 0], [0, 0, 0], 1)).toThrow(/mean/);
  });
});
