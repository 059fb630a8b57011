/**
 * Compares, meter by meter, the bill-level baselines on a portfolio folder (default data/demo):
 *   CP     the pipeline's mean-temperature change-point model (src/pipeline/baselines.ts) and
 *          its 99 % least-squares prediction band;
 *   CP+LOO the same chosen change-point form with the leave-one-out band (src/model/outlierBand.ts);
 *   DD     the variable-base degree-day model (src/model/degreeDayRegression.ts) with its 99 %
 *          least-squares prediction band (bases fixed);
 *   DD+LOO the degree-day model with the leave-one-out band.
 * Prints CV(RMSE), NMBE and R² of each fit and the bills outside each band.
 *
 *   npx tsx scripts/compare-monthly-baselines.ts [PORTFOLIO_DIR] [--relative] [--min=0.1] [--unit=C|F]
 * (--relative: relative leave-one-out residuals instead of use per day; --min: minimum half-width
 * share; --unit: temperature unit of the models, default the portfolio's degree_day_base unit;
 * --gas-heating-only: the DD+LOO band tries only the constant and heating-only forms on gas meters;
 * --daily: degree-days from daily mean temperatures instead of hourly integration)
 */
import { loadPortfolio } from "../src/ingest/index.ts";
import { fitMeterBaseline } from "../src/model/billBaselines.ts";

/** Level of the least-squares prediction band the change-point comparison uses (the earlier rule). */
const OUTLIER_BAND_LEVEL = 0.99;
import { fitChangePoint, type ChangePointPoint } from "../src/model/changePoint.ts";
import {
  fitDegreeDayForm,
  fitDegreeDayModel,
  temperatureProfileForPeriod,
  type DegreeDayPeriod,
  type TemperatureProfile,
} from "../src/model/degreeDayRegression.ts";
import { degreeDayOutlierBand, outlierBand, type BandPoint } from "../src/model/outlierBand.ts";
import type { Bill } from "../src/domain/types.ts";
import { daysBetween, localMidnightMs } from "../src/core/time/index.ts";

const MIN_POINTS = 9;
const MIN_WEATHER_COVERAGE = 0.8;

const dir = process.argv.slice(2).find((a) => !a.startsWith("--")) ?? "data/demo";
const residualScale = process.argv.includes("--relative") ? "relative" : "absolute";
const minArg = process.argv.find((a) => a.startsWith("--min="));
const minRelativeHalfWidth = minArg ? Number(minArg.slice(6)) : 0.1;
const { portfolio } = await loadPortfolio(dir);
if (!portfolio) throw new Error(`${dir}: portfolio could not be loaded`);
const unitArg = process.argv.find((a) => a.startsWith("--unit="))?.slice(7);
const unit: "C" | "F" = unitArg === "F" || unitArg === "C" ? unitArg : portfolio.settings.degreeDayBase.unit;
const toUnit = (c: number): number => (unit === "F" ? c * 1.8 + 32 : c);

const fmt = (v: number | null | undefined, d = 1): string => (v === null || v === undefined || !Number.isFinite(v) ? "—" : v.toFixed(d));
const outsideList = (bills: Bill[], bands: Map<string, { low: number; high: number }>): string[] =>
  bills.filter((b) => {
    const band = bands.get(b.billId);
    return band !== undefined && (b.usage < band.low || b.usage > band.high);
  }).map((b) => short(b.billId));

