/**
 * Model benchmark on real NOAA temperatures (a script, not a test):
 *   npx tsx bench/intervalBaseline.ts
 *
 * Weather: the real daily maximum/minimum temperatures of Seattle (NOAA, 2012–2015, file
 * seattle-weather.csv of the vega-datasets npm package, °C) turned into hourly values by the
 * project's diurnal method — minimum at 06:00 and maximum at 15:00 local time, half-cosine
 * between them (hourFromDailyMaxMin in src/ingest/weatherGrid.ts). As a units check the
 * script prints the mean of the built hours next to the mean of the NOAA 1981–2010 hourly
 * normals in the same package.
 *
 * Buildings: the synthetic portfolio of bench/lib/syntheticPortfolio.ts (office electricity
 * and gas, school with a term calendar, shop, warehouse), hourly energy with known physics and
 * seeded noise, 2013 (year 1) trains, 2014 (year 2) is held out. Another training year:
 *   npx tsx bench/intervalBaseline.ts 2014   (trains on 2014, holds out 2015)
 *
 * Per meter: fit time per meter-year for TOWT, month-segmented TOWT, GBDT, GBDT on log1p (each fitted alone on year 1)
 * and for fitIntervalBaseline with its defaults (all models + 4-fold CV with validation blocks spread over the last year + ensemble search and
 * choice); year-2 CV(RMSE)/NMBE of each model, of the chosen model and of two naive baselines
 * (same local hour 364 days earlier — one week further back where that is missing; mean by hour
 * of week of year 1); share of year-2 hours inside
 * the chosen model's 80 % band; the gain of the chosen model over the better naive baseline
 * (goal ≥ 25 %). Then monthly: calendar-month bills, the bill-level change-point model
 * (fitMeterBaseline) fitted on year 1 with its Guideline 14 statistics, and its year-2 error.
 */
import { DateTime } from "luxon";
import { fitIntervalBaseline } from "../src/model/interval/fitIntervalBaseline.ts";
import { hourlyFrame } from "../src/model/interval/hourlyFrame.ts";
import { hourlyFeaturesAt } from "../src/model/interval/hourlyFeatures.ts";
import { towtSpec } from "../src/model/interval/towt.ts";
import { towtMonthlySpec } from "../src/model/interval/towtMonthly.ts";
import { gbdtSpec } from "../src/model/interval/gbdtHourly.ts";
import { withLog1pTarget } from "../src/model/interval/targetTransform.ts";
import type { HourlyModelSpec } from "../src/model/interval/types.ts";
import { GUIDELINE14_LIMITS } from "../src/model/stats.ts";
import { fitMeterBaseline, meanTemperature } from "../src/model/billBaselines.ts";
import type { IntervalSeries } from "../src/domain/types.ts";
import { hourlyFromDailyMaxMin, meanFinite, parseDailyMaxMinCsv, parseHourlyNormalsCsv, readNoaaFile } from "./lib/noaaWeather.ts";
import { localMidnightMs, daysBetween } from "../src/core/time/index.ts";
import {
  BENCH_PROFILES,
  bandCoverage,
  domainRecords,
  generateMeter,
  heldOutScore,
  hourOfWeekMean,
  localHours,
  monthlyBills,
  sameHourLastYear,
  type HeldOutScore,
} from "./lib/syntheticPortfolio.ts";

const ZONE = "America/Los_Angeles";
const STATION = "NOAA-SEATTLE";
// Training year from the command line (default 2013); the next year is held out. The NOAA file
// covers 2012–2015, so 2012, 2013 or 2014 work.
const trainYear = Number(process.argv[2] ?? 2013);
if (!(Number.isInteger(trainYear) && trainYear >= 2012 && trainYear <= 2014)) {
  console.error(`training year must be 2012, 2013 or 2014 (the NOAA file covers 2012–2015), got ${process.argv[2]}`);
  process.exit(2);
}
const YEAR1 = `${trainYear}-01-01`;
const YEAR2 = `${trainYear + 1}-01-01`;
const YEAR2_END = `${trainYear + 2}-01-01`;

