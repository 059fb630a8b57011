/** Index: buildings ranked by the forecast change against last year, with its drivers. */
import type { ReportBuildingForecast } from "./input.ts";
import type { TableModel } from "./siteModel.ts";
import type { BuildingContext } from "./buildingPage.ts";
import { formatMoney, formatMoneySigned } from "./format.ts";
import { buildingPath } from "./nav.ts";
import { signedPct } from "./forecastSection.ts";

/** The ranking with each row's figures (portfolio currency), aligned with `table.rows`. */
export interface ForecastChangeTable {
  table: TableModel;
  /** Forecast P50 minus last year's billed cost over the compared months. */
  changes: number[];
  /** Last year's billed cost over the compared months. */
  lastYearBilled: number[];
}

/**
 * One row per building with change drivers, largest increase first: last year's billed cost
 * over the compared months, forecast P50 over the same calendar months next year, the change
 * (money and percent) and its billing-error, weather, rates and usage-trend parts (they add up to the change).
 * Null when no building has drivers.
 * @example forecastChangeTable(contexts, input.buildingForecasts, "USD")?.table.rows[0][0].text // the building with the largest increase
 */
export function forecastChangeTable(contexts: readonly BuildingContext[], forecasts: readonly ReportBuildingForecast[] | undefined, currency: string): ForecastChangeTable | null {
  const rows = contexts.flatMap((ctx) => {
    const d = forecasts?.find((f) => f.buildingId === ctx.building.buildingId)?.drivers;
    return d ? [{ ctx, d }] : [];
  });
  if (rows.length === 0) return null;
  rows.sort((a, b) => b.d.change - a.d.change || (a.ctx.building.name < b.ctx.building.name ? -1 : 1));
  const money = (v: number) => ({ text: formatMoneySigned(v, currency), sort: String(v) });
  const billedOf = (d: (typeof rows)[number]["d"]) => d.lastYearBilledCost ?? d.lastYearCost;
  return {
    changes: rows.map(({ d }) => d.change),
    lastYearBilled: rows.map(({ d }) => billedOf(d)),
    table: {
      caption: "Buildings ranked by the forecast change against last year's bills over the same calendar months (billing errors corrected + weather + rates + usage trend = change)",
      sortable: true,
      columns: [
        { label: "Building", numeric: false },
        { label: "Last year, billed", numeric: true },
        { label: "Forecast (P50)", numeric: true },
        { label: "Change", numeric: true },
        { label: "Change (%)", numeric: true },
        { label: "Billing errors corrected", numeric: true },
        { label: "Weather", numeric: true },
        { label: "Rates", numeric: true },
        { label: "Usage trend", numeric: true },
      ],
      rows: rows.map(({ ctx, d }) => {
        const billed = billedOf(d);
        const pct = billed > 0 ? (100 * d.change) / billed : Number.NaN;
        return [
          { text: ctx.building.name, href: buildingPath(ctx.building.buildingId), sort: ctx.building.name.toLowerCase() },
          { text: formatMoney(billed, currency), sort: String(billed) },
          { text: formatMoney(d.forecastCost, currency), sort: String(d.forecastCost) },
          money(d.change),
          { text: signedPct(pct), sort: Number.isFinite(pct) ? String(pct) : "" },
          money(d.billingErrors ?? 0),
          money(d.weather),
          money(d.rates),
          money(d.usageTrend),
        ];
      }),
    },
  };
}
