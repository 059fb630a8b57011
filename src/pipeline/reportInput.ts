/**
 * Maps the pipeline's results onto the report stage's input (src/report/input.ts): plain data,
 * nothing computed here that a page shows without a source in the pipeline.
 */
import type { InputIssue } from "../core/issues.ts";
import type { Portfolio } from "../domain/types.ts";
import type { Finding } from "../audit/types.ts";
import type { ForecastBundle } from "../forecast/index.ts";
import type { WeatherGap } from "../ingest/weatherGrid.ts";
import type { MonthTotal } from "../ingest/monthlyTotals.ts";
import type { ReportBaseline, ReportInput, ReportMeterQuality, ReportModelSummary } from "../report/index.ts";
import type { BuildingResults } from "./build.ts";
import type { MeterBaseline } from "./baselines.ts";
import type { MeterQuality } from "./dataQuality.ts";
import type { PricedBill } from "./priceBills.ts";

const CURVE_SAMPLES = 60;

export interface ReportInputParts {
  portfolio: Portfolio;
  priced: Map<string, PricedBill>;
  monthlyMetered: Map<string, MonthTotal[]>;
  issues: InputIssue[];
  buildDate: string;
  findings: Finding[];
  results: BuildingResults[];
  quality: MeterQuality[];
  weatherGaps: WeatherGap[];
  forecast: ForecastBundle | null;
}

export function toReportInput(parts: ReportInputParts): ReportInput {
  const { portfolio, results, forecast } = parts;
  const unitOf = new Map(portfolio.meters.map((m) => [m.meterId, m.unit]));
  const baselines = results.flatMap((r) => r.baselines);
  return {
    portfolio: parts.portfolio,
    priced: parts.priced,
    monthlyMetered: parts.monthlyMetered,
    issues: parts.issues,
    buildDate: parts.buildDate,
    rejectedRowsByBuilding: undefined,
    findings: parts.findings,
    models: modelSummaries(results),
    baselines: baselines.map((b) => reportBaseline(b, unitOf.get(b.meterId) ?? "")),
    quality: parts.quality.map(reportQuality),
    weatherDetections: parts.weatherGaps.map((g) => ({ stationId: g.stationId, startMs: g.startMs, endMs: g.endMs, hours: g.hours, action: g.action })),
    forecast: forecast?.forecast.rows.map((r) => ({
      buildingId: r.building_id,
      meterId: r.meter_id,
      month: r.month,
      usageP50: r.usage_p50,
      costP10: r.cost_p10,
      costP50: r.cost_p50,
      costP90: r.cost_p90,
    })),
    trackRecord: forecast?.trackRecord.meters.flatMap((m) =>
      m.model && m.model.coverage !== null
        ? [{
            meterId: m.meterId,
            annualCostErrorPct: m.model.annualErrorPct,
            monthlyCvRmsePct: m.model.cvRmsePct,
            coverage: m.model.coverage,
            naiveAnnualCostErrorPct: m.naive?.annualErrorPct ?? Number.NaN,
          }]
        : [],
    ).filter((t) => Number.isFinite(t.naiveAnnualCostErrorPct)),
    forecastTotals: forecast?.forecast.buildings.flatMap((b) => (b.costNext12m ? [{ buildingId: b.buildingId, ...b.costNext12m }] : [])),
    portfolioForecast: forecast?.forecast.costNext12m ?? undefined,
  };
}

/** One row per model a page lists: the change-point model (normalization), the degree-day model (outlier band), the hourly model. */
function modelSummaries(results: BuildingResults[]): ReportModelSummary[] {
  const rows: ReportModelSummary[] = [];
  for (const r of results) {
    for (const b of r.baselines) {
      rows.push({ ...b.summary, kind: b.fit ? `${b.fit.kind} change-point (normalization)` : "none" });
      const dd = b.degreeDay?.fit;
      if (dd) {
        rows.push({
          meterId: b.meterId,
          kind: `degree-day ${dd.form} (outlier band)`,
          cvRmsePct: dd.stats.cvRmsePct,
          nmbePct: dd.stats.nmbePct,
          r2: dd.stats.rSquared,
          n: dd.stats.n,
        });
      }
    }
    for (const outcome of r.intervalBaselines) {
      const chosen = outcome.baseline?.summary.chosen;
      if (!chosen?.cv) continue;
      rows.push({
        meterId: outcome.meterId,
        kind: `hourly ${chosen.kind}${chosen.members ? ` of ${chosen.members.map((m) => m.kind).join(" + ")}` : ""} (cross-validated)`,
        cvRmsePct: chosen.cv.cv_rmse,
        nmbePct: chosen.cv.nmbe,
        r2: chosen.cv.r2,
        n: chosen.cv.n,
      });
    }
  }
  return rows;
}

function reportBaseline(b: MeterBaseline, unit: string): ReportBaseline {
  const temps = b.scatter.map((p) => p.temp);
  const lo = Math.min(...temps);
  const hi = Math.max(...temps);
  const fit = b.fit;
  const curve =
    fit && temps.length > 0 && hi > lo
      ? Array.from({ length: CURVE_SAMPLES + 1 }, (_, i) => {
          const temp = lo + ((hi - lo) * i) / CURVE_SAMPLES;
          return { temp, usePerDay: fit.predict(temp) };
        })
      : [];
  return {
    meterId: b.meterId,
    kind: fit?.kind ?? "none",
    tempUnit: b.tempUnit,
    unit,
    points: b.scatter,
    curve,
    stats: fit ? { cvRmsePct: fit.stats.cvRmsePct, nmbePct: fit.stats.nmbePct, r2: fit.stats.rSquared, n: fit.stats.n, p: fit.parameterCount } : null,
    meetsGuideline14: b.meetsGuideline14,
    normalizedAnnual: b.normalizedAnnual,
    typicalSource: b.typicalSource,
    tried: b.tried.map((t) => ({ kind: t.kind, accepted: t.accepted, reasons: t.reasons, cvRmsePct: t.cvRmsePct, nmbePct: t.nmbePct, r2: t.r2 })),
    perBill: b.perBill.map((p) => {
      const band = b.expectedByBill.get(p.billId);
      return { ...p, ...(band ? { bandLow: band.low, bandHigh: band.high } : {}) };
    }),
  };
}

function reportQuality(q: MeterQuality): ReportMeterQuality {
  return {
    meterId: q.meterId,
    buildingId: q.buildingId,
    intervalMinutes: q.intervalMinutes,
    detections: q.detections.map((d) => ({ kind: d.kind, startMs: d.startMs, endMs: d.endMs, intervals: d.intervals, action: d.action, detail: d.detail })),
    mask: q.mask,
    alignment: q.alignment
      ? {
          suggestedOffsetHours: q.alignment.suggestedOffsetHours,
          appliedOffsetHours: q.appliedOffsetHours,
          strong: q.alignment.strong,
          note: q.alignment.evidence.note,
          scores: q.alignment.evidence.scores,
        }
      : null,
  };
}
