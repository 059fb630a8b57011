/** The table of every building: floor area, billed cost, claims, findings and use over the last 12 months. */
import type { ReportFinding, ReportInput } from "./input.ts";
import type { TableCell, TableModel } from "./siteModel.ts";
import { NOT_AVAILABLE, formatMoney, formatNumber, formatQuantity } from "./format.ts";
import { DISPUTES_PATH, buildingPath } from "./nav.ts";
import type { CommodityUsage } from "./usageSummary.ts";
import type { BuildingContext } from "./buildingPage.ts";
import { buildingUsage, last12mCost } from "./buildingPage.ts";
import { sumCents } from "./disputesPage.ts";
import type { Dispute } from "../disputes/index.ts";
import { last12MonthsText } from "./periods.ts";

/** The buildings table with each row's billed cost (portfolio currency; null = none billed), aligned with `table.rows`. */
export interface BuildingsTable {
  table: TableModel;
  lastYearCosts: (number | null)[];
}

/** Table cell of one commodity's usage, e.g. "12,345 kWh", or "—" when none. */
function usageCell(usage: readonly CommodityUsage[], commodity: CommodityUsage["commodity"]): TableCell {
  const u = usage.find((x) => x.commodity === commodity);
  if (!u || u.actualLast12m === null) return { text: NOT_AVAILABLE, sort: "" };
  return { text: formatQuantity(u.actualLast12m, u.unit), sort: String(u.actualLast12m) };
}

/** Number of audit findings of one building. */
function buildingFindingCount(findings: readonly ReportFinding[] | undefined, buildingId: string): number {
  let count = 0;
  for (const f of findings ?? []) if (f.buildingId === buildingId) count++;
  return count;
}

/** Total of one building's claims (kind `claim`), cent-exact: its share of the index's "Bills to dispute". */
function buildingClaimTotal(disputes: readonly Dispute[] | undefined, buildingId: string): number {
  return sumCents((disputes ?? []).filter((d) => d.kind === "claim" && d.buildingId === buildingId).map((d) => d.claimAmount));
}

/**
 * One row per building in `contexts` order (buildings.csv), sortable: name (linked to its page),
 * use type, floor area, billed cost over the last 12 months, its claims and findings when those
 * stages ran, use by commodity, bill count and, when ingest attributed them, rejected rows.
 * @example buildingsTable(input, contexts, asOf).table.rows.length // number of buildings
 */
export function buildingsTable(input: ReportInput, contexts: readonly BuildingContext[], asOf: string | null): BuildingsTable {
  const currency = input.portfolio.settings.currency;
  const lastYearCosts: (number | null)[] = [];
  const rows: TableCell[][] = contexts.map((ctx) => {
    const b = ctx.building;
    const bills = ctx.meters.flatMap((m) => ctx.billsByMeter.get(m.meterId) ?? []);
    const cost = last12mCost(ctx);
    lastYearCosts.push(cost);
    const usage = buildingUsage(ctx);
    const findingCount = buildingFindingCount(input.findings, b.buildingId);
    const claimed = buildingClaimTotal(input.disputes, b.buildingId);
    const auditHref = `${buildingPath(b.buildingId)}#audit-h`;
    const rejectedMap = input.rejectedRowsByBuilding;
    const rejected = rejectedMap?.get(b.buildingId) ?? 0;
    return [
      { text: b.name, href: buildingPath(b.buildingId), sort: b.name.toLowerCase() },
      { text: b.useType ?? NOT_AVAILABLE },
      { text: formatNumber(b.floorAreaM2), sort: String(b.floorAreaM2) },
      { text: formatMoney(cost, currency), sort: cost == null ? "" : String(cost) },
      // Money to claim next to the cost, so a wide table never scrolls it out of sight.
      ...(input.disputes
        ? [{ text: formatMoney(claimed, currency), sort: String(claimed), href: claimed > 0 ? DISPUTES_PATH : undefined, tone: claimed > 0 ? ("warn" as const) : undefined }]
        : []),
      ...(input.findings ? [{ text: formatNumber(findingCount), sort: String(findingCount), href: auditHref }] : []),
      ...(["electricity", "gas", "water"] as const).map((c) => usageCell(usage, c)),
      { text: formatNumber(bills.length), sort: String(bills.length) },
      // The column exists only when ingest attributed rejected rows to buildings.
      ...(rejectedMap ? [{ text: formatNumber(rejected), sort: String(rejected), tone: rejected > 0 ? ("warn" as const) : undefined }] : []),
    ];
  });
  return {
    lastYearCosts,
    table: {
      caption: `Buildings: floor area, billed cost and billed use over the last 12 months (${last12MonthsText(asOf)}; gas in therms, water in gallons)${input.disputes ? ", the total of each building's claims" : ""}${input.findings ? ` ${input.disputes ? "and" : "and each building's"} audit findings` : ""}`,
      sortable: true,
      columns: [
        { label: "Building", numeric: false },
        { label: "Use type", numeric: false },
        { label: "Floor area (m²)", numeric: true },
        { label: "Billed cost, 12 months", numeric: true },
        ...(input.disputes ? [{ label: "To dispute", numeric: true }] : []),
        ...(input.findings ? [{ label: "Findings", numeric: true }] : []),
        { label: "Electricity use", numeric: true },
        { label: "Gas use", numeric: true },
        { label: "Water use", numeric: true },
        { label: "Bills", numeric: true },
        ...(input.rejectedRowsByBuilding ? [{ label: "Rows rejected", numeric: true }] : []),
      ],
      rows,
    },
  };
}
