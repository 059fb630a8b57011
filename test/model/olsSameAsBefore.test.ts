/**
 * fitOls now turns its inputs into one kind before fitting (regressors by column, y and weights
 * as Float64Array), so that V8 keeps one optimized fit instead of recompiling it for every kind
 * of array it meets. That must not move a bit: on random designs given as rows or by column,
 * y as number[] or Float64Array, with and without weights and intercept, including small-integer
 * values, −0, ragged rows, non-finite values, collinear columns and too few rows, fitOls gives
 * exactly the numbers, predictions and error messages of the code before it
 * (test/model/former/ols.ts, a verbatim copy of commit 3dfa24c). Tolerance: none (Object.is).
 */
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { sameBits } from "./sameBits.ts";
import { fitOls } from "../../src/model/ols.ts";
import { fitOls as formerFitOls } from "./former/ols.ts";
import type { ColumnMajorMatrix } from "../../src/core/linalg.ts";

type Outcome = { ok: true; fit: ReturnType<typeof fitOls>; predictions: number[]; intervals: unknown[] } | { ok: false; message: string };

function outcome(fit: () => ReturnType<typeof fitOls>, probes: number[][]): Outcome {
  let f: ReturnType<typeof fitOls>;
  try {
    f = fit();
  } catch (e) {
    return { ok: false, message: `${(e as Error).name}: ${(e as Error).message}` };
  }
  const predictions: number[] = [];
  const intervals: unknown[] = [];
  for (const p of probes) {
    try {
      predictions.push(f.predict(p));
      intervals.push(f.predictWithInterval(p, 0.9, 2));
    } catch (e) {
      intervals.push((e as Error).message);
    }
  }
  return { ok: true, fit: f, predictions, intervals };
}

const value = fc.oneof(
  fc.integer({ min: -5, max: 40 }),
  fc.double({ min: -100, max: 100, noNaN: true }),
  fc.constantFrom(-0, 0, 1e151, Number.NaN),
);

const cases = fc.record({
  n: fc.oneof({ arbitrary: fc.integer({ min: 0, max: 4 }), weight: 1 }, { arbitrary: fc.integer({ min: 5, max: 9 }), weight: 4 }),
  cols: fc.integer({ min: 0, max: 3 }),
  cells: fc.array(value, { minLength: 30, maxLength: 30 }),
  ys: fc.array(fc.oneof(fc.integer({ min: 0, max: 50 }), fc.double({ min: -50, max: 50, noNaN: true })), { minLength: 10, maxLength: 10 }),
  ws: fc.array(fc.oneof({ arbitrary: fc.integer({ min: 1, max: 31 }), weight: 10 }, { arbitrary: fc.double({ min: 0.1, max: 40, noNaN: true }), weight: 10 }, { arbitrary: fc.constant(0), weight: 1 }), { minLength: 10, maxLength: 10 }),
  cleanRows: fc.oneof({ arbitrary: fc.constant(true), weight: 4 }, { arbitrary: fc.constant(false), weight: 1 }),
  ragged: fc.oneof({ arbitrary: fc.constant(false), weight: 4 }, { arbitrary: fc.constant(true), weight: 1 }),
  collinear: fc.boolean(),
  weighted: fc.boolean(),
  intercept: fc.boolean(),
  typedY: fc.boolean(),
  byColumn: fc.boolean(),
});

describe("fitOls: same as before", () => {
  it("gives the former numbers and errors on rows, columns, typed and plain arrays", () => {
    fc.assert(
      fc.property(cases, (c) => {
        const rows: number[][] = [];
        for (let i = 0; i < c.n; i++) {
          const row: number[] = [];
          for (let j = 0; j < c.cols; j++) {
            const v = c.cells[(i * 3 + j) % 30]!;
            row.push(c.cleanRows && !Number.isFinite(v) ? i + j : c.cleanRows && Math.abs(v) > 1e150 ? j : v);
          }
          if (c.collinear && c.cols >= 2) row[1] = 2 * row[0]!;
          rows.push(row);
        }
        if (c.ragged && rows.length > 2) rows[rows.length - 2]!.push(1);
        const y = c.ys.slice(0, c.n);
        const weights = c.weighted ? c.ws.slice(0, c.n) : undefined;
        const yIn = c.typedY ? Float64Array.from(y) : y;
        const options = { intercept: c.intercept, weights, columnNames: c.cols === 2 ? ["a", "b"] : undefined };
        let x: number[][] | ColumnMajorMatrix = rows;
        if (c.byColumn && !c.ragged) {
          const data = new Float64Array(c.n * c.cols);
          for (let i = 0; i < c.n; i++) for (let j = 0; j < c.cols; j++) data[j * c.n + i] = rows[i]![j]!;
          x = { rows: c.n, cols: c.cols, data };
        }
        const probes = [rows[0] ?? [], new Array<number>(c.cols).fill(3), [1]];
        const now = outcome(() => fitOls(x, yIn, options), probes);
        const before = outcome(() => formerFitOls(x, yIn, options), probes);
        expect(now.ok).toBe(before.ok);
        if (!now.ok || !before.ok) expect(now).toEqual(before);
        else expect(sameBits(now, before)).toBe(true);
      }),
      { numRuns: 3000 },
    );
  });
});
