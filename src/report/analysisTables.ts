/** Building tables fed by later stages when they ran: audit findings, weather models, forecast. */
import type { Meter } from "../domain/types.ts";
import type { ReportInput } from "./input.ts";
import type { TableModel } from "./siteModel.ts";
import { NOT_AVAILABLE, formatMoney, formatMoneySigned, formatMonth, formatNumber, formatPeriod } from "./format.ts";
import { checkTitle } from "./labels.ts";

/** Audit findings of one building, largest money at stake first; null when the audit did not run. */
export function findingsTable(buildingId: string, input: ReportInput, currency: string): TableModel | null {
  if (!input.findings) return null;
  const rows = input.findings
    .filter((f) => f.buildingId === buildingId)
    .sort((a, b) => Math.abs(b.amountAtStake ?? 0) - Math.abs(a.amountAtStake ?? 0));
  return {
    caption: "Audit findings for this building, largest amount at stake first",
    sortable: true,
    columns: [
      { label: "Finding", numeric: false },
      { label: "Severity", numeric: false },
      { label: "Meter", numeric: false },
      { label: "Period", numeric: false },
      { label: "Amount at stake", numeric: true },
      { label: "Details", numeric: false },
    ],
    rows: rows.map((f) => [
      { text: checkTitle(f.check) },
      { text: f.severity },
      { text: f.meterId ?? NOT_AVAILABLE },
      f.periodStart && f.periodEnd
        ? { text: formatPeriod(f.periodStart, f.periodEnd), sort: f.periodStart }
        : { text: NOT_AVAILABLE, sort: "" },
      f.amountAtStake == null
        ? { text: NOT_AVAILABLE, sort: "" }
        : { text: formatMoneySigned(f.amountAtStake, currency), sort: String(f.amountAtStake) },
      { text: f.message },
    ]),
  };
}

/** Monthly cost forecast of one building (all meters); null without forecast rows. */
export function forecastTable(buildingId: string, input: ReportInput, currency: string): TableModel | null {
  const rows = (input.forecast ?? []).filter((f) => f.buildingId === buildingId);
  if (rows.length === 0) return null;
  const byMonth = new Map<string, { p10: number; p50: number; p90: number }>();
  for (const r of rows) {
    const s = byMonth.get(r.month) ?? { p10: 0, p50: 0, p90: 0 };
    // Percentiles of a sum are not sums of percentiles; the per-month sum of p10/p90 is a
    // conservative (wider) range, labelled as such on the page.
    s.p10 += r.costP10;
    s.p50 += r.costP50;
    s.p90 += r.costP90;
    byMonth.set(r.month, s);
  }
  return {
    caption: "Cost forecast by month, all meters (low and high are sums of per-meter 10th and 90th percentiles)",
    sortable: false,
    columns: [
      { label: "Month", numeric: false },
      { label: "Low (P10)", numeric: true },
      { label: "Likely (P50)", numeric: true },
      { label: "High (P90)", numeric: true },
    ],
    rows: [...byMonth.entries()]
      .sort(([a], [b]) => (a < b ? -1 : 1))
      .map(([month, s]) => [
        { text: formatMonth(month), sort: month },
        { text: formatMoney(s.p10, currency) },
        { text: formatMoney(s.p50, currency) },
        { text: formatMoney(s.p90, currency) },
      ]),
  };
}

/** Chosen weather model per meter with its fit statistics; null without models. */
export function modelsTable(meters: Meter[], input: ReportInput): TableModel | null {
  const ids = new Set(meters.map((m) => m.meterId));
  const rows = (input.models ?? []).filter((m) => ids.has(m.meterId));
  if (rows.length === 0) return null;
  return {
    caption: "Weather model chosen per meter, with ASHRAE Guideline 14 fit statistics",
    sortable: false,
    columns: [
      { label: "Meter", numeric: false },
      { label: "Model", numeric: false },
      { label: "CV(RMSE)", numeric: true },
      { label: "NMBE", numeric: true },
      { label: "R²", numeric: true },
      { label: "Observations", numeric: true },
    ],
    rows: rows.map((m) => [
      { text: m.meterId },
      { text: m.kind },
      { text: m.cvRmsePct == null ? NOT_AVAILABLE : `${formatNumber(m.cvRmsePct, 1)}%` },
      { text: m.nmbePct == null ? NOT_AVAILABLE : `${formatNumber(m.nmbePct, 2)}%` },
      { text: formatNumber(m.r2, 3) },
      { text: formatNumber(m.n) },
    ]),
  };
}

