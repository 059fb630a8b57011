/**
 * Histogram-based gradient-boosted regression trees with squared-error (L2) loss
 * (Friedman 2001, "Greedy function approximation: a gradient boosting machine"; the
 * histogram split search of histogram gradient boosting, Ke et al. 2017). Each tree is grown depth-first on the
 * negative gradients (residuals), leaves take the mean residual, shrunk by the learning rate.
 *
 * Options: shrinkage, maximum depth, minimum rows per leaf, ≤ 255 quantile bins per feature,
 * seeded row subsampling, early stopping on a trailing validation block (time order).
 */
import { ModelInputError } from "../errors.ts";
import { binColumn, binCuts } from "./gbdtBins.ts";
import type { FeatureBins } from "./gbdtBins.ts";
import { mulberry32 } from "../../core/random.ts";

export interface GbdtOptions {
  /** Number of boosting rounds (trees). Default 200. */
  nTrees?: number;
  /** Shrinkage applied to each tree's leaf values, in (0, 1]. Default 0.1. */
  learningRate?: number;
  /** Maximum tree depth (root = depth 0). Default 6. */
  maxDepth?: number;
  /** Minimum training rows in a leaf. Default 20. */
  minSamplesLeaf?: number;
  /** Bins per feature (2 … 255). Default 64. */
  maxBins?: number;
  /** L2 penalty on leaf values (λ in G²/(n + λ)). Default 0. */
  l2Leaf?: number;
  /** Fraction of rows drawn (without replacement) for each tree. Default 1 (no subsampling). */
  subsample?: number;
  /** Seed of the subsampling generator. Default 1. */
  seed?: number;
  /**
   * Early stopping: the last `validationRows` rows (the latest in time when rows are in time
   * order) are held out; boosting stops when their loss has not improved for `patience`
   * rounds, and the model keeps the best round. With `refit` (default true) the model is then
   * refitted on all rows with that many trees.
   */
  earlyStopping?: { validationRows: number; patience?: number; refit?: boolean };
}

/** One tree in flat arrays; node 0 is the root; feature −1 marks a leaf. */
export interface GbdtTree {
  feature: Int16Array;
  /** Go left when x ≤ threshold (NaN goes right). */
  threshold: Float64Array;
  left: Int32Array;
  right: Int32Array;
  /** Leaf output, already multiplied by the learning rate. */
  value: Float64Array;
  /** Bin index of each split (the threshold is that bin's upper cut). */
  splitBin: Int16Array;
}

export interface GbdtModel {
  baseScore: number;
  trees: GbdtTree[];
  featureCount: number;
  /** Training mean squared error after each round (before any refit: of the rows trained on). */
  trainLoss: number[];
  /** Validation mean squared error after each round, when early stopping was used. */
  validationLoss: number[] | null;
  /** Number of trees kept. */
  bestIteration: number;
  /**
   * Predictions of the kept trees for every row given to the fit (held-out rows included),
   * computed from the bins: the same numbers `predict` gives for those rows.
   */
  fitted: Float64Array;
  /** Predict for feature columns (same order as in training). */
  predict(columns: readonly ArrayLike<number>[]): Float64Array;
}

