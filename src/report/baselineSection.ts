/** Building-page view of each meter's bill-level weather baseline (usage vs temperature). */
import type { Bill, Meter } from "../domain/types.ts";
import type { ReportBaseline, ReportFitStats } from "./input.ts";
import type { BaselineScatterChartModel, BaselineSection, BaselineTimeChartModel, TableModel } from "./siteModel.ts";
import { NOT_AVAILABLE, formatNumber, formatPeriod, formatQuantity } from "./format.ts";
import { dayNumberToIsoDate, isoDateToDayNumber } from "../core/time/index.ts";
import { checkTitle, commodityLabel } from "./labels.ts";
import { daysBetween } from "../core/time/index.ts";
import { GUIDELINE14_LIMITS, meetsGuideline14 } from "../model/index.ts";

/**
 * Why a bill was left out of the fit, in plain words: a check code the model stage names
 * ("audit finding: usage-outlier") becomes the check's title.
 * @example exclusionText("audit finding: duplicate-bill") // "audit finding: possible duplicate bill"
 */
export function exclusionText(reason: string): string {
  return reason.replace(/^audit finding: ([a-z-]+)$/u, (_m, code: string) => `audit finding: ${checkTitle(code).toLowerCase()}`);
}

/** ASHRAE Guideline 14 calibration limits for monthly data, percent (defined in src/model/stats.ts). */
const G14_MONTHLY_CVRMSE_PCT = GUIDELINE14_LIMITS.monthly.cvRmsePct;
const G14_MONTHLY_NMBE_PCT = GUIDELINE14_LIMITS.monthly.nmbeAbsPct;

/**
 * Whether fit statistics meet Guideline 14 for monthly data: CV(RMSE) ≤ 15 % and |NMBE| ≤ 5 %
 * (limits inclusive).
 * @example meetsMonthlyGuideline14({ cvRmsePct: 15, nmbePct: -5, r2: 0.9, n: 12, p: 3 }) // true
 */
export function meetsMonthlyGuideline14(stats: Pick<ReportFitStats, "cvRmsePct" | "nmbePct">): boolean {
  return meetsGuideline14(stats, "monthly");
}

const KIND_NAMES: Record<string, string> = {
  "1P": "constant (1P)",
  "2P": "straight line (2P)",
  "3PH": "three-parameter heating (3PH)",
  "3PC": "three-parameter cooling (3PC)",
  "4P": "four-parameter (4P)",
  "5P": "five-parameter (5P)",
  none: "no model",
};

/** @example modelKindLabel("3PH") // "three-parameter heating (3PH)" */
function modelKindLabel(kind: string): string {
  return KIND_NAMES[kind] ?? kind;
}

function pct(v: number | null | undefined, digits = 1): string {
  return v == null || !Number.isFinite(v) ? NOT_AVAILABLE : `${formatNumber(v, digits)} %`;
}

/**
 * The plain verdict on a baseline's fit.
 * @example verdictFor(null) // { tone: "none", text: "No weather model was accepted …" }
 */
export function verdictFor(stats: ReportFitStats | null): { tone: "ok" | "warn" | "none"; text: string } {
  if (!stats) {
    return { tone: "none", text: "No weather model was accepted for this meter, so its use is not weather-normalized." };
  }
  const cv = `CV(RMSE) ${pct(stats.cvRmsePct)}`;
  const nmbe = `NMBE ${pct(stats.nmbePct, 2)}`;
  if (meetsMonthlyGuideline14(stats)) {
    return { tone: "ok", text: `Close fit: ${cv} and ${nmbe} are inside the monthly limits of ASHRAE Guideline 14 (${G14_MONTHLY_CVRMSE_PCT} % and ±${G14_MONTHLY_NMBE_PCT} %), so this meter's weather-normalized figures are fit for comparing one year with another.` };
  }
  const misses: string[] = [];
  if (stats.cvRmsePct > G14_MONTHLY_CVRMSE_PCT) misses.push(`${cv} is above ${G14_MONTHLY_CVRMSE_PCT} %`);
  if (Math.abs(stats.nmbePct) > G14_MONTHLY_NMBE_PCT) misses.push(`${nmbe} is outside ±${G14_MONTHLY_NMBE_PCT} %`);
  return { tone: "warn", text: `Loose fit: ${misses.join(" and ")}, outside the monthly limits of ASHRAE Guideline 14. Treat this meter's weather-normalized figures as rough.` };
}