// --- Weather ---------------------------------------------------------------------------------
const daily = parseDailyMaxMinCsv(readNoaaFile("seattle-weather.csv"), "seattle-weather.csv");
const normals = parseHourlyNormalsCsv(readNoaaFile("seattle-weather-hourly-normals.csv"), "seattle-weather-hourly-normals.csv");
for (const p of [...daily.problems, ...normals.problems]) console.log(p);
const weather = hourlyFromDailyMaxMin(STATION, daily.rows, ZONE);
if (!weather) throw new Error("seattle-weather.csv gave no usable days");
const y1Ms = localMidnightMs(YEAR1, ZONE);
const y2Ms = localMidnightMs(YEAR2, ZONE);
const endMs = localMidnightMs(YEAR2_END, ZONE);
const slot = (ms: number): number => Math.round((ms - weather.startMs) / 3_600_000);
const builtMean = meanFinite(weather.tempC.subarray(slot(y1Ms), slot(endMs)));
console.log(
  `Weather: ${daily.rows.length} of ${daily.rowsRead} NOAA days read (${daily.rows[0]?.date} … ${daily.rows.at(-1)?.date}), ` +
    `${weather.tempC.length} hours built; ${trainYear}–${trainYear + 1} mean ${builtMean.toFixed(2)} °C vs NOAA 1981–2010 hourly normals ` +
    `${meanFinite(normals.rows.map((r) => r.tempC)).toFixed(2)} °C (${normals.rows.length} hours)`,
);

// --- Helpers ---------------------------------------------------------------------------------
const pct = (v: number, w = 6): string => (Number.isFinite(v) ? `${v.toFixed(1)} %`.padStart(w + 2) : "—".padStart(w + 2));
const secs = (ms: number): string => `${(ms / 1000).toFixed(2)} s`.padStart(8);
function slice(s: IntervalSeries, fromMs: number, toMs: number): IntervalSeries {
  let a = 0;
  while (a < s.startMs.length && s.startMs[a]! < fromMs) a++;
  let b = a;
  while (b < s.startMs.length && s.startMs[b]! < toMs) b++;
  return { ...s, startMs: s.startMs.slice(a, b), values: s.values.slice(a, b) };
}
function timed<T>(f: () => T): { value: T; ms: number } {
  const t0 = performance.now();
  const value = f();
  return { value, ms: performance.now() - t0 };
}
const g14h = GUIDELINE14_LIMITS.hourly;
const g14m = GUIDELINE14_LIMITS.monthly;
const verdict = (s: HeldOutScore, lim: { cvRmsePct: number; nmbeAbsPct: number }): string =>
  s.cvRmsePct <= lim.cvRmsePct && Math.abs(s.nmbePct) <= lim.nmbeAbsPct ? "pass" : "FAIL";

// Warm-up on eight weeks of the first meter so the first timing is not mostly JIT compilation.
{
  const h = localHours(YEAR1, 56, ZONE);
  const w = generateMeter(BENCH_PROFILES[0]!, weather, h);
  fitIntervalBaseline({ meterId: "WARM-UP", series: w.series, mask: null, weather, zone: ZONE, floorAreaM2: null });
}

const hours = localHours(YEAR1, daysBetween(YEAR1, YEAR2_END), ZONE);
const specs: HourlyModelSpec[] = [towtSpec(), towtMonthlySpec(), gbdtSpec(), withLog1pTarget(gbdtSpec())];
const summary: { meterId: string; chosenKind: string; chosen: HeldOutScore; naive: number; gainPct: number; coverage: number }[] = [];
const monthlyRows: string[] = [];