function resolve(o: GbdtOptions): Required<Omit<GbdtOptions, "earlyStopping">> {
  const r = {
    nTrees: o.nTrees ?? 200,
    learningRate: o.learningRate ?? 0.1,
    maxDepth: o.maxDepth ?? 6,
    minSamplesLeaf: o.minSamplesLeaf ?? 20,
    maxBins: o.maxBins ?? 64,
    l2Leaf: o.l2Leaf ?? 0,
    subsample: o.subsample ?? 1,
    seed: o.seed ?? 1,
  };
  if (!(Number.isInteger(r.nTrees) && r.nTrees >= 1)) throw new ModelInputError(`nTrees must be a positive integer, got ${r.nTrees}`);
  if (!(r.learningRate > 0 && r.learningRate <= 1)) throw new ModelInputError(`learningRate must be in (0, 1], got ${r.learningRate}`);
  if (!(Number.isInteger(r.maxDepth) && r.maxDepth >= 1 && r.maxDepth <= 16)) throw new ModelInputError(`maxDepth must be an integer in 1 … 16, got ${r.maxDepth}`);
  if (!(Number.isInteger(r.minSamplesLeaf) && r.minSamplesLeaf >= 1)) throw new ModelInputError(`minSamplesLeaf must be a positive integer, got ${r.minSamplesLeaf}`);
  if (!(r.l2Leaf >= 0)) throw new ModelInputError(`l2Leaf must be ≥ 0, got ${r.l2Leaf}`);
  if (!(r.subsample > 0 && r.subsample <= 1)) throw new ModelInputError(`subsample must be in (0, 1], got ${r.subsample}`);
  return r;
}

/**
 * Fit gradient-boosted trees to y from feature columns.
 * @param columns one array per feature, each of y's length (finite values expected; NaN goes right).
 * @param cache binned columns kept between fits on these same columns (e.g. a second target).
 * @throws ModelInputError on bad options, ragged columns, non-finite y, or no rows.
 * @example fitGbdt([x], y, { nTrees: 100 }).predict([x])
 */
export function fitGbdt(columns: readonly ArrayLike<number>[], y: ArrayLike<number>, options: GbdtOptions = {}, cache?: GbdtBinCache): GbdtModel {
  const o = resolve(options);
  const n = y.length;
  if (n === 0) throw new ModelInputError("gradient boosting needs at least one row");
  if (columns.length === 0) throw new ModelInputError("gradient boosting needs at least one feature");
  for (const [j, c] of columns.entries()) if (c.length !== n) throw new ModelInputError(`feature ${j} has ${c.length} rows, y has ${n}`);
  for (let i = 0; i < n; i++) if (!Number.isFinite(y[i]!)) throw new ModelInputError(`y[${i}] is not a finite number`);

  const es = options.earlyStopping;
  if (!es) return boost(columns, y, n, o, null, o.nTrees, cache);
  const nVal = es.validationRows;
  if (!(Number.isInteger(nVal) && nVal >= 1 && nVal < n)) throw new ModelInputError(`validationRows must be an integer in 1 … ${n - 1}, got ${nVal}`);
  const nTrain = n - nVal;
  const first = boost(columns, y, nTrain, o, { patience: es.patience ?? 20 }, o.nTrees, cache);
  if (es.refit === false) return first;
  const refit = boost(columns, y, n, o, null, first.bestIteration, cache);
  return { ...refit, validationLoss: first.validationLoss };
}

/**
 * Feature columns cut into bins for boosting: the bins come from the first `nTrain` rows (the
 * rows trained on), every row is binned. It depends on the columns only, not on the target, so
 * fits of different targets on the same columns share it (see {@link GbdtBinCache}).
 */
export interface GbdtBinnedColumns {
  nTrain: number;
  maxBins: number;
  bins: FeatureBins[];
  /** Column-major bins (one array per feature). */
  binned: Uint8Array[];
  /**
   * Row-major histogram offsets: entry i·f + j is where row i's bin of feature j sits in an
   * interleaved histogram (2·(j·(maxBins + 1) + bin)), so the histogram pass reads one row's
   * entries side by side and does no index arithmetic.
   */
  rowOffsets: Int32Array;
}

/**
 * Binned columns of one set of feature columns, by training-window length and bin count. Pass
 * the same cache only with the same columns (same values, same order).
 */
export type GbdtBinCache = Map<string, GbdtBinnedColumns>;

/**
 * Bin feature columns for boosting on their first `nTrain` rows.
 * @example binFeatureColumns([x], x.length, 64).binned[0]
 */
