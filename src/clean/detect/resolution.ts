import type { IntervalSeries } from "../../domain/types.ts";

/**
 * A meter's resolution: the smallest step between its distinct readings, in the meter's unit.
 * Readings are sorted, equal ones (to 1e-9 relative) merged, and the resolution is the 5th
 * percentile of the gaps between neighbours (the order statistic at ⌊0.05 (m − 1)⌋, no interpolation) — a meter reading in 0.02 kWh steps gives 0.02 even
 * when one odd corrected reading sits off the grid. Continuous (unrounded) data gives a tiny
 * step, which changes nothing downstream. 0 when fewer than two distinct finite readings.
 * Indices with `skip[i]` = 1 are ignored.
 * @example meterResolution({ values: [0.1, 0.12, 0.12, 0.16, 0.1] }) // 0.02
 */
export function meterResolution(series: Pick<IntervalSeries, "values">, skip?: Uint8Array): number {
  const v = series.values;
  const finite: number[] = [];
  for (let i = 0; i < v.length; i++) if (Number.isFinite(v[i]!) && !(skip && skip[i])) finite.push(v[i]!);
  if (finite.length < 2) return 0;
  const sorted = Float64Array.from(finite).sort();
  const gaps: number[] = [];
  for (let i = 1; i < sorted.length; i++) {
    const gap = sorted[i]! - sorted[i - 1]!;
    const scale = Math.max(Math.abs(sorted[i]!), Math.abs(sorted[i - 1]!), 1e-12);
    if (gap > 1e-9 * scale) gaps.push(gap);
  }
  if (gaps.length === 0) return 0;
  gaps.sort((x, y) => x - y);
  return gaps[Math.floor(0.05 * (gaps.length - 1))]!;
}