for (const profile of BENCH_PROFILES) {
  const m = generateMeter(profile, weather, hours);
  const year1 = slice(m.series, y1Ms, y2Ms);
  const year2 = slice(m.series, y2Ms, endMs);
  const train = hourlyFrame(year1, null, weather, ZONE);
  const test = hourlyFrame(year2, null, weather, ZONE);
  const meterYears = train.accounting.hoursUsed / 8760;
  const y = test.kwh;
  const testFeatures = hourlyFeaturesAt(weather, ZONE, test.hourStartMs).features;

  console.log(`\n${profile.meterId} (${profile.useType}, ${profile.commodity}, ${profile.unit}/h; train ${train.accounting.hoursUsed} h, held out ${test.accounting.hoursUsed} h)`);
  console.log(`  ${"model".padEnd(26)} ${"fit/m-yr".padStart(8)}  ${"Y2 CV(RMSE)".padStart(11)} ${"Y2 NMBE".padStart(8)}  G14 hourly  ${"in 80% band".padStart(11)}`);
  const row = (name: string, fitMs: number | null, s: HeldOutScore, coverage: number | null): void =>
    console.log(
      `  ${name.padEnd(26)} ${fitMs === null ? "".padStart(8) : secs(fitMs / meterYears)}  ${pct(s.cvRmsePct, 9)} ${pct(s.nmbePct)}  ${verdict(s, g14h).padEnd(10)}  ${coverage === null ? "" : pct(100 * coverage, 9)}`,
    );

  // Each model alone: fit on year 1, predict year 2.
  for (const spec of specs) {
    const { value: model, ms } = timed(() => spec.fit(train));
    row(spec.kind, ms, heldOutScore(y, model.predict(testFeatures)), null);
  }

  // The project's choice with default options (fit + CV + ensemble search), and its band.
  const { value: b, ms: chooseMs } = timed(() =>
    fitIntervalBaseline({ meterId: profile.meterId, series: year1, mask: null, weather, zone: ZONE, floorAreaM2: profile.floorAreaM2 }),
  );
  const pred = b.predictHourly(weather, y2Ms, endMs);
  const at = new Map<number, number>();
  pred.hourStartMs.forEach((ms, i) => at.set(ms, i));
  const idx = Array.from(test.hourStartMs, (ms) => at.get(ms)!);
  const chosenKwh = Float64Array.from(idx, (k) => pred.kwh[k]!);
  const chosen = heldOutScore(y, chosenKwh);
  const coverage = bandCoverage(y, Float64Array.from(idx, (k) => pred.lowerKwh[k]!), Float64Array.from(idx, (k) => pred.upperKwh[k]!));
  const label = b.chosen.kind === "ensemble" ? `chosen: ensemble p=${b.chosen.ensemble!.exponent}` : `chosen: ${b.chosen.kind}`;
  row(label, chooseMs, chosen, coverage);

  // Naive baselines and the noise-free truth (the floor no model can beat).
  const lastYear = heldOutScore(y, sameHourLastYear(train.hourStartMs, train.kwh, test.hourStartMs, ZONE, 364));
  const howMean = heldOutScore(y, hourOfWeekMean(train.hourOfWeek, train.kwh, test.hourOfWeek));
  row("naive: same hour last year", null, lastYear, null);
  row("naive: hour-of-week mean", null, howMean, null);
  const truthAt = new Map<number, number>();
  m.series.startMs.forEach((ms, i) => truthAt.set(ms, m.expected[i]!));
  row("truth without noise", null, heldOutScore(y, Float64Array.from(test.hourStartMs, (ms) => truthAt.get(ms)!)), null);
  const naive = Math.min(lastYear.cvRmsePct, howMean.cvRmsePct);
  const gainPct = (100 * (naive - chosen.cvRmsePct)) / naive;
  // Where the chosen model's year-2 error sits: the three months with the largest hourly CV(RMSE).
  const byMonth = new Map<string, { y: number[]; p: number[] }>();
  test.hourStartMs.forEach((ms, i) => {
    const k = DateTime.fromMillis(ms, { zone: ZONE }).toFormat("yyyy-LL");
    const e = byMonth.get(k) ?? { y: [], p: [] };
    e.y.push(y[i]!);
    e.p.push(chosenKwh[i]!);
    byMonth.set(k, e);
  });
  const worst = [...byMonth].map(([k, e]) => ({ k, cv: heldOutScore(e.y, e.p).cvRmsePct })).sort((a, b) => b.cv - a.cv).slice(0, 3);
  console.log(`  chosen model's worst year-2 months (hourly CV(RMSE)): ${worst.map((w) => `${w.k} ${w.cv.toFixed(1)} %`).join(", ")}`);
  console.log(`  chosen because: ${b.chosen.reason}; fit time above is fit + 4-fold CV (blocks spread over the last year) of all models + ensemble search`);
  console.log(`  gain over the better naive baseline: ${gainPct.toFixed(1)} % (ratio ${(chosen.cvRmsePct / naive).toFixed(3)}; goal ≥ 25 %)`);
  summary.push({ meterId: profile.meterId, chosenKind: b.chosen.kind, chosen, naive, gainPct, coverage });

  // Monthly: calendar-month bills, change-point model on year 1, year-2 error.
  const { building, meter } = domainRecords(profile, ZONE, STATION);
  const { bills } = monthlyBills(m.series, ZONE, `${trainYear}-01`, 24);
  const bills1 = bills.filter((x) => x.periodStart < YEAR2);
  const bills2 = bills.filter((x) => x.periodStart >= YEAR2);
  const mb = fitMeterBaseline({ meter, building, bills: bills1, weather, normals: undefined, tempUnit: "C" });
  if (!mb.fit) {
    monthlyRows.push(`  ${profile.meterId.padEnd(18)} no change-point model passed (${mb.tried.map((t) => `${t.kind}: ${t.reasons.join(", ")}`).join("; ")})`);
    continue;
  }
  const fit = mb.fit;
  const actual2 = bills2.map((x) => x.usage);
  const cp2 = bills2.map((x) => {
    const t = meanTemperature(weather, localMidnightMs(x.periodStart, ZONE), localMidnightMs(x.periodEnd, ZONE)).meanC;
    return Math.max(0, fit.predict(t)) * daysBetween(x.periodStart, x.periodEnd);
  });
  // The hourly chosen model summed to the same months, for comparison.
  const hourly2 = bills2.map((x) => {
    const a = localMidnightMs(x.periodStart, ZONE);
    const z = localMidnightMs(x.periodEnd, ZONE);
    let s = 0;
    pred.hourStartMs.forEach((ms, i) => {
      if (ms >= a && ms < z) s += pred.kwh[i]!;
    });
    return s;
  });
  const cpScore = heldOutScore(actual2, cp2);
  const hrScore = heldOutScore(actual2, hourly2);
  monthlyRows.push(
    `  ${profile.meterId.padEnd(18)} ${fit.kind.padEnd(4)} ${pct(fit.stats.cvRmsePct)} ${pct(fit.stats.nmbePct)}  ${(mb.meetsGuideline14 ? "pass" : "FAIL").padEnd(4)}   ` +
      `${pct(cpScore.cvRmsePct)} ${pct(cpScore.nmbePct)}  ${verdict(cpScore, g14m).padEnd(4)}   ${pct(hrScore.cvRmsePct)} ${pct(hrScore.nmbePct)}`,
  );
}