export function binFeatureColumns(columns: readonly ArrayLike<number>[], nTrain: number, maxBins: number): GbdtBinnedColumns {
  const n = columns[0]?.length ?? 0;
  const f = columns.length;
  // loops rather than map callbacks, which V8 would recompile (with binCuts inlined) at each call
  const bins: FeatureBins[] = [];
  const binned: Uint8Array[] = [];
  for (let j = 0; j < f; j++) bins.push(binCuts(columns[j]!, maxBins, nTrain));
  for (let j = 0; j < f; j++) binned.push(binColumn(bins[j]!, columns[j]!));
  const rowOffsets = histogramOffsets(binned, n, 2 * (maxBins + 1));
  return { nTrain, maxBins, bins, binned, rowOffsets };
}

/** Row-major histogram offsets of binned columns (see GbdtBinnedColumns; a function of its own for V8's optimizer). */
function histogramOffsets(binned: Uint8Array[], n: number, nb2: number): Int32Array {
  const f = binned.length;
  const rowOffsets = new Int32Array(n * f);
  for (let j = 0; j < f; j++) {
    const col = binned[j]!;
    for (let i = 0; i < n; i++) rowOffsets[i * f + j] = j * nb2 + 2 * col[i]!;
  }
  return rowOffsets;
}

function binnedFor(columns: readonly ArrayLike<number>[], nTrain: number, maxBins: number, cache: GbdtBinCache | undefined): GbdtBinnedColumns {
  const key = `${nTrain}/${maxBins}`;
  const hit = cache?.get(key);
  if (hit) return hit;
  const out = binFeatureColumns(columns, nTrain, maxBins);
  cache?.set(key, out);
  return out;
}

/** Boost on rows 0 … nTrain − 1; with `stop`, rows nTrain … end are the validation block. */
function boost(
  columns: readonly ArrayLike<number>[],
  y: ArrayLike<number>,
  nTrain: number,
  o: ReturnType<typeof resolve>,
  stop: { patience: number } | null,
  nTrees: number,
  cache: GbdtBinCache | undefined,
): GbdtModel {
  const n = y.length;
  const f = columns.length;
  const { bins, binned, rowOffsets } = binnedFor(columns, nTrain, o.maxBins, cache);
  const nb = o.maxBins + 1; // NaN bin included
  let base = sumOf(y, nTrain);
  base /= nTrain;
  const pred = new Float64Array(n).fill(base);
  const grad = new Float64Array(nTrain);
  const trees: GbdtTree[] = [];
  const trainLoss: number[] = [];
  const validationLoss: number[] | null = stop ? [] : null;
  let best = 0;
  let bestLoss = Number.POSITIVE_INFINITY;
  // predictions of the best round so far (early stopping keeps that round's trees)
  const bestPred = stop ? new Float64Array(n) : null;
  const rand = mulberry32(o.seed);
  const all = new Int32Array(nTrain);
  for (let i = 0; i < nTrain; i++) all[i] = i;
  const sampleSize = Math.max(1, Math.round(o.subsample * nTrain));
  const rows = new Int32Array(nTrain);
  const work = new TreeWork(f, nb, o.maxDepth);
  work.sameRootRows = sampleSize >= nTrain;

  // negative gradient of ½(y − ŷ)²; after the first round it is worked out in the loss loop
  // (each phase of a round is a small function of its own: V8 optimizes each with complete
  // feedback, instead of optimizing boost in its first loop and discarding it at the later ones)
  residualsInto(grad, y, pred, nTrain);
  for (let t = 0; t < nTrees; t++) {
    let sample: Int32Array;
    if (sampleSize < nTrain) {
      drawSample(rows, all, sampleSize, nTrain, rand);
      sample = rows.subarray(0, sampleSize);
    } else {
      rows.set(all);
      sample = rows;
    }
    const tree = growTree(sample, grad, rowOffsets, binned, bins, o, nb, work);
    trees.push(tree);
    // the next round's gradients: y − ŷ after this round
    if (sampleSize < nTrain) {
      addTreeToRows(pred, tree, binned, 0, n);
      residualsInto(grad, y, pred, nTrain);
    } else {
      addLeafValues(tree, work, rows, y, pred, grad);
      addTreeToRows(pred, tree, binned, nTrain, n);
    }
    // the loss after this round, added in row order
    trainLoss.push(sumOfSquares(grad, nTrain) / nTrain);
    if (stop && validationLoss) {
      let v = validationSse(y, pred, nTrain, n);
      v /= n - nTrain;
      validationLoss.push(v);
      if (v < bestLoss) {
        bestLoss = v;
        best = t + 1;
        bestPred!.set(pred);
      } else if (t + 1 - best >= stop.patience) break;
    }
  }
  const kept = stop ? trees.slice(0, Math.max(best, 1)) : trees;
  // best = 0 only if no round improved on +∞ (a NaN loss): keep the first tree's predictions
  let fitted: Float64Array = stop && best > 0 ? bestPred! : pred;
  if (stop && best === 0) fitted = predictTrees(base, kept, columns, f);
  return {
    fitted,
    baseScore: base,
    trees: kept,
    featureCount: f,
    trainLoss,
    validationLoss,
    bestIteration: kept.length,
    predict: (cols) => predictTrees(base, kept, cols, f),
  };
}