const short = (billId: string): string => billId.replace(/^[A-Z]+-[A-Z]-/, "");
const fmtScale = (s: number): string => (residualScale === "relative" ? `${(100 * s).toFixed(1)} %` : `${s.toPrecision(3)}/day`);
const gasHeatingOnly = process.argv.includes("--gas-heating-only");
const blockHours = process.argv.includes("--daily") ? 24 : 1;
const rows: string[][] = [];
let ddMs = 0;
let ddMeters = 0;
const outside: Record<string, Set<string>> = { CP: new Set(), "CP+LOO": new Set(), DD: new Set(), "DD+LOO": new Set() };
for (const building of portfolio.buildings) {
  const weather = portfolio.weather.get(building.weatherStation);
  const weatherInUnit = weather && unit === "F" ? weather.tempC.map(toUnit) : null;
  for (const meter of portfolio.meters.filter((m) => m.buildingId === building.buildingId)) {
    const bills = portfolio.bills.filter((b) => b.meterId === meter.meterId).sort((a, b) => a.periodStart.localeCompare(b.periodStart));
    const cp = fitMeterBaseline({ meter, building, bills, weather, normals: portfolio.normals.get(building.weatherStation), tempUnit: unit });

    // The same training set as the pipeline: actual reads, one bill per period, weather ≥ 80 %.
    type Pt = { profile: TemperatureProfile; temp: number; usePerDay: number; days: number };
    const all: BandPoint<Pt>[] = [];
    const train: BandPoint<Pt>[] = [];
    const seen = new Set<string>();
    for (const bill of bills) {
      if (!weather) continue;
      const startMs = localMidnightMs(bill.periodStart, building.timezone);
      const endMs = localMidnightMs(bill.periodEnd, building.timezone);
      const profileC = temperatureProfileForPeriod({ startMs: weather.startMs, temps: weather.tempC }, startMs, endMs);
      if (profileC.hoursCovered < MIN_WEATHER_COVERAGE * profileC.hoursTotal) continue;
      const profile = temperatureProfileForPeriod({ startMs: weather.startMs, temps: weatherInUnit ?? weather.tempC }, startMs, endMs, { blockHours });
      const h = profile.sortedTemps.length;
      const days = daysBetween(bill.periodStart, bill.periodEnd);
      const pt: BandPoint<Pt> = {
        id: bill.billId,
        point: { profile, temp: profile.cumHourTemps[h] / profile.cumHours[h], usePerDay: bill.usage / days, days },
        usePerDay: bill.usage / days,
        days,
      };
      all.push(pt);
      const key = `${bill.periodStart}/${bill.periodEnd}`;
      if (bill.readType === "estimated" || seen.has(key)) continue;
      seen.add(key);
      train.push(pt);
    }
    if (train.length < MIN_POINTS) {
      rows.push([meter.meterId, "too few points"]);
      continue;
    }
    const periods: DegreeDayPeriod[] = train.map((t) => t.point);
    const dd = fitDegreeDayModel(periods, { tempUnit: unit }).chosen;

    const cpParam = cp.expectedByBill; // empty when the CP fit misses Guideline 14
    const cpLoo = cp.fit
      ? outlierBand(train, (pts: Pt[]) => {
          const f = fitChangePoint(pts as ChangePointPoint[], cp.fit!.kind, { weightByDays: true });
          return { predictPerDay: (p: Pt) => f.predict(p.temp) };
        }, all, { residualScale, minRelativeHalfWidth })
      : null;
    const ddParam = new Map<string, { low: number; high: number }>();
    if (dd) {
      for (const t of all) {
        const band = dd.predictWithInterval(t.point.profile, OUTLIER_BAND_LEVEL, t.days);
        ddParam.set(t.id, { low: Math.max(0, band.lower * t.days), high: band.upper * t.days });
      }
    }
    const ddStarted = performance.now();
    const ddLoo = degreeDayOutlierBand(
      train.map((t) => ({ id: t.id, ...t.point })),
      all.map((t) => ({ id: t.id, ...t.point })),
      { tempUnit: unit, residualScale, minRelativeHalfWidth, ...(gasHeatingOnly && meter.commodity === "gas" ? { forms: ["constant", "HO"] as const } : {}) },
    );
    ddMs += performance.now() - ddStarted;
    ddMeters++;

    const lists = {
      CP: outsideList(bills, cpParam),
      "CP+LOO": cpLoo ? outsideList(bills, cpLoo.bands) : [],
      DD: outsideList(bills, ddParam),
      "DD+LOO": outsideList(bills, ddLoo.bands),
    };
    for (const [k, v] of Object.entries(lists)) for (const b of v) outside[k].add(`${meter.meterId}-${b}`);
    const bases = dd ? [dd.heatingBase, dd.coolingBase].filter((b) => b !== null).map((b) => fmt(b, 2)).join("/") : "";
    rows.push([
      meter.meterId,
      `${cp.fit?.kind ?? "none"} ${fmt(cp.fit?.stats.cvRmsePct)} ${fmt(cp.fit?.stats.nmbePct, 2)} ${fmt(cp.fit?.stats.rSquared, 3)}${cp.meetsGuideline14 ? "" : " (G14 ✗: no band)"}`,
      `${dd?.form ?? "none"}${bases ? `@${bases}` : ""} ${fmt(dd?.stats.cvRmsePct)} ${fmt(dd?.stats.nmbePct, 2)} ${fmt(dd?.stats.rSquared, 3)}`,
      `CP: ${lists.CP.join(" ") || "-"}`,
      `CP+LOO: ${lists["CP+LOO"].join(" ") || "-"}${cpLoo ? ` (s ${fmtScale(cpLoo.scale)}, k ${cpLoo.k.toFixed(2)}; refitted out: ${cpLoo.rejected.map(short).join(" ") || "-"})` : ""}`,
      `DD: ${lists.DD.join(" ") || "-"}`,
      `DD+LOO: ${lists["DD+LOO"].join(" ") || "-"}` +
        (ddLoo.band && ddLoo.fit
          ? ` (final ${ddLoo.fit.form}${[ddLoo.fit.heatingBase, ddLoo.fit.coolingBase].filter((b) => b !== null).map((b) => `@${fmt(b, 2)}`).join("/")}` +
            ` CV ${fmt(ddLoo.fit.stats.cvRmsePct)} NMBE ${fmt(ddLoo.fit.stats.nmbePct, 2)} R² ${fmt(ddLoo.fit.stats.rSquared, 3)};` +
            ` s ${fmtScale(ddLoo.band.scale)}, k ${ddLoo.band.k.toFixed(2)}, at minimum width ${[...ddLoo.bands.values()].filter((b) => b.atMinimumWidth).length}/${ddLoo.bands.size};` +
            ` refitted out: ${ddLoo.rejected.map(short).join(" ") || "-"})`
          : " (no model)"),
    ]);
  }
}

process.stdout.write(`portfolio ${dir}, temperatures in °${unit}, LOO residuals ${residualScale}, degree-days from ${blockHours === 24 ? "daily means" : "hourly values"}\n`);
process.stdout.write("meter | CP form CV(RMSE)% NMBE% R² | DD form@base CV(RMSE)% NMBE% R² | bills outside each band\n");
for (const r of rows) process.stdout.write(`${r[0].padEnd(6)} | ${r.slice(1, 3).join(" | ")}\n         ${r.slice(3).join("\n         ")}\n`);
process.stdout.write("\nBills outside each band (all meters):\n");
for (const [k, v] of Object.entries(outside)) process.stdout.write(`  ${k.padEnd(7)} ${v.size}: ${[...v].join(", ") || "-"}\n`);
process.stdout.write(`\ndegreeDayOutlierBand: ${(ddMs / Math.max(1, ddMeters)).toFixed(0)} ms per meter on average (${ddMeters} meters)\n`);