console.log(`\nSummary (year-2 hourly, chosen model vs the better naive baseline; Guideline 14 hourly limits ${g14h.cvRmsePct} %/${g14h.nmbeAbsPct} %)`);
for (const s of summary) {
  console.log(
    `  ${s.meterId.padEnd(18)} ${s.chosenKind.padEnd(11)} CV(RMSE) ${pct(s.chosen.cvRmsePct)} vs naive ${pct(s.naive)}  ratio ${(s.chosen.cvRmsePct / s.naive).toFixed(3)}  gain ${pct(s.gainPct)}  ${s.gainPct >= 25 ? "meets" : "MISSES"} 25 % goal; band ${pct(100 * s.coverage)}`,
  );
}
console.log(`\nMonthly (calendar-month bills; change-point fitted on ${trainYear}; Guideline 14 monthly limits ${g14m.cvRmsePct} %/${g14m.nmbeAbsPct} %, n − p)`);
console.log(`  ${"meter".padEnd(18)} form ${"Y1 CV".padStart(8)} ${"Y1 NMBE".padStart(8)}  G14    ${"Y2 CV".padStart(8)} ${"Y2 NMBE".padStart(8)}  G14    ${"hourly→Y2 CV".padStart(8)} ${"NMBE".padStart(8)}`);
for (const r of monthlyRows) console.log(r);