/** y[0] + … + y[n − 1], in order. */
function sumOf(y: ArrayLike<number>, n: number): number {
  let s = 0;
  for (let i = 0; i < n; i++) s += y[i]!;
  return s;
}

/** grad[i] = y[i] − pred[i] for rows 0 … n − 1. */
function residualsInto(grad: Float64Array, y: ArrayLike<number>, pred: Float64Array, n: number): void {
  for (let i = 0; i < n; i++) grad[i] = y[i]! - pred[i]!;
}

/** Partial Fisher–Yates: the first sampleSize entries of rows (reset to `all`) become a uniform sample. */
function drawSample(rows: Int32Array, all: Int32Array, sampleSize: number, nTrain: number, rand: () => number): void {
  rows.set(all);
  for (let i = 0; i < sampleSize; i++) {
    const j = i + Math.floor(rand() * (nTrain - i));
    const tmp = rows[i]!;
    rows[i] = rows[j]!;
    rows[j] = tmp;
  }
}

/** The tree's value added to pred[i] for rows start … end − 1, walking the tree by bins. */
function addTreeToRows(pred: Float64Array, tree: GbdtTree, binned: Uint8Array[], start: number, end: number): void {
  for (let i = start; i < end; i++) pred[i]! += leafValueBinned(tree, binned, i);
}

/**
 * Every training row sits in exactly one leaf's range of `rows`: add that leaf's value (the
 * same number walking the tree would find) and set the row's next gradient.
 */
function addLeafValues(tree: GbdtTree, work: TreeWork, rows: Int32Array, y: ArrayLike<number>, pred: Float64Array, grad: Float64Array): void {
  for (let k = 0; k < work.leafCount; k++) {
    const v = tree.value[work.leafNode[k]!]!;
    for (let r = work.leafStart[k]!, e = work.leafEnd[k]!; r < e; r++) {
      const i = rows[r]!;
      const p = pred[i]! + v;
      pred[i] = p;
      grad[i] = y[i]! - p;
    }
  }
}

/** Σ g[i]² over rows 0 … n − 1, in order. */
function sumOfSquares(g: Float64Array, n: number): number {
  let sse = 0;
  for (let i = 0; i < n; i++) sse += g[i]! ** 2;
  return sse;
}

/** Σ (y[i] − pred[i])² over rows start … end − 1, in order. */
function validationSse(y: ArrayLike<number>, pred: Float64Array, start: number, end: number): number {
  let v = 0;
  for (let i = start; i < end; i++) v += (y[i]! - pred[i]!) ** 2;
  return v;
}

