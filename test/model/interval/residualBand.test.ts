import { describe, expect, it } from "vitest";
import { quantileSorted, residualBand } from "../../../src/model/interval/residualBand.ts";

describe("quantileSorted (Hyndman & Fan type 7, numpy.quantile's default; hand-computed)", () => {
  it("interpolates between order statistics", () => {
    expect(quantileSorted([1, 2, 3, 4], 0.5)).toBe(2.5);
    expect(quantileSorted([1, 2, 3, 4], 0.1)).toBeCloseTo(1.3, 12); // h = 3·0.1 = 0.3
    expect(quantileSorted([1, 2, 3, 4], 1)).toBe(4);
    expect(quantileSorted([7], 0.9)).toBe(7);
  });
});

describe("residualBand", () => {
  it("uses each hour's own residuals when there are enough, the pooled ones otherwise", () => {
    // hour 0: residuals 0…99 (100 values); hour 1: only 5 values → pooled
    const resid = [...Array.from({ length: 100 }, (_, i) => i), 1000, 1000, 1000, 1000, 1000];
    const hod = [...new Array(100).fill(0), 1, 1, 1, 1, 1];
    const b = residualBand(resid, hod, 0.8);
    expect(b.lowerKwh[0]).toBeCloseTo(9.9, 10); // type 7: h = 99·0.1 = 9.9
    expect(b.upperKwh[0]).toBeCloseTo(89.1, 10);
    expect(b.pooledHours).toContain(1);
    expect(b.pooledHours).not.toContain(0);
    expect(b.countByHour[1]).toBe(105);
  });
  it("rejects a level outside (0, 1) and an empty residual set", () => {
    expect(() => residualBand([1], [0], 1)).toThrow(/level/);
    expect(() => residualBand([], [], 0.8)).toThrow(/no residuals/);
  });
});
