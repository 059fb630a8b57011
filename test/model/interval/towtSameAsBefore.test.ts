/**
 * TOWT's fit and prediction closures became classes, its input one object shape, and its
 * callbacks loops (issue 17: V8 kept recompiling the closures made per fit). None of that may
 * move a bit: on random rows, weights and options, the current fitTowt gives exactly the
 * coefficients, standard errors, occupancy, knots and predictions of the code before it
 * (test/model/interval/former/towt.ts, a verbatim copy of commit 3dfa24c). Tolerance: none
 * (Object.is on every number).
 */
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { fitTowt, type TowtModel, type TowtOptions } from "../../../src/model/interval/towt.ts";
import { fitTowt as formerFitTowt } from "./former/towt.ts";
import { selectFrameRows } from "../../../src/model/interval/hourlyFrame.ts";
import { mulberry32 } from "../../../src/core/random.ts";
import { schoolYear } from "./syntheticSchool.ts";

function sameNumbers(a: ArrayLike<number>, b: ArrayLike<number>): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (!Object.is(a[i], b[i])) return false;
  return true;
}

function sameModel(a: TowtModel, b: TowtModel): void {
  expect(a.parameterCount).toBe(b.parameterCount);
  expect(a.columnNames).toEqual(b.columnNames);
  expect(sameNumbers(a.occupied, b.occupied)).toBe(true);
  expect(sameNumbers(a.knotsOccupiedC, b.knotsOccupiedC)).toBe(true);
  expect(sameNumbers(a.knotsUnoccupiedC, b.knotsUnoccupiedC)).toBe(true);
  expect(sameNumbers(a.coefficients, b.coefficients)).toBe(true);
  expect(sameNumbers(a.standardErrors, b.standardErrors)).toBe(true);
  expect(Object.is(a.residualStdError, b.residualStdError)).toBe(true);
}

const year = schoolYear(2021, 5);

describe("fitTowt gives the former code's numbers bit for bit", () => {
  it("on random slices of a school year, with and without weights, both solvers, odd options", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 300 }),
        fc.integer({ min: 14, max: 60 }),
        fc.boolean(),
        fc.constantFrom<TowtOptions["solver"]>("within", "full"),
        fc.constantFrom(0.5, 0.65, 0.8),
        fc.constantFrom(5, 20, 200),
        fc.boolean(),
        fc.integer({ min: 1, max: 1000 }),
        (startDay, days, weighted, solver, occupancyThreshold, minPointsPerSegment, holidayTerm, seed) => {
          const rows = Array.from({ length: days * 24 }, (_, i) => startDay * 24 + i).filter((i) => i < year.kwh.length);
          const table = selectFrameRows(year, rows);
          const rand = mulberry32(seed);
          const data = weighted ? { ...table, weights: Float64Array.from(rows, () => (rand() < 0.5 ? 0.5 : 1)) } : table;
          const options: TowtOptions = { solver, occupancyThreshold, minPointsPerSegment, holidayTerm };
          let now: TowtModel | Error;
          let before: TowtModel | Error;
          try {
            now = fitTowt(data, options);
          } catch (e) {
            now = e as Error;
          }
          try {
            before = formerFitTowt(data, options);
          } catch (e) {
            before = e as Error;
          }
          if (now instanceof Error || before instanceof Error) {
            expect(String(now)).toBe(String(before));
            return;
          }
          sameModel(now, before);
          // predictions for other hours, some of them without a temperature, some hours of week unseen
          const other = selectFrameRows(year, Array.from({ length: 24 * 10 }, (_, i) => (i * 37) % year.kwh.length));
          other.tempC[3] = Number.NaN;
          expect(sameNumbers(now.predict(other), before.predict(other))).toBe(true);
          const picked = Int32Array.of(5, 1, 200, 7);
          const outNow = new Float64Array(other.kwh.length);
          const outBefore = new Float64Array(other.kwh.length);
          now.predictRows(other, picked, outNow);
          before.predictRows(other, picked, outBefore);
          expect(sameNumbers(outNow, outBefore)).toBe(true);
        },
      ),
      { numRuns: 40 },
    );
  });

  it("with fixed occupancy and plain arrays as input", () => {
    const rows = Array.from({ length: 24 * 21 }, (_, i) => 2000 + i);
    const t = selectFrameRows(year, rows);
    const data = { hourOfWeek: Array.from(t.hourOfWeek), holiday: Array.from(t.holiday), tempC: Array.from(t.tempC), kwh: Array.from(t.kwh) };
    const occupancy = Array.from({ length: 168 }, (_, h) => (h % 24 >= 8 && h % 24 < 18 ? 1 : 0));
    sameModel(fitTowt(data, { occupancy }), formerFitTowt(data, { occupancy }));
  });
});
