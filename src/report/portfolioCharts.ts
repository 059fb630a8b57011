/** Portfolio figures of the index: energy use intensity by building, findings by check with their claims; normalized change. */
import type { ReportBaseline, ReportFinding } from "./input.ts";
import type { RankingChartModel, TableModel } from "./siteModel.ts";
import type { Dispute } from "../disputes/index.ts";
import type { BuildingContext } from "./buildingPage.ts";
import { NOT_AVAILABLE, formatMoney, formatNumber } from "./format.ts";
import { shownAmount, sumCents } from "./disputesPage.ts";
import { meterYearWindow, prorateToWindow, siteKwhLast12m } from "./usageSummary.ts";
import { buildingUsage } from "./buildingPage.ts";
import { euiKwhPerM2, kwhPerM2ToKbtuPerFt2, siteKwh } from "./energy.ts";
import { checkTitle } from "./labels.ts";
import { addDays } from "../core/time/index.ts";
import { KWH_PER_THERM } from "../core/units.ts";

/** Sentence stating how the intensity ranking is computed. */
export const EUI_BASIS = `Energy use intensity = site energy over the last 12 months (each meter's 12 months up to its last read) ÷ floor area. Site energy = electricity kWh + gas therms × ${KWH_PER_THERM.toFixed(4)} kWh per therm (gas billed in ccf: × the tariff's therm per ccf first, 1.037 when it states none); water is not energy and is left out. The same figures as site_eui_kwh_m2 in portfolio.json.`;

/**
 * Most bars the EUI ranking draws. A large portfolio's chart would otherwise be thousands of bars
 * (14,000 px tall at 1,000 buildings) that nobody can read; the highest are the ones to look at,
 * and the table under the chart keeps every building, sortable.
 */
export const RANKING_MAX_BARS = 40;

/**
 * Ranking of buildings by EUI (kWh/m²) over the last 12 months (per-meter windows, the same
 * figure as `site_eui_kwh_m2` in portfolio.json), largest first, the chart drawing the
 * RANKING_MAX_BARS highest and its table every building; null when no building has energy use
 * and a floor area.
 */
export function intensityChart(contexts: readonly BuildingContext[]): RankingChartModel | null {
  const rows: { name: string; kwh: number; area: number; eui: number }[] = [];
  for (const ctx of contexts) {
    const kwh = siteKwhLast12m(buildingUsage(ctx));
    if (kwh == null) continue;
    const eui = euiKwhPerM2(kwh, ctx.building.floorAreaM2);
    if (eui == null) continue;
    rows.push({ name: ctx.building.name, kwh, area: ctx.building.floorAreaM2, eui });
  }
  if (rows.length === 0) return null;
  rows.sort((a, b) => b.eui - a.eui);
  const drawn = rows.slice(0, RANKING_MAX_BARS);
  const capped = drawn.length < rows.length;
  return {
    id: "chart-portfolio-eui",
    kind: "ranking",
    title: capped
      ? `Energy use intensity, last 12 months (kWh per m²): the ${formatNumber(drawn.length)} highest of ${formatNumber(rows.length)} buildings`
      : "Energy use intensity, last 12 months (kWh per m²)",
    description: capped
      ? `Horizontal bar chart of the ${formatNumber(drawn.length)} buildings with the highest site energy use per m² of floor area over the last 12 months, highest first; highest ${rows[0].name} at ${formatNumber(rows[0].eui, 0)} kWh/m². All ${formatNumber(rows.length)} buildings are in the table of numbers behind this chart.`
      : `Horizontal bar chart ranking ${formatNumber(rows.length)} buildings by site energy use per m² of floor area over the last 12 months, highest first; highest ${rows[0].name} at ${formatNumber(rows[0].eui, 0)} kWh/m².`,
    valueLabel: "kWh per m²",
    valueFormat: ",.1f",
    items: drawn.map((r) => ({ label: r.name, value: Math.round(r.eui * 10) / 10, note: `${formatNumber(kwhPerM2ToKbtuPerFt2(r.eui), 1)} kBtu/ft²` })),
    table: {
      caption: "Energy use intensity by building, last 12 months",
      sortable: true,
      columns: [
        { label: "Building", numeric: false },
        { label: "Site energy (kWh)", numeric: true },
        { label: "Floor area (m²)", numeric: true },
        { label: "kWh per m²", numeric: true },
        { label: "kBtu per ft²", numeric: true },
      ],
      rows: rows.map((r) => [
        { text: r.name },
        { text: formatNumber(r.kwh), sort: String(r.kwh) },
        { text: formatNumber(r.area), sort: String(r.area) },
        { text: formatNumber(r.eui, 1), sort: String(r.eui) },
        { text: formatNumber(kwhPerM2ToKbtuPerFt2(r.eui), 1), sort: String(kwhPerM2ToKbtuPerFt2(r.eui)) },
      ]),
    },
  };
}

