/**
 * householderQr now checks rows or columns in helpers of their own and factors in a third, and
 * qrUnscaledCovariance reads R through a module-level function instead of a closure, so that V8
 * keeps one optimized factorization. That must not move a bit: on random matrices given as rows
 * or by column (small integers, doubles, −0, non-finite and huge values, ragged rows, collinear
 * and too few rows), the factorization, the solution, the covariance and the error messages
 * equal those of the code before it (test/core/former/linalg.ts, a verbatim copy of commit
 * 3dfa24c). Tolerance: none (Object.is on every number).
 */
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { sameBits } from "../model/sameBits.ts";
import { householderQr, qrSolve, qrUnscaledCovariance, type ColumnMajorMatrix } from "../../src/core/linalg.ts";
import * as former from "./former/linalg.ts";

function outcome(qr: typeof householderQr, solve: typeof qrSolve, cov: typeof qrUnscaledCovariance, x: number[][] | ColumnMajorMatrix, y: number[], names?: string[]): unknown {
  try {
    const f = qr(x, names);
    return { f, b: solve(f, y), cov: cov(f) };
  } catch (e) {
    return `${(e as Error).name}: ${(e as Error).message}`;
  }
}

const value = fc.oneof(
  { arbitrary: fc.integer({ min: -5, max: 40 }), weight: 4 },
  { arbitrary: fc.double({ min: -100, max: 100, noNaN: true }), weight: 4 },
  { arbitrary: fc.constantFrom(-0, 1e151, Number.NaN, Number.POSITIVE_INFINITY), weight: 1 },
);

describe("householderQr: same as before", () => {
  it("gives the former factorization, solution, covariance and errors on rows and columns", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 8 }),
        fc.integer({ min: 0, max: 4 }),
        fc.array(value, { minLength: 32, maxLength: 32 }),
        fc.array(fc.double({ min: -50, max: 50, noNaN: true }), { minLength: 8, maxLength: 8 }),
        fc.boolean(),
        fc.boolean(),
        fc.boolean(),
        (m, n, cells, ys, byColumn, ragged, collinear) => {
          const rows: number[][] = [];
          for (let i = 0; i < m; i++) {
            const row: number[] = [];
            for (let j = 0; j < n; j++) row.push(cells[(i * 4 + j) % 32]!);
            if (collinear && n >= 2) row[1] = 3 * row[0]!;
            rows.push(row);
          }
          if (ragged && m > 1) rows[m - 1]!.pop();
          let x: number[][] | ColumnMajorMatrix = rows;
          if (byColumn && !ragged) {
            const data = new Float64Array(m * n);
            for (let i = 0; i < m; i++) for (let j = 0; j < n; j++) data[j * m + i] = rows[i]![j]!;
            x = { rows: m, cols: n, data };
          }
          const y = ys.slice(0, m);
          const names = n === 2 ? ["a", "b"] : undefined;
          const now = outcome(householderQr, qrSolve, qrUnscaledCovariance, x, y, names);
          const before = outcome(former.householderQr, former.qrSolve, former.qrUnscaledCovariance, x, y, names);
          if (typeof now === "string" || typeof before === "string") expect(now).toEqual(before);
          else expect(sameBits(now, before)).toBe(true);
        },
      ),
      { numRuns: 3000 },
    );
  });
});