/**
 * Scratch space of one boosting run, reused by every tree: a pool of histograms (one per depth
 * is enough for a depth-first walk that keeps at most one pending histogram per level, plus
 * one) and the leaves of the last tree with their ranges of the row array.
 */
class TreeWork {
  /** Interleaved histograms: [gradient sum, row count] per (feature, bin). */
  private readonly pool: Float64Array[];
  readonly size: number;
  leafCount = 0;
  /**
   * Row counts per (feature, bin) of the root, when every tree's root holds the same rows (no
   * subsampling): set by the first tree, then copied into each root histogram instead of counted.
   */
  rootCounts: Float64Array | null = null;
  sameRootRows = false;
  /** Bin of the split found by findBestSplit. */
  bestBin = -1;
  /** [0]: gradient sum of the left part found by partitionRows (a typed array: a double field would change the object's map). */
  readonly gLeft = new Float64Array(1);
  leafNode: Int32Array;
  leafStart: Int32Array;
  leafEnd: Int32Array;
  constructor(f: number, nb: number, maxDepth: number) {
    this.size = 2 * f * nb;
    // created holding a histogram (the first take() needs one anyway), so the array holds objects
    // from the start and V8 never sees its element kind change
    this.pool = [new Float64Array(this.size)];
    const maxLeaves = 2 ** maxDepth;
    this.leafNode = new Int32Array(maxLeaves);
    this.leafStart = new Int32Array(maxLeaves);
    this.leafEnd = new Int32Array(maxLeaves);
  }
  take(): Float64Array {
    return this.pool.pop() ?? new Float64Array(this.size);
  }
  give(h: Float64Array): void {
    this.pool.push(h);
  }
  addLeaf(node: number, start: number, end: number): void {
    this.leafNode[this.leafCount] = node;
    this.leafStart[this.leafCount] = start;
    this.leafEnd[this.leafCount] = end;
    this.leafCount++;
  }
}

interface NodeTask {
  node: number;
  start: number;
  end: number;
  depth: number;
  /** Interleaved gradient sums and counts per (feature, bin), when already known (histogram subtraction). */
  hist: Float64Array | null;
  /** Σ gradient over the node's rows in row order, when already summed with its histogram. */
  gSum: number | null;
}

/**
 * The root's histogram: as {@link buildHistogram} over every row, but when each tree's root
 * holds the same rows the counts are those of the first tree's root, copied instead of counted
 * again (integers, so the same numbers). Returns the rows' gradient sum.
 */
function rootHistogram(h: Float64Array, rows: Int32Array, grad: Float64Array, offs: Int32Array, f: number, work: TreeWork): number {
  if (!work.sameRootRows || !work.rootCounts) {
    const gSum = buildHistogram(h, rows, 0, rows.length, grad, offs, f);
    if (work.sameRootRows) work.rootCounts = h.slice();
    return gSum;
  }
  const counts = work.rootCounts;
  const gSum = f === 10 ? gradientHistogram10(h, rows, rows.length, grad, offs) : gradientHistogram(h, rows, rows.length, grad, offs, f);
  for (let b = 1; b < h.length; b += 2) h[b] = counts[b]!;
  return gSum;
}

/** Gradient sums only (counts left 0) of rows[0, end), in row order, as buildHistogram adds them. */
function gradientHistogram(h: Float64Array, rows: Int32Array, end: number, grad: Float64Array, offs: Int32Array, f: number): number {
  h.fill(0);
  let gSum = 0;
  for (let r = 0; r < end; r++) {
    const i = rows[r]!;
    const g = grad[i]!;
    gSum += g;
    for (let p = i * f, e = p + f; p < e; p++) h[offs[p]!]! += g;
  }
  return gSum;
}

