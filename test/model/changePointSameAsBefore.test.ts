/**
 * CPU work on the change-point search (issue 17: a breakpoint the search meets again, such as an
 * interval's upper knot that is the next interval's lower knot, is solved once; each design's QR
 * starts from the kept state after its constant column, and after its second column when that
 * column was seen before) must not move a
 * single bit: on random bills (repeated temperatures, ±0, flat and V-shaped use, with and without
 * day weights), fitChangePoint and selectChangePointModel give exactly the breakpoints,
 * coefficients, statistics and choices of the code before it (test/model/former/changePoint.ts,
 * a verbatim copy of commit 1e71146). Tolerance: none (Object.is on every number).
 */
import { describe, expect, it } from "vitest";
import { sameBits as same } from "./sameBits.ts";
import fc from "fast-check";
import { fitChangePoint, selectChangePointModel, type ChangePointKind, type ChangePointPoint } from "../../src/model/changePoint.ts";
import { fitChangePoint as formerFitChangePoint, selectChangePointModel as formerSelect } from "./former/changePoint.ts";
import { mulberry32 } from "../../src/core/random.ts";

/** Bills of a seasonal climate: use = base + heating below 12° + cooling above 20° + noise; temperatures rounded to `step` (ties). */
function points(seed: number, n: number, heat: number, cool: number, noise: number, step: number, zeros: boolean): ChangePointPoint[] {
  const rand = mulberry32(seed);
  return Array.from({ length: n }, (_, m) => {
    let temp = 12 - 14 * Math.cos((2 * Math.PI * (m + 0.5)) / 12) + (rand() - 0.5) * 6;
    temp = step > 0 ? Math.round(temp / step) * step : temp;
    if (zeros && m % 5 === 0) temp = m % 10 === 0 ? -0 : 0;
    const usePerDay = Math.max(0, 100 + heat * Math.max(0, 12 - temp) + cool * Math.max(0, temp - 20) + (rand() - 0.5) * noise);
    return { temp, usePerDay, days: 28 + Math.floor(rand() * 6) };
  });
}

/** The result, or the error's message (both versions must fail alike). */
function outcome<T>(f: () => T): T | string {
  try {
    return f();
  } catch (error) {
    return String(error);
  }
}

const KINDS: readonly ChangePointKind[] = ["3PC", "3PH", "4P", "5P"];

describe("change-point search gives the former code's numbers bit for bit", () => {
  it("every searched form and the selection, on random bills", () => {
    fc.assert(
      fc.property(
        fc.record({
          seed: fc.integer({ min: 1, max: 1 << 30 }),
          n: fc.integer({ min: 5, max: 48 }),
          heat: fc.constantFrom(0, 3, 20),
          cool: fc.constantFrom(0, 5, 30),
          noise: fc.constantFrom(0, 5, 40),
          step: fc.constantFrom(0, 0.5, 2),
          zeros: fc.boolean(),
          weightByDays: fc.boolean(),
        }),
        (r) => {
          const pts = points(r.seed, r.n, r.heat, r.cool, r.noise, r.step, r.zeros);
          const options = { weightByDays: r.weightByDays };
          for (const kind of KINDS) {
            expect(same(outcome(() => fitChangePoint(pts, kind, options)), outcome(() => formerFitChangePoint(pts, kind, options)))).toBe(true);
          }
          expect(same(outcome(() => selectChangePointModel(pts, options)), outcome(() => formerSelect(pts, options)))).toBe(true);
        },
      ),
      { numRuns: 60, seed: 17 },
    );
  });
});