function statsTable(b: ReportBaseline, stats: ReportFitStats): TableModel {
  const yes = (ok: boolean) => ({ text: ok ? "yes" : "no", tone: ok ? undefined : ("warn" as const) });
  return {
    caption: `Fit statistics of meter ${b.meterId}'s model against ASHRAE Guideline 14 (monthly data)`,
    sortable: false,
    columns: [
      { label: "Statistic", numeric: false },
      { label: "Value", numeric: true },
      { label: "Guideline 14 limit", numeric: false },
      { label: "Within limit", numeric: false },
    ],
    rows: [
      [{ text: "CV(RMSE)" }, { text: pct(stats.cvRmsePct) }, { text: `at most ${G14_MONTHLY_CVRMSE_PCT} %` }, yes(stats.cvRmsePct <= G14_MONTHLY_CVRMSE_PCT)],
      [{ text: "NMBE" }, { text: pct(stats.nmbePct, 2) }, { text: `between −${G14_MONTHLY_NMBE_PCT} % and +${G14_MONTHLY_NMBE_PCT} %` }, yes(Math.abs(stats.nmbePct) <= G14_MONTHLY_NMBE_PCT)],
      [{ text: "R²" }, { text: formatNumber(stats.r2, 3) }, { text: "none (shown for reference)" }, { text: NOT_AVAILABLE, tone: "muted" }],
      [{ text: "Bills fitted (n)" }, { text: formatNumber(stats.n) }, { text: "none" }, { text: NOT_AVAILABLE, tone: "muted" }],
      [{ text: "Model parameters (p)" }, { text: formatNumber(stats.p) }, { text: "none" }, { text: NOT_AVAILABLE, tone: "muted" }],
    ],
  };
}

function triedTable(b: ReportBaseline): TableModel | null {
  if (b.tried.length === 0) return null;
  return {
    caption: `Every model tried for meter ${b.meterId}`,
    sortable: false,
    columns: [
      { label: "Model", numeric: false },
      { label: "Outcome", numeric: false },
      { label: "CV(RMSE)", numeric: true },
      { label: "NMBE", numeric: true },
      { label: "R²", numeric: true },
      { label: "Why", numeric: false },
    ],
    rows: b.tried.map((t) => [
      { text: modelKindLabel(t.kind) },
      { text: t.kind === b.kind ? "chosen" : t.accepted ? "acceptable, not chosen" : "rejected", tone: t.kind === b.kind ? undefined : t.accepted ? undefined : ("muted" as const) },
      { text: pct(t.cvRmsePct) },
      { text: pct(t.nmbePct, 2) },
      { text: formatNumber(t.r2, 3) },
      { text: t.reasons.length ? t.reasons.join("; ") : NOT_AVAILABLE },
    ]),
  };
}

const round = (v: number, digits: number) => Math.round(v * 10 ** digits) / 10 ** digits;

function scatterChart(b: ReportBaseline, bills: Map<string, Bill>, idBase: string): BaselineScatterChartModel {
  const degree = `°${b.tempUnit}`;
  const points = b.points.map((p) => {
    const bill = bills.get(p.billId);
    return {
      billId: p.billId,
      period: bill ? formatPeriod(bill.periodStart, bill.periodEnd) : p.billId,
      temp: round(p.temp, 2),
      usePerDay: round(p.usePerDay, 3),
      status: p.excluded ? `left out: ${exclusionText(p.excluded)}` : "used in the fit",
    };
  });
  const useLabel = `Use per day (${b.unit})`;
  const tempLabel = `Mean outdoor temperature (${degree})`;
  return {
    id: `${idBase}-scatter`,
    kind: "baseline-scatter",
    title: `Meter ${b.meterId}: use per day against outdoor temperature`,
    description: `Scatter chart of meter ${b.meterId}: one point per bill, the bill period's mean outdoor temperature in ${degree} against use per day in ${b.unit}; ${b.curve.length > 1 ? `the line is the fitted ${modelKindLabel(b.kind)} model` : "no model line"}; bills left out of the fit have their own colour and shape.`,
    tempLabel,
    useLabel,
    points,
    curve: b.curve.map((c) => ({ temp: round(c.temp, 2), usePerDay: round(c.usePerDay, 3) })),
    table: {
      caption: `Bills of meter ${b.meterId}: mean temperature and use per day`,
      sortable: true,
      columns: [
        { label: "Bill", numeric: false },
        { label: "Period", numeric: false },
        { label: tempLabel, numeric: true },
        { label: useLabel, numeric: true },
        { label: "In the fit", numeric: false },
      ],
      rows: points.map((p) => [
        { text: p.billId },
        { text: p.period, sort: bills.get(p.billId)?.periodStart ?? "" },
        { text: formatNumber(p.temp, 1), sort: String(p.temp) },
        { text: formatQuantity(p.usePerDay, b.unit), sort: String(p.usePerDay) },
        { text: p.status },
      ]),
    },
  };
}