/**
 * Findings grouped by check, with what they add up to for a finance reader: how many findings,
 * how many claims and back-billing risks have the check as their root cause (a dispute's first
 * check), the claimed total and the amount that may still be billed. Checks with the most money
 * claimed first. The claimed column sums to the index's "Bills to dispute" figure. Null when
 * there is neither a finding nor a dispute.
 * @example findingsByCheckTable(findings, disputes, "USD")?.columns[3].label // "Claimed"
 */
export function findingsByCheckTable(findings: readonly ReportFinding[] | undefined, disputes: readonly Dispute[] | undefined, currency: string): TableModel | null {
  if ((!findings || findings.length === 0) && (!disputes || disputes.length === 0)) return null;
  interface Group {
    findings: number;
    claims: Dispute[];
    risks: Dispute[];
  }
  const groups = new Map<string, Group>();
  const group = (check: string): Group => {
    let g = groups.get(check);
    if (!g) groups.set(check, (g = { findings: 0, claims: [], risks: [] }));
    return g;
  };
  for (const f of findings ?? []) group(f.check).findings++;
  for (const d of disputes ?? []) {
    const g = group(d.checks[0] ?? "");
    (d.kind === "claim" ? g.claims : g.risks).push(d);
  }
  const rows = [...groups.entries()].map(([check, g]) => ({
    check,
    g,
    claimed: sumCents(g.claims.map((d) => d.claimAmount)),
    atRisk: sumCents(g.risks.map(shownAmount)),
  }));
  rows.sort((a, b) => b.claimed - a.claimed || b.atRisk - a.atRisk || b.g.findings - a.g.findings || (a.check < b.check ? -1 : 1));
  const withDisputes = disputes !== undefined;
  return {
    caption: withDisputes
      ? `Findings by check: how many, and the claims and back-billing risks each check is the root cause of (in ${currency})`
      : "Findings by check: how many",
    sortable: true,
    columns: [
      { label: "Check", numeric: false },
      { label: "Findings", numeric: true },
      ...(withDisputes
        ? [
            { label: "Claims", numeric: true },
            { label: "Claimed", numeric: true },
            { label: "Back-billing risks", numeric: true },
            { label: "May be billed later", numeric: true },
          ]
        : []),
    ],
    rows: rows.map(({ check, g, claimed, atRisk }) => [
      { text: checkTitle(check) },
      { text: formatNumber(g.findings), sort: String(g.findings) },
      ...(withDisputes
        ? [
            { text: formatNumber(g.claims.length), sort: String(g.claims.length) },
            g.claims.length ? { text: formatMoney(claimed, currency), sort: String(claimed) } : { text: NOT_AVAILABLE, sort: "0", tone: "muted" as const },
            { text: formatNumber(g.risks.length), sort: String(g.risks.length) },
            g.risks.length ? { text: formatMoney(atRisk, currency), sort: String(atRisk) } : { text: NOT_AVAILABLE, sort: "0", tone: "muted" as const },
          ]
        : []),
    ]),
  };
}

/**
 * Weather-normalized change of portfolio site energy, last 12 months vs the 12 before, in
 * percent: each bill's use is weather-adjusted (× expected at typical ÷ expected at actual
 * weather) and prorated into each window. Each meter's window is its own last 12 months (the
 * 365 days up to its last read, no later than as-of; src/report/usageSummary.ts) and the
 * 365 days before. Only meters with a baseline for every bill touching both windows and bills
 * covering the prior window's start count. Null when none qualifies.
 */
export function normalizedChangePct(contexts: readonly BuildingContext[], baselines: readonly ReportBaseline[] | undefined): number | null {
  if (!baselines) return null;
  let now = 0;
  let before = 0;
  for (const ctx of contexts) {
    for (const m of ctx.meters) {
      const b = baselines.find((x) => x.meterId === m.meterId);
      if (!b || b.kind === "none") continue;
      const bills = ctx.billsByMeter.get(m.meterId) ?? [];
      const window = ctx.asOf === null ? null : meterYearWindow(bills, ctx.asOf);
      if (!window) continue;
      const priorWindow = { start: addDays(window.start, -365), end: window.start };
      if (bills.length === 0 || bills[0].periodStart > priorWindow.start || bills[bills.length - 1].periodEnd < window.end) continue;
      const exp = new Map(b.perBill.map((e) => [e.billId, e]));
      let n = 0;
      let p = 0;
      let complete = true;
      for (const bill of bills) {
        const inNow = prorateToWindow(1, bill.periodStart, bill.periodEnd, window);
        const inBefore = prorateToWindow(1, bill.periodStart, bill.periodEnd, priorWindow);
        if (inNow === 0 && inBefore === 0) continue;
        const e = exp.get(bill.billId);
        if (!e || !(e.expectedAtActualWeather > 0)) {
          complete = false;
          break;
        }
        const adjusted = siteKwh(m.commodity, m.unit, (bill.usage * e.expectedAtTypicalWeather) / e.expectedAtActualWeather);
        if (adjusted == null) {
          complete = false;
          break;
        }
        n += adjusted * inNow;
        p += adjusted * inBefore;
      }
      if (!complete) continue;
      now += n;
      before += p;
    }
  }
  return before > 0 ? (100 * (now - before)) / before : null;
}
