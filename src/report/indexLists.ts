/**
 * The index's two per-building lists (the buildings table, next year's cost) cut to the rows a
 * reader acts on first when the portfolio is long, each with a sentence saying what is shown, the
 * totals over every building and a link to the page with the whole list.
 */
import type { IndexListCut, TableModel } from "./siteModel.ts";
import type { BuildingsTable } from "./buildingsTable.ts";
import type { ForecastChangeTable } from "./forecastIndex.ts";
import { formatMoney, formatMoneySigned, formatNumber } from "./format.ts";
import { signedPct } from "./forecastSection.ts";
import { BUILDING_LIST_PATH, FORECAST_LIST_PATH } from "./nav.ts";
import { indexSubset } from "./indexSubset.ts";

/** A list as the index shows it: the table (whole or cut) and, when cut, what the page says of it. */
export interface IndexList {
  table: TableModel;
  cut: IndexListCut | null;
}

/** `n` with its noun, e.g. "1 building", "48 buildings". */
export function buildingsText(n: number): string {
  return `${formatNumber(n)} ${n === 1 ? "building" : "buildings"}`;
}

/** Tie-break by name (case-insensitive, then exact) so the choice never depends on input order. */
function byName(a: string, b: string): number {
  const la = a.toLowerCase();
  const lb = b.toLowerCase();
  return la < lb ? -1 : la > lb ? 1 : a < b ? -1 : a > b ? 1 : 0;
}

/** Sum in row order, nulls as 0 (the order the index's billed-cost card sums in, so the two agree to the last digit). */
export function total(values: readonly (number | null)[]): number {
  let sum = 0;
  for (const v of values) sum += v ?? 0;
  return sum;
}

/**
 * The buildings table of the index: whole for a short portfolio; else the INDEX_LIST_SHOWN
 * buildings with the largest billed cost over the last 12 months, largest first (where a bill
 * error costs the most), with their share of the portfolio's billed cost.
 * @example indexBuildingsList(buildingsTable(input, contexts, asOf), "USD").cut?.linkText // "All 48 buildings"
 */
export function indexBuildingsList(list: BuildingsTable, currency: string): IndexList {
  const { table, lastYearCosts } = list;
  const rows = table.rows.map((cells, i) => ({ cells, cost: lastYearCosts[i] }));
  const shown = indexSubset(rows, (a, b) => (b.cost ?? -Infinity) - (a.cost ?? -Infinity) || byName(a.cells[0].text, b.cells[0].text));
  if (!shown) return { table, cut: null };
  const n = rows.length;
  const all = total(lastYearCosts);
  const part = total(shown.map((r) => r.cost));
  return {
    table: { ...table, caption: `${table.caption}: the ${formatNumber(shown.length)} of ${buildingsText(n)} with the largest billed cost, largest first`, rows: shown.map((r) => r.cells) },
    cut: {
      shown: `Showing the ${formatNumber(shown.length)} of ${buildingsText(n)} with the largest billed cost over the last 12 months, largest first.`,
      totals: `Together they were billed ${formatMoney(part, currency)}${all > 0 ? `, ${formatNumber((100 * part) / all, 1)} %` : ""} of the ${formatMoney(all, currency)} billed to all ${buildingsText(n)}.`,
      href: BUILDING_LIST_PATH,
      linkText: `All ${buildingsText(n)}`,
      linkNote: ": the same columns, in the portfolio's order, on a page of their own.",
    },
  };
}

/**
 * Sentence on the forecast changes of every building of `list`: how many cost more and less, and
 * what the changes add up to against last year's billed cost.
 * @example forecastTotalsText(list, "USD") // "Over all 48 buildings the changes add up to +$12,345.00, +1.2 % of last year's $1,000,000.00: 30 cost more, 18 less."
 */
export function forecastTotalsText(list: ForecastChangeTable, currency: string): string {
  const change = total(list.changes);
  const billed = total(list.lastYearBilled);
  const up = list.changes.filter((c) => c > 0).length;
  const down = list.changes.filter((c) => c < 0).length;
  const same = list.changes.length - up - down;
  const counts = `${formatNumber(up)} cost more, ${formatNumber(down)} less${same > 0 ? `, ${formatNumber(same)} the same` : ""}`;
  const n = list.changes.length;
  const pct = billed > 0 ? `, ${signedPct((100 * change) / billed)} of last year's ${formatMoney(billed, currency)}` : "";
  return `Over ${n === 1 ? "the one building" : `all ${buildingsText(n)}`} the changes add up to ${formatMoneySigned(change, currency)}${pct}: ${counts}.`;
}

/**
 * The forecast ranking of the index: whole for a short portfolio; else the INDEX_LIST_SHOWN
 * buildings whose cost changes most, up or down (largest absolute change: where next year's
 * budget moves), kept in the ranking's order (largest increase first), with the totals over
 * every building. Null when no building has forecast drivers.
 * @example indexForecastList(forecastChangeTable(contexts, forecasts, "USD"), "USD")?.cut // null for 20 buildings or fewer
 */
export function indexForecastList(list: ForecastChangeTable | null, currency: string): IndexList | null {
  if (!list) return null;
  const { table, changes } = list;
  const rows = table.rows.map((cells, i) => ({ cells, change: changes[i], i }));
  const shown = indexSubset(rows, (a, b) => Math.abs(b.change) - Math.abs(a.change) || byName(a.cells[0].text, b.cells[0].text));
  if (!shown) return { table, cut: null };
  shown.sort((a, b) => a.i - b.i);
  const n = rows.length;
  return {
    table: { ...table, caption: `${table.caption}: the ${formatNumber(shown.length)} of ${buildingsText(n)} whose cost changes most, up or down`, rows: shown.map((r) => r.cells) },
    cut: {
      shown: `Showing the ${formatNumber(shown.length)} of ${buildingsText(n)} whose cost changes most, up or down, from the largest increase to the largest decrease.`,
      totals: `${forecastTotalsText(list, currency)} The ${formatNumber(shown.length)} shown add up to ${formatMoneySigned(total(shown.map((r) => r.change)), currency)}.`,
      href: FORECAST_LIST_PATH,
      linkText: `Next year's cost of all ${buildingsText(n)}`,
      linkNote: ", ranked by the change, on a page of its own.",
    },
  };
}