function timeChart(b: ReportBaseline, meterBills: Bill[], idBase: string): BaselineTimeChartModel | null {
  const expected = new Map(b.perBill.map((e) => [e.billId, e]));
  const rows = meterBills
    .map((bill) => {
      const days = daysBetween(bill.periodStart, bill.periodEnd);
      const e = expected.get(bill.billId);
      if (days <= 0 || !e) return null;
      const mid = dayNumberToIsoDate(Math.floor((isoDateToDayNumber(bill.periodStart) + isoDateToDayNumber(bill.periodEnd)) / 2));
      return {
        billId: bill.billId,
        period: formatPeriod(bill.periodStart, bill.periodEnd),
        mid,
        actualPerDay: round(bill.usage / days, 3),
        expectedPerDay: round(e.expectedAtActualWeather / days, 3),
        lowPerDay: e.bandLow == null || e.bandHigh == null ? null : round(e.bandLow / days, 3),
        highPerDay: e.bandLow == null || e.bandHigh == null ? null : round(e.bandHigh / days, 3),
      };
    })
    .filter((r): r is NonNullable<typeof r> => r !== null);
  if (rows.length === 0) return null;
  const useLabel = `Use per day (${b.unit})`;
  const hasBand = rows.some((r) => r.lowPerDay != null);
  return {
    id: `${idBase}-time`,
    kind: "baseline-time",
    title: `Meter ${b.meterId}: actual use against the model, bill by bill`,
    description: `Chart over time for meter ${b.meterId}: bars are each bill's actual use per day in ${b.unit}, the line is what the weather model expects for the same period's weather${hasBand ? ", the shaded band its prediction band (bills outside it are reported as usage outliers)" : ""}, ${rows[0].period.split(" – ")[0]} to ${rows[rows.length - 1].period.split(" – ")[1]}.`,
    useLabel,
    bills: rows,
    hasBand,
    table: {
      caption: `Meter ${b.meterId}: actual and expected use per day, by bill`,
      sortable: false,
      columns: [
        { label: "Period", numeric: false },
        { label: `Actual (${b.unit}/day)`, numeric: true },
        { label: `Expected (${b.unit}/day)`, numeric: true },
        ...(hasBand ? [{ label: `Band (${b.unit}/day)`, numeric: true }] : []),
        { label: "Difference", numeric: true },
      ],
      rows: rows.map((r) => [
        { text: r.period, sort: r.mid },
        { text: formatQuantity(r.actualPerDay, b.unit) },
        { text: formatQuantity(r.expectedPerDay, b.unit) },
        ...(hasBand ? [{ text: r.lowPerDay == null || r.highPerDay == null ? NOT_AVAILABLE : `${formatQuantity(r.lowPerDay, "")} – ${formatQuantity(r.highPerDay, b.unit)}` }] : []),
        { text: r.expectedPerDay > 0 ? pct((100 * (r.actualPerDay - r.expectedPerDay)) / r.expectedPerDay) : NOT_AVAILABLE },
      ]),
    },
  };
}

/**
 * One baseline section per meter of the building that has a baseline, in meter order.
 * @example baselineSections(meters, input.baselines, billsByMeter)[0].verdictTone // "ok"
 */
export function baselineSections(meters: Meter[], baselines: readonly ReportBaseline[] | undefined, billsByMeter: Map<string, Bill[]>): BaselineSection[] {
  if (!baselines) return [];
  const sections: BaselineSection[] = [];
  for (const m of meters) {
    const b = baselines.find((x) => x.meterId === m.meterId);
    if (!b) continue;
    const meterBills = billsByMeter.get(m.meterId) ?? [];
    const byId = new Map(meterBills.map((x) => [x.billId, x]));
    const idBase = `baseline-${m.meterId.replace(/[^A-Za-z0-9_-]/g, "_")}`;
    const verdict = verdictFor(b.kind === "none" ? null : b.stats);
    const charts = [scatterChart(b, byId, idBase), ...(b.kind === "none" ? [] : [timeChart(b, meterBills, idBase)].filter((c) => c !== null))];
    sections.push({
      meterId: m.meterId,
      heading: `${commodityLabel(m.commodity)} meter ${m.meterId}`,
      verdict: verdict.text,
      verdictTone: verdict.tone,
      facts: [
        { label: "Model chosen", value: modelKindLabel(b.kind) },
        { label: "Weather-normalized use, typical year", value: formatQuantity(b.normalizedAnnual, b.unit) },
        { label: "Typical weather from", value: b.typicalSource === "normals" ? "station normals" : b.typicalSource === "history" ? "the station's own history" : NOT_AVAILABLE },
        { label: "Bills in the fit", value: formatNumber(b.points.filter((p) => !p.excluded).length) },
      ],
      charts,
      statsTable: b.stats && b.kind !== "none" ? statsTable(b, b.stats) : null,
      triedTable: triedTable(b),
    });
  }
  return sections;
}