/** {@link gradientHistogram} for ten features, written out (see buildHistogram10). */
function gradientHistogram10(h: Float64Array, rows: Int32Array, end: number, grad: Float64Array, offs: Int32Array): number {
  h.fill(0);
  let gSum = 0;
  for (let r = 0; r < end; r++) {
    const i = rows[r]!;
    const g = grad[i]!;
    gSum += g;
    const p = i * 10;
    h[offs[p]!]! += g;
    h[offs[p + 1]!]! += g;
    h[offs[p + 2]!]! += g;
    h[offs[p + 3]!]! += g;
    h[offs[p + 4]!]! += g;
    h[offs[p + 5]!]! += g;
    h[offs[p + 6]!]! += g;
    h[offs[p + 7]!]! += g;
    h[offs[p + 8]!]! += g;
    h[offs[p + 9]!]! += g;
  }
  return gSum;
}

/**
 * Histogram of rows[start, end) into `h` (zeroed here); returns the rows' gradient sum. Each
 * bin's gradients, and the sum, are added in row order, so the numbers do not depend on how
 * the loop is written.
 */
function buildHistogram(h: Float64Array, rows: Int32Array, start: number, end: number, grad: Float64Array, offs: Int32Array, f: number): number {
  if (f === 10) return buildHistogram10(h, rows, start, end, grad, offs);
  h.fill(0);
  let gSum = 0;
  for (let r = start; r < end; r++) {
    const i = rows[r]!;
    const g = grad[i]!;
    gSum += g;
    for (let p = i * f, e = p + f; p < e; p++) {
      const b = offs[p]!;
      h[b]! += g;
      h[b + 1]!++;
    }
  }
  return gSum;
}

/**
 * {@link buildHistogram} for ten features (the single-meter hourly model), written out: V8
 * runs the loop without an inner loop 2–3 times faster (measured on this machine kind).
 */
function buildHistogram10(h: Float64Array, rows: Int32Array, start: number, end: number, grad: Float64Array, offs: Int32Array): number {
  h.fill(0);
  let gSum = 0;
  for (let r = start; r < end; r++) {
    const i = rows[r]!;
    const g = grad[i]!;
    gSum += g;
    const p = i * 10;
    let b = offs[p]!;
    h[b]! += g;
    h[b + 1]!++;
    b = offs[p + 1]!;
    h[b]! += g;
    h[b + 1]!++;
    b = offs[p + 2]!;
    h[b]! += g;
    h[b + 1]!++;
    b = offs[p + 3]!;
    h[b]! += g;
    h[b + 1]!++;
    b = offs[p + 4]!;
    h[b]! += g;
    h[b + 1]!++;
    b = offs[p + 5]!;
    h[b]! += g;
    h[b + 1]!++;
    b = offs[p + 6]!;
    h[b]! += g;
    h[b + 1]!++;
    b = offs[p + 7]!;
    h[b]! += g;
    h[b + 1]!++;
    b = offs[p + 8]!;
    h[b]! += g;
    h[b + 1]!++;
    b = offs[p + 9]!;
    h[b]! += g;
    h[b + 1]!++;
  }
  return gSum;
}

/**
 * Grow one tree depth-first. The child with fewer rows gets its histogram built from its rows;
 * the larger child's is the parent's minus it (the histogram subtraction of Ke et al. 2017), which
 * roughly halves the histogram work. Leaves and their row ranges are left in `work`.
 */
