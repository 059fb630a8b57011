/**
 * Forecast benchmark (a script, not a test): npx tsx bench/forecast.ts
 *
 * For each portfolio it can build — the demo (data/demo) and the synthetic portfolios of
 * bench/lib/forecastPortfolio.ts (real NOAA Seattle temperatures 2012–2015, NOAA 1981–2010 hourly
 * normals, invented meters and prices) — runs the rolling-origin backtests (src/forecast/backtest.ts)
 * and prints per origin and averaged over origins (pooled meter-months): annual cost error and
 * monthly CV(RMSE) for the forecast and for the naive "same month last year", on the same
 * meter-months; the out-of-sample P10–P90 coverage (each origin's factor chosen on the other
 * origins) and the model's own band's coverage; the weather basis chosen and the basis scores.
 */
import { loadPortfolio } from "../src/ingest/index.ts";
import type { Portfolio } from "../src/domain/types.ts";
import type { Tariff } from "../src/tariff/index.ts";
import { rollingBacktest, type Accuracy } from "../src/forecast/index.ts";
import { SYNTHETIC_AS_OF, SYNTHETIC_VARIANTS, syntheticForecastPortfolio } from "./lib/forecastPortfolio.ts";

const f = (x: number | null | undefined, d = 1): string => (x === null || x === undefined || !Number.isFinite(x) ? "—" : x.toFixed(d));
const acc = (a: Accuracy | null): string => (a ? `annual ${f(a.annualErrorPct, 2).padStart(6)} %  CV ${f(a.cvRmsePct, 2).padStart(6)} %` : "—");

function report(name: string, portfolio: Portfolio<Tariff>, asOf: string): void {
  const started = performance.now();
  const bt = rollingBacktest(portfolio, { asOf });
  const seconds = (performance.now() - started) / 1000;
  console.log(`\n## ${name} (as of ${asOf}; ${bt.origins.length} origin(s); ${seconds.toFixed(1)} s)`);
  console.log(`weather basis: ${bt.basis ?? "none"} — ${bt.basisReason}`);
  for (const b of bt.bases) console.log(`  basis ${b.basis.padEnd(10)} mean |meter annual error| ${f(b.meanAbsAnnualErrorPct, 2)} %  CV ${f(b.cvRmsePct, 2)} %`);
  for (const a of bt.adjustments) console.log(`  month adjustment ${a.adjustment.padEnd(9)} mean |meter annual error| ${f(a.meanAbsAnnualErrorPct, 2)} %  CV ${f(a.cvRmsePct, 2)} %${a.adjustment === bt.adjustment ? "  (used)" : ""}`);
  for (const s of bt.summaries) {
    console.log(
      `  cut ${s.cut} (${s.meters} meters, ${s.historyMonths.min}–${s.historyMonths.max} months before)  model ${acc(s.model)}  |  naive ${acc(s.naive)}  |  coverage ${f((s.coverage ?? NaN) * 100, 1)} % (factor ${s.factor}${s.calibrated ? "" : ", uncalibrated"}; own band ${f((s.coverageOwnBand ?? NaN) * 100, 1)} %)`,
    );
  }
  console.log(`  all origins  model ${acc(bt.overall.model)}  |  naive ${acc(bt.overall.naive)}  |  coverage ${f((bt.overall.coverage ?? NaN) * 100, 1)} % (own band ${f((bt.overall.coverageOwnBand ?? NaN) * 100, 1)} %); forecast factor ${bt.factor}`);
}

const demo = await loadPortfolio("data/demo");
if (demo.portfolio) report("demo", demo.portfolio as Portfolio<Tariff>, demo.portfolio.settings.asOf ?? "2025-12-31");
for (const v of SYNTHETIC_VARIANTS) report(`synthetic ${v}`, syntheticForecastPortfolio(v), SYNTHETIC_AS_OF);
