/**
 * Interval-baseline benchmark (a script, not a test):
 *   npx tsx bench/intervalBaseline.ts
 * Two years of invented 15-minute office data per meter (fictional buildings, synthetic
 * weather): fit on year 1 with fitIntervalBaseline (defaults: TOWT, GBDT, GBDT on log1p,
 * 4 folds × 4 weeks, ensemble search), then predict year 2 from its weather. Reports the fit
 * time per meter-year, each model's cross-validation CV(RMSE)/NMBE, which model won and by how
 * much, and the year-2 backtest against two naive baselines (same hour 364 days earlier;
 * mean by hour of week of year 1).
 */
import { fitIntervalBaseline } from "../src/model/interval/fitIntervalBaseline.ts";
import { hourlyFrame } from "../src/model/interval/hourlyFrame.ts";
import type { IntervalSeries } from "../src/domain/types.ts";
import { syntheticOffice } from "../test/model/interval/syntheticOffice.ts";

const H = 3_600_000;
function slice(s: IntervalSeries, a: number, b: number): IntervalSeries {
  return { ...s, startMs: s.startMs.slice(a, b), values: s.values.slice(a, b) };
}
function stats(y: ArrayLike<number>, yHat: ArrayLike<number>): { cv: number; nmbe: number } {
  let se = 0;
  let e = 0;
  let s = 0;
  for (let i = 0; i < y.length; i++) {
    se += (y[i]! - yHat[i]!) ** 2;
    e += y[i]! - yHat[i]!;
    s += y[i]!;
  }
  const m = s / y.length;
  return { cv: (100 * Math.sqrt(se / y.length)) / m, nmbe: (100 * e) / s };
}
const pct = (v: number): string => `${v.toFixed(2).padStart(6)} %`;

// Warm-up on eight weeks so the first meter's time is not mostly JIT compilation.
{
  const w = syntheticOffice({ days: 56, seed: 30 });
  fitIntervalBaseline({ meterId: "WARM-UP", series: w.series, mask: null, weather: w.weather, zone: w.zone, floorAreaM2: null });
}

const meters = [
  { id: "BENCH-OFFICE-A", seed: 31, occupiedKw: 80, baseKw: 40, noise: 0.05 },
  { id: "BENCH-OFFICE-B", seed: 32, occupiedKw: 120, baseKw: 35, noise: 0.1 },
];
for (const m of meters) {
  const d = syntheticOffice({ days: 728, seed: m.seed, occupiedKw: m.occupiedKw, baseKw: m.baseKw, noise: m.noise });
  const cut = 364 * 96;
  const year1 = slice(d.series, 0, cut);
  const t0 = performance.now();
  const b = fitIntervalBaseline({ meterId: m.id, series: year1, mask: null, weather: d.weather, zone: d.zone, floorAreaM2: 5000 });
  const fitMs = performance.now() - t0;
  console.log(`\n${m.id}: ${b.accounting.hoursUsed} hours, fit + 4-fold CV of all models ${(fitMs / 1000).toFixed(2)} s per meter-year`);
  for (const r of b.models) {
    console.log(
      `  ${r.kind.padEnd(14)} fit ${r.fitMs.toFixed(0).padStart(5)} ms + CV ${r.cvMs.toFixed(0).padStart(5)} ms   train CV(RMSE) ${pct(r.train!.cv_rmse)}   folds CV(RMSE) ${pct(r.cv!.cv_rmse)} NMBE ${pct(r.cv!.nmbe)} (p = ${r.cv!.p})   out-of-sample ${pct(r.selectionCvRmsePct)}`,
    );
  }
  const e = b.chosen.ensemble;
  if (e) console.log(`  best ensemble: weights ${e.weights.join("/")} of ${e.kinds.join(", ")}, p = ${e.exponent}, ${pct(e.cvRmsePct)}, gain ${e.gainPct.toFixed(2)} % over ${e.bestSingleKind}`);
  console.log(`  chosen: ${b.chosen.kind} (margin ${b.chosen.marginPct.toFixed(2)} % vs ${b.chosen.versusKind}): ${b.chosen.reason}`);

  const test = hourlyFrame(slice(d.series, cut, d.series.values.length), null, d.weather, d.zone);
  const train = hourlyFrame(year1, null, d.weather, d.zone);
  const pred = b.predictHourly(d.weather, test.hourStartMs[0]!, test.hourStartMs[test.hourStartMs.length - 1]! + H);
  const at = new Map<number, number>();
  pred.hourStartMs.forEach((ms, i) => at.set(ms, i));
  const byTime = new Map<number, number>();
  train.hourStartMs.forEach((ms, i) => byTime.set(ms, train.kwh[i]!));
  const sum = new Float64Array(168);
  const cnt = new Float64Array(168);
  train.kwh.forEach((v, i) => {
    sum[train.hourOfWeek[i]!]! += v;
    cnt[train.hourOfWeek[i]!]!++;
  });
  const y: number[] = [];
  const model: number[] = [];
  const lastYear: number[] = [];
  const howMean: number[] = [];
  let inside = 0;
  test.kwh.forEach((v, i) => {
    const ms = test.hourStartMs[i]!;
    const prev = byTime.get(ms - 364 * 24 * H);
    const k = at.get(ms)!;
    if (prev === undefined || !Number.isFinite(pred.kwh[k]!)) return;
    y.push(v);
    model.push(pred.kwh[k]!);
    lastYear.push(prev);
    howMean.push(sum[test.hourOfWeek[i]!]! / cnt[test.hourOfWeek[i]!]!);
    if (v >= pred.lowerKwh[k]! && v <= pred.upperKwh[k]!) inside++;
  });
  const s = stats(y, model);
  const s1 = stats(y, lastYear);
  const s2 = stats(y, howMean);
  const better = Math.min(s1.cv, s2.cv);
  console.log(`  year-2 backtest (${y.length} h): chosen ${pct(s.cv)} NMBE ${pct(s.nmbe)}; same hour last year ${pct(s1.cv)}; hour-of-week mean ${pct(s2.cv)}`);
  console.log(`  gain over the better naive baseline ${((100 * (better - s.cv)) / better).toFixed(1)} % (goal ≥ 25 %); 80 % band held ${((100 * inside) / y.length).toFixed(1)} % of hours`);
}