function growTree(
  rows: Int32Array,
  grad: Float64Array,
  rowOffsets: Int32Array,
  binned: Uint8Array[],
  bins: FeatureBins[],
  o: ReturnType<typeof resolve>,
  nb: number,
  work: TreeWork,
): GbdtTree {
  const nodes = new TreeNodes();
  const { feature, threshold, splitBin, left, right, value } = nodes;
  const f = bins.length;
  const nb2 = 2 * nb;
  work.leafCount = 0;
  const stack: NodeTask[] = [{ node: nodes.add(), start: 0, end: rows.length, depth: 0, hist: null, gSum: null }];
  while (stack.length) {
    const task = stack.pop()!;
    const { node, start, end, depth } = task;
    const count = end - start;
    const splittable = canSplit(count, depth, o);
    let hist = task.hist;
    // Σ gradient in row order: known from the parent's pass, or from this node's histogram
    // pass (which adds it in the same order), or added up here.
    let gSum = 0;
    if (task.gSum !== null) gSum = task.gSum;
    else if (!hist && splittable) {
      hist = work.take();
      gSum = node === 0 ? rootHistogram(hist, rows, grad, rowOffsets, f, work) : buildHistogram(hist, rows, start, end, grad, rowOffsets, f);
    } else gSum = gradientSum(rows, start, end, grad);
    value[node] = (o.learningRate * gSum) / (count + o.l2Leaf);
    if (!splittable) {
      if (hist) work.give(hist);
      work.addLeaf(node, start, end);
      continue;
    }
    if (!hist) {
      hist = work.take();
      buildHistogram(hist, rows, start, end, grad, rowOffsets, f);
    }
    const parentScore = (gSum * gSum) / (count + o.l2Leaf);
    // the split search, the partition and the histogram subtraction are functions of their own,
    // so V8 optimizes each with complete feedback (not growTree inside its first loop)
    const bestF = findBestSplit(hist, bins, nb2, count, gSum, parentScore, o, work);
    if (bestF < 0) {
      work.give(hist);
      work.addLeaf(node, start, end);
      continue;
    }
    const bestBin = work.bestBin;
    const i = partitionRows(rows, start, end, binned[bestF]!, bestBin, grad, work);
    const gLeft = work.gLeft[0]!;
    feature[node] = bestF;
    threshold[node] = bins[bestF]!.cuts[bestBin]!;
    splitBin[node] = bestBin;
    const l = nodes.add();
    const r = nodes.add();
    left[node] = l;
    right[node] = r;
    const lTask: NodeTask = { node: l, start, end: i, depth: depth + 1, hist: null, gSum: gLeft };
    const rTask: NodeTask = { node: r, start: i, end, depth: depth + 1, hist: null, gSum: null };
    if (canSplit(i - start, depth + 1, o) || canSplit(end - i, depth + 1, o)) {
      const leftSmaller = i - start <= end - i;
      const small = leftSmaller ? lTask : rTask;
      const large = leftSmaller ? rTask : lTask;
      const sh = work.take();
      small.gSum = buildHistogram(sh, rows, small.start, small.end, grad, rowOffsets, f);
      small.hist = sh;
      // the parent's histogram is not needed any more: reuse it for the larger child (only a
      // feature's bins 0 … cuts.length are ever filled; the rest stay 0 in both)
      subtractHistogram(hist, sh, bins, nb2);
      large.hist = hist;
    } else work.give(hist);
    stack.push(rTask, lTask);
  }
  return {
    feature: Int16Array.from(feature),
    threshold: Float64Array.from(threshold),
    left: Int32Array.from(left),
    right: Int32Array.from(right),
    value: Float64Array.from(value),
    splitBin: Int16Array.from(splitBin),
  };
}

/** Σ grad over rows[start, end), in row order. */
function gradientSum(rows: Int32Array, start: number, end: number, grad: Float64Array): number {
  let gSum = 0;
  for (let r = start; r < end; r++) gSum += grad[rows[r]!]!;
  return gSum;
}

/**
 * The best split of a node from its histogram: returns its feature (−1 when no split gains)
 * and leaves its bin in work.bestBin.
 */
