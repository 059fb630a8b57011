/**
 * Remembers a computation by its inputs: `compute()` or, when these exact inputs were computed
 * before, its earlier result. Stages that are pure per meter (screening, forecasts) take one, so
 * a build with a cache folder can skip what an earlier build already computed; the pipeline
 * supplies one backed by the cache (pipeline/analysisCache.ts cacheMemo). Only a pure function of
 * `inputs` may be memoized, and `kind` must name the function (and change when it does).
 */
export type Memo = <T>(kind: string, inputs: unknown, compute: () => T) => T;

/** Computes every time (no cache). */
export const noMemo: Memo = (_kind, _inputs, compute) => compute();
