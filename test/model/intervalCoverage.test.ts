import { describe, expect, it } from "vitest";
import { fitChangePoint } from "../../src/model/changePoint.ts";

// Monte Carlo check of the change-point prediction interval on invented data with known
// physics (allowed: a calibration property, not a reference value). Seeded, so repeatable.
function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}
function normal(rand: () => number): number {
  // Box–Muller.
  const u = 1 - rand();
  const v = rand();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
}

describe("prediction interval coverage (3PH with normal noise, breakpoint estimated)", () => {
  it("an 80 % band holds about 80 % of new periods over 400 seeded replications", () => {
    const rand = mulberry32(2003);
    const truth = (t: number): number => 60 + 3 * Math.max(56 - t, 0);
    const sigma = 5;
    const reps = 400;
    let inside = 0;
    for (let r = 0; r < reps; r++) {
      const pts = Array.from({ length: 24 }, () => {
        const t = 20 + 65 * rand();
        return { temp: t, usePerDay: truth(t) + sigma * normal(rand) };
      });
      const fit = fitChangePoint(pts, "3PH");
      const t0 = 20 + 65 * rand();
      const y0 = truth(t0) + sigma * normal(rand);
      const band = fit.predictWithInterval(t0, 0.8);
      if (y0 >= band.lower && y0 <= band.upper) inside++;
    }
    // Binomial sd at p = 0.8, n = 400 is 0.02; ±3 sd gives 0.74…0.86. Estimating the
    // breakpoint makes the band slightly optimistic, which this range still admits.
    const coverage = inside / reps;
    expect(coverage).toBeGreaterThan(0.74);
    expect(coverage).toBeLessThan(0.86);
  });
});