function findBestSplit(
  hist: Float64Array,
  bins: FeatureBins[],
  nb2: number,
  count: number,
  gSum: number,
  parentScore: number,
  o: ReturnType<typeof resolve>,
  work: TreeWork,
): number {
  let bestGain = 1e-12 * Math.max(parentScore, 1e-300);
  let bestF = -1;
  let bestBin = -1;
  for (let j = 0; j < bins.length; j++) {
    const off = j * nb2;
    const nCuts = bins[j]!.cuts.length;
    let gl = 0;
    let nl = 0;
    for (let b = 0; b < nCuts; b++) {
      gl += hist[off + 2 * b]!;
      nl += hist[off + 2 * b + 1]!;
      const nr = count - nl;
      if (nl < o.minSamplesLeaf) continue;
      if (nr < o.minSamplesLeaf) break;
      const gr = gSum - gl;
      const gain = (gl * gl) / (nl + o.l2Leaf) + (gr * gr) / (nr + o.l2Leaf) - parentScore;
      if (gain > bestGain) {
        bestGain = gain;
        bestF = j;
        bestBin = b;
      }
    }
  }
  work.bestBin = bestBin;
  return bestF;
}

/**
 * Partition rows[start, end) in place: bin ≤ bestBin first; returns where the right part
 * starts. A left row is in its final place when i passes it, in position order, so the left
 * child's gradient sum (left in work.gLeft[0]) is added here in the order its own loop would add it.
 */
function partitionRows(rows: Int32Array, start: number, end: number, col: Uint8Array, bestBin: number, grad: Float64Array, work: TreeWork): number {
  let i = start;
  let k = end - 1;
  let gLeft = 0;
  while (i <= k) {
    const row = rows[i]!;
    if (col[row]! <= bestBin) {
      gLeft += grad[row]!;
      i++;
    } else {
      const tmp = rows[i]!;
      rows[i] = rows[k]!;
      rows[k] = tmp;
      k--;
    }
  }
  work.gLeft[0] = gLeft;
  return i;
}

/** hist −= sh over each feature's filled bins. */
function subtractHistogram(hist: Float64Array, sh: Float64Array, bins: FeatureBins[], nb2: number): void {
  for (let j = 0; j < bins.length; j++) {
    for (let b = j * nb2, e = b + 2 * (bins[j]!.cuts.length + 1); b < e; b++) hist[b]! -= sh[b]!;
  }
}

/**
 * The nodes of a tree being grown, one array per field. A class and a module-level canSplit
 * rather than closures made per tree, which V8 would recompile (with growTree around them).
 */
class TreeNodes {
  readonly feature: number[] = [];
  readonly threshold: number[] = [];
  readonly splitBin: number[] = [];
  readonly left: number[] = [];
  readonly right: number[] = [];
  readonly value: number[] = [];

  /** A new leaf (no split, value 0); returns its index. */
  add(): number {
    this.feature.push(-1);
    this.threshold.push(0);
    this.splitBin.push(-1);
    this.left.push(-1);
    this.right.push(-1);
    this.value.push(0);
    return this.feature.length - 1;
  }
}

/** Whether a node of `count` rows at `depth` may still be split. */
function canSplit(count: number, depth: number, o: ReturnType<typeof resolve>): boolean {
  return depth < o.maxDepth && count >= 2 * o.minSamplesLeaf;
}

/** Leaf value for row i, walking by bins (bin ≤ splitBin ⇔ x ≤ threshold). */
function leafValueBinned(tree: GbdtTree, binned: Uint8Array[], i: number): number {
  let node = 0;
  while (tree.feature[node]! >= 0) {
    node = binned[tree.feature[node]!]![i]! <= tree.splitBin[node]! ? tree.left[node]! : tree.right[node]!;
  }
  return tree.value[node]!;
}

function predictTrees(base: number, trees: GbdtTree[], cols: readonly ArrayLike<number>[], f: number): Float64Array {
  if (cols.length !== f) throw new ModelInputError(`model was trained on ${f} features, got ${cols.length}`);
  const n = cols[0]!.length;
  const out = new Float64Array(n).fill(base);
  for (const tree of trees) {
    for (let i = 0; i < n; i++) {
      let node = 0;
      while (tree.feature[node]! >= 0) {
        const x = cols[tree.feature[node]!]![i]!;
        node = x <= tree.threshold[node]! ? tree.left[node]! : tree.right[node]!;
      }
      out[i]! += tree.value[node]!;
    }
  }
  return out;
}
