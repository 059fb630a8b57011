/**
 * Scenario × month values of one meter in one contiguous array (scenario s, month k at
 * `values[s · months + k]`). A forecast keeps 300 scenarios of every meter until the pages are
 * written; one Float64Array per meter instead of one per scenario saves the per-array overhead
 * (about 200 bytes each, more than the 96 bytes of twelve values) and the garbage collector's work.
 */

export interface ScenarioMatrix {
  scenarios: number;
  months: number;
  /** Row-major: scenario s, month k at s · months + k. */
  values: Float64Array;
}

/**
 * A zero-filled matrix.
 * @example scenarioMatrix(300, 12).values.length // 3600
 */
export function scenarioMatrix(scenarios: number, months: number): ScenarioMatrix {
  return { scenarios, months, values: new Float64Array(scenarios * months) };
}

/** An empty matrix (no scenarios): a meter that was not priced. */
export const NO_SCENARIOS: ScenarioMatrix = Object.freeze({ scenarios: 0, months: 0, values: new Float64Array(0) }) as ScenarioMatrix;

/** Value of scenario s, month k. */
export function valueAt(m: ScenarioMatrix, s: number, k: number): number {
  return m.values[s * m.months + k]!;
}

/**
 * Month k of every scenario (a copy).
 * @example monthColumn({ scenarios: 2, months: 2, values: Float64Array.of(1, 2, 3, 4) }, 1) // [2, 4]
 */
export function monthColumn(m: ScenarioMatrix, k: number): Float64Array {
  const out = new Float64Array(m.scenarios);
  for (let s = 0; s < m.scenarios; s++) out[s] = m.values[s * m.months + k]!;
  return out;
}

/**
 * Each scenario's sum over months 0 … `months` − 1, added left to right from 0 (the order of
 * `row.reduce((a, b) => a + b, 0)`, so totals are bit-identical to summing a row array).
 * @example scenarioTotals({ scenarios: 2, months: 2, values: Float64Array.of(1, 2, 3, 4) }) // [3, 7]
 */
export function scenarioTotals(m: ScenarioMatrix, months = m.months): Float64Array {
  const n = Math.min(months, m.months);
  const out = new Float64Array(m.scenarios);
  for (let s = 0; s < m.scenarios; s++) {
    let total = 0;
    const base = s * m.months;
    for (let k = 0; k < n; k++) total += m.values[base + k]!;
    out[s] = total;
  }
  return out;
}

/**
 * A matrix from rows (tests and small callers).
 * @example fromRows([[1, 2], [3, 4]]).values // Float64Array [1, 2, 3, 4]
 */
export function fromRows(rows: readonly ArrayLike<number>[]): ScenarioMatrix {
  const months = rows[0]?.length ?? 0;
  const m = scenarioMatrix(rows.length, months);
  rows.forEach((r, s) => m.values.set(r, s * months));
  return m;
}
