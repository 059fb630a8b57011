/**
 * CPU work on the trees (issue 17: gradients worked out as the leaves are added, the left
 * child's gradient sum added while partitioning, a node's sum taken from its histogram pass,
 * the root's counts copied from the first tree, histograms subtracted over used bins only) must not
 * move a single bit: on random data and options, the current fitGbdt gives exactly the trees,
 * fitted values, losses and predictions of the code before it (test/model/interval/former/gbdt.ts,
 * a verbatim copy of commit daa4bc8). Tolerance: none (Object.is on every number).
 */
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { fitGbdt, type GbdtModel, type GbdtOptions } from "../../../src/model/interval/gbdt.ts";
import { fitGbdt as formerFitGbdt } from "./former/gbdt.ts";
import { mulberry32 } from "../../../src/core/random.ts";

function sameNumbers(a: ArrayLike<number>, b: ArrayLike<number>): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (!Object.is(a[i], b[i])) return false;
  return true;
}

function sameModel(a: GbdtModel, b: GbdtModel, cols: Float64Array[]): void {
  expect(a.bestIteration).toBe(b.bestIteration);
  expect(a.trees.length).toBe(b.trees.length);
  expect(Object.is(a.baseScore, b.baseScore)).toBe(true);
  a.trees.forEach((t, k) => {
    const u = b.trees[k]!;
    for (const key of ["feature", "threshold", "left", "right", "value", "splitBin"] as const) expect(sameNumbers(t[key], u[key])).toBe(true);
  });
  expect(sameNumbers(a.trainLoss, b.trainLoss)).toBe(true);
  expect(a.validationLoss === null).toBe(b.validationLoss === null);
  if (a.validationLoss && b.validationLoss) expect(sameNumbers(a.validationLoss, b.validationLoss)).toBe(true);
  expect(sameNumbers(a.fitted, b.fitted)).toBe(true);
  expect(sameNumbers(a.predict(cols), b.predict(cols))).toBe(true);
}

/** Columns with ties, a few NaNs, and a target with signal and noise (seeded). */
function data(seed: number, n: number, f: number, distinct: number): { cols: Float64Array[]; y: Float64Array } {
  const rand = mulberry32(seed);
  const cols = Array.from({ length: f }, (_, j) =>
    Float64Array.from({ length: n }, () => {
      if (j === f - 1 && rand() < 0.02) return Number.NaN;
      return distinct > 0 ? Math.floor(rand() * distinct) : rand() * 40 - 10;
    }),
  );
  const finite = (v: number): number => (Number.isFinite(v) ? v : 0);
  const y = Float64Array.from({ length: n }, (_, i) => Math.sin(finite(cols[0]![i]!)) * 5 + (finite(cols[1 % f]![i]!) > 3 ? 2 : -1) + (rand() - 0.5) * 3);
  return { cols, y };
}

describe("fitGbdt gives the former code's numbers bit for bit", () => {
  it("on random data, features, bins, depths, subsampling and early stopping", () => {
    fc.assert(
      fc.property(
        fc.record({
          seed: fc.integer({ min: 1, max: 1 << 30 }),
          n: fc.integer({ min: 30, max: 700 }),
          f: fc.constantFrom(1, 3, 10, 11),
          distinct: fc.constantFrom(0, 5, 40),
          nTrees: fc.integer({ min: 1, max: 40 }),
          maxDepth: fc.integer({ min: 1, max: 7 }),
          minSamplesLeaf: fc.integer({ min: 1, max: 30 }),
          maxBins: fc.constantFrom(2, 16, 64, 255),
          l2Leaf: fc.constantFrom(0, 1, 10),
          subsample: fc.constantFrom(1, 0.6),
          learningRate: fc.constantFrom(0.1, 0.3, 1),
          stop: fc.constantFrom("none", "refit", "no-refit"),
        }),
        (r) => {
          const { cols, y } = data(r.seed, r.n, r.f, r.distinct);
          const options: GbdtOptions = {
            nTrees: r.nTrees,
            maxDepth: r.maxDepth,
            minSamplesLeaf: r.minSamplesLeaf,
            maxBins: r.maxBins,
            l2Leaf: r.l2Leaf,
            subsample: r.subsample,
            learningRate: r.learningRate,
            seed: r.seed,
            ...(r.stop === "none" ? {} : { earlyStopping: { validationRows: Math.floor(r.n / 5), patience: 3, refit: r.stop === "refit" } }),
          };
          sameModel(fitGbdt(cols, y, options), formerFitGbdt(cols, y, options), cols);
        },
      ),
      { numRuns: 150, seed: 17 },
    );
  });

  it("on a year of hourly-sized rows with the hourly model's settings (10 features, 64 bins, depth 6)", () => {
    const { cols, y } = data(3, 8760, 10, 0);
    const options: GbdtOptions = { nTrees: 60, earlyStopping: { validationRows: 336, patience: 20, refit: false } };
    sameModel(fitGbdt(cols, y, options), formerFitGbdt(cols, y, options), cols);
  });
});
