/**
 * Building-page forecast: totals with range, the monthly chart (P10–P90 band, P50, last year's
 * bills), a budget by month and commodity, the drivers of the change vs last year, the
 * escalation assumption, and how well the method did on past data.
 */
import type { Commodity, Meter, PortfolioSettings } from "../domain/types.ts";
import type { ReportAccuracy, ReportBuildingForecast, ReportCostRange, ReportForecastDrivers, ReportInput } from "./input.ts";
import type { ForecastChartModel, ForecastSection, TableModel } from "./siteModel.ts";
import { NOT_AVAILABLE, formatMoney, formatMoneySigned, formatMonth, formatNumber } from "./format.ts";
import { forecastTable } from "./analysisTables.ts";
import { commodityLabel } from "./labels.ts";
import { roundCents } from "../core/money.ts";

/** Signed percent with one decimal and a true minus sign, e.g. "+1.2 %", "−17.7 %". */
export function signedPct(v: number): string {
  if (!Number.isFinite(v)) return NOT_AVAILABLE;
  const r = Math.round(v * 10) / 10;
  return r === 0 ? "0 %" : `${r > 0 ? "+" : "−"}${formatNumber(Math.abs(r), 1)} %`;
}

function trackRecordTable(meters: Meter[], input: ReportInput): TableModel | null {
  const ids = new Set(meters.map((m) => m.meterId));
  const rows = (input.trackRecord ?? []).filter((t) => ids.has(t.meterId));
  const notes = (input.trackRecordNotes ?? []).filter((t) => ids.has(t.meterId));
  if (rows.length === 0 && notes.length === 0) return null;
  return {
    caption: "Track record: the same method forecasting the past year from the data before it, compared with the bills over the same months as the naive forecast (the range is calibrated on other years only)",
    sortable: false,
    columns: [
      { label: "Meter", numeric: false },
      { label: "Annual cost error", numeric: true },
      { label: "Same month last year, annual error", numeric: true },
      { label: "Monthly CV(RMSE)", numeric: true },
      { label: "Months inside the range", numeric: true },
    ],
    rows: rows.map((t) => [
      { text: t.meterId },
      { text: signedPct(t.annualCostErrorPct) },
      { text: signedPct(t.naiveAnnualCostErrorPct) },
      { text: Number.isFinite(t.monthlyCvRmsePct) ? `${formatNumber(t.monthlyCvRmsePct, 1)} %` : NOT_AVAILABLE },
      { text: Number.isFinite(t.coverage) ? `${formatNumber(t.coverage * 100, 0)} %` : NOT_AVAILABLE },
    ]).concat(notes.map((n) => [
      { text: n.meterId },
      { text: n.note, tone: "muted" as const },
      { text: NOT_AVAILABLE, tone: "muted" as const },
      { text: NOT_AVAILABLE, tone: "muted" as const },
      { text: NOT_AVAILABLE, tone: "muted" as const },
    ])),
  };
}

function pct(v: number | null, digits = 1): string {
  return v === null || !Number.isFinite(v) ? NOT_AVAILABLE : `${formatNumber(v, digits)} %`;
}

/**
 * How the forecast was made, in sentences and two tables: the weather basis chosen by the
 * rolling-origin backtests (every basis scored), and each origin's model-vs-naive figures with
 * its out-of-sample coverage. Null when the forecast stage did not run.
 * @example forecastMethodShown(input, meters)?.sentences[0] // "Typical weather: the mean of the most recent 10 years …"
 */
export function forecastMethodShown(input: Pick<ReportInput, "forecastMethod">, meters: readonly Meter[]): { sentences: string[]; tables: TableModel[] } | null {
  const m = input.forecastMethod;
  if (!m) return null;
  const ids = new Set(meters.map((x) => x.meterId));
  const sentences = [`Typical weather: ${m.basisLabel}. Why: ${m.basisReason}.`];
  if (m.adjustmentLabel) {
    sentences.push(`Adjustment by calendar month: ${m.adjustmentLabel}; of the adjustments tried, it gave the smallest annual cost error plus monthly CV(RMSE) on the same backtests.`);
  }
  if (m.calibrated) {
    sentences.push(
      `The range (P10 to P90) is the model's prediction noise widened by a factor of ${formatNumber(m.factor, 2)}, the factor that put about 80 % of backtest meter-months inside it. Judged on years the factor was not chosen on, ${pct(m.coverage === null ? null : m.coverage * 100, 0)} of meter-months fell inside.`,
    );
  } else {
    sentences.push("The range is the model's own (uncalibrated): no meter has the 24 months of bills a backtest needs, so it has not been checked against a past year.");
  }
  const own = m.uncalibratedMeters.filter((u) => ids.has(u.meterId));
  if (m.calibrated && own.length > 0) {
    sentences.push(`Uncalibrated range (the model's own, not checked against a past year): ${own.map((u) => `${u.meterId} (${formatNumber(u.months)} months of bills)`).join(", ")}.`);
  }
  if (m.correctedBills > 0) {
    sentences.push(`${formatNumber(m.correctedBills)} ${m.correctedBills === 1 ? "bill" : "bills"} the audit found wrong ${m.correctedBills === 1 ? "is" : "are"} used as ${m.correctedBills === 1 ? "it" : "they"} should have been (the corrected amounts of the dispute list), in the backtests and as last year's base.`);
  }
  const tables: TableModel[] = [];
  if (m.bases.length > 0) {
    tables.push({
      caption: "Weather bases compared on the rolling-origin backtests (mean over the origins); the smallest annual cost error is used",
      sortable: false,
      columns: [
        { label: "Typical weather", numeric: false },
        { label: "Mean absolute annual cost error per meter", numeric: true },
        { label: "Monthly CV(RMSE)", numeric: true },
      ],
      rows: m.bases.map((b) => [
        { text: `${b.label}${b.chosen ? " (used)" : ""}` },
        { text: pct(b.meanAbsAnnualErrorPct) },
        { text: pct(b.cvRmsePct) },
      ]),
    });
  }
  if (m.adjustments && m.adjustments.length > 0) {
    tables.push({
      caption: "Adjustments by calendar month compared on the same backtests (mean over the origins); the smallest sum of the two errors is used",
      sortable: false,
      columns: [
        { label: "Adjustment", numeric: false },
        { label: "Mean absolute annual cost error per meter", numeric: true },
        { label: "Monthly CV(RMSE)", numeric: true },
      ],
      rows: m.adjustments.map((a) => [{ text: `${a.label}${a.chosen ? " (used)" : ""}` }, { text: pct(a.meanAbsAnnualErrorPct) }, { text: pct(a.cvRmsePct) }]),
    });
  }
  if (m.origins.length > 0) {
    tables.push({
      caption: "Backtests by origin: forecast made at the cut date from the data before it, compared with the next 12 months of bills (whole portfolio, same meter-months for both forecasts)",
      sortable: false,
      columns: [
        { label: "Cut date", numeric: false },
        { label: "Meters (months of bills before the cut)", numeric: false },
        { label: "Annual cost error, forecast", numeric: true },
        { label: "Annual cost error, same month last year", numeric: true },
        { label: "Monthly CV(RMSE), forecast", numeric: true },
        { label: "Monthly CV(RMSE), same month last year", numeric: true },
        { label: "Inside the range", numeric: true },
      ],
      rows: m.origins.map((o) => [
        { text: o.cut },
        { text: `${formatNumber(o.meters)} (${o.historyMonths.min === o.historyMonths.max ? formatNumber(o.historyMonths.min) : `${formatNumber(o.historyMonths.min)}–${formatNumber(o.historyMonths.max)}`})` },
        { text: o.modelAnnualErrorPct === null ? NOT_AVAILABLE : signedPct(o.modelAnnualErrorPct) },
        { text: o.naiveAnnualErrorPct === null ? NOT_AVAILABLE : signedPct(o.naiveAnnualErrorPct) },
        { text: pct(o.modelCvRmsePct) },
        { text: pct(o.naiveCvRmsePct) },
        { text: `${pct(o.coverage === null ? null : o.coverage * 100, 0)}${o.calibrated ? "" : " (model's own range, uncalibrated)"}` },
      ]),
    });
  }
  return { sentences, tables };
}

/**
 * One line comparing the backtest with the naive "same month last year" forecast: better when
 * its annual cost error is smaller in size by more than 0.5 percentage points, worse when
 * larger by more, otherwise about as good; with the share of months inside the 80 % range.
 * @example trackRecordVerdict({ model: { annualErrorPct: -1.5, … }, naive: { annualErrorPct: 4.2, … } }) // "Better than … missed … by 1.5 % …"
 */
export function trackRecordVerdict(record: { model: ReportAccuracy | null; naive: ReportAccuracy | null } | null | undefined): string | null {
  const model = record?.model;
  if (!model || !Number.isFinite(model.annualErrorPct)) return null;
  const missed = `missed the year's cost by ${formatNumber(Math.abs(model.annualErrorPct), 1)} %`;
  // Coverage of a building or the portfolio is pooled over meter-months, so it is given as a share, not "k of n months".
  const inside = model.coverage != null ? ` ${formatNumber(model.coverage * 100, 0)} % of the months compared fell inside the 80 % range.` : "";
  const naive = record?.naive;
  if (model.months < 1) return null;
  if (!naive || !Number.isFinite(naive.annualErrorPct)) {
    return `Forecasting the past year, the method ${missed}; there was no earlier year to compare a naive forecast with.${inside}`;
  }
  const gap = Math.abs(naive.annualErrorPct) - Math.abs(model.annualErrorPct);
  const verdict = gap > 0.5 ? "Better than" : gap < -0.5 ? "Worse than" : "About as good as";
  return `${verdict} repeating last year's bills: forecasting the past year, the method ${missed}, against ${formatNumber(Math.abs(naive.annualErrorPct), 1)} % for the same month last year.${inside}`;
}

/** Chart model of the building's monthly forecast; null without monthly bands. */
function forecastChart(buildingId: string, f: ReportBuildingForecast, currency: string): ForecastChartModel | null {
  if (f.monthly.length === 0) return null;
  const first = f.monthly[0]!.month;
  const last = f.monthly[f.monthly.length - 1]!.month;
  const withLast = f.monthly.filter((m) => m.lastYearCost != null).length;
  return {
    id: `forecast-${buildingId.replace(/[^A-Za-z0-9_-]/g, "_")}-monthly`,
    kind: "forecast-band",
    title: "Cost forecast by month",
    description: `Forecast cost per month, ${formatMonth(first)} to ${formatMonth(last)}: the shaded band holds 80 % of the outcomes (P10 to P90), the line is the likely cost (P50)${withLast > 0 ? ", and the dots are what the same calendar month cost last year" : ""}.`,
    valueLabel: `Cost (${currency})`,
    months: f.monthly.map((m) => ({ month: m.month, p10: m.p10, p50: m.p50, p90: m.p90, lastYear: m.lastYearCost, lastYearMonth: m.lastYearMonth })),
    table: {
      caption: "Cost forecast by month for the whole building, with the same month last year (low and high are the 10th and 90th percentiles of the building's monthly cost)",
      sortable: false,
      columns: [
        { label: "Month", numeric: false },
        { label: "Low (P10)", numeric: true },
        { label: "Likely (P50)", numeric: true },
        { label: "High (P90)", numeric: true },
        { label: "Same month last year, billed", numeric: true },
      ],
      rows: f.monthly.map((m) => [
        { text: formatMonth(m.month), sort: m.month },
        { text: formatMoney(m.p10, currency) },
        { text: formatMoney(m.p50, currency) },
        { text: formatMoney(m.p90, currency) },
        m.lastYearCost == null ? { text: NOT_AVAILABLE, tone: "muted" as const } : { text: formatMoney(m.lastYearCost, currency) },
      ]),
    },
  };
}

/**
 * Budget: likely cost (P50) by month and commodity, then each commodity's total over the first
 * `totalMonths` months with its 80 % range; with several commodities, a whole-building column
 * (the building's own monthly bands and `total`). Every figure is a median of its own (of that
 * commodity's scenario sums), so the months do not add up exactly to the total.
 */
export function budgetTable(f: ReportBuildingForecast & { total?: ReportCostRange | null }, currency: string): TableModel | null {
  if (f.byCommodity.length === 0) return null;
  const months = f.monthly.map((m) => m.month);
  const p50At = (c: ReportBuildingForecast["byCommodity"][number], month: string) => c.monthly.find((m) => m.month === month)?.p50;
  const multi = f.byCommodity.length > 1;
  const building = multi ? f.monthly : null;
  const rows = months.map((month, k) => [
    { text: formatMonth(month), sort: month },
    ...f.byCommodity.map((c) => ({ text: formatMoney(p50At(c, month), currency) })),
    ...(building ? [{ text: formatMoney(building[k]!.p50, currency) }] : []),
  ]);
  const totalLabel = `Total, ${formatNumber(f.totalMonths)} ${f.totalMonths === 1 ? "month" : "months"} (P50)`;
  rows.push([
    { text: totalLabel, sort: "~total" },
    ...f.byCommodity.map((c) => ({ text: formatMoney(c.total?.p50, currency) })),
    ...(building ? [{ text: formatMoney(f.total?.p50, currency) }] : []),
  ]);
  // The range as two rows (low, high) keeps every cell one number, like the rest of the table.
  for (const [label, key] of [["Low total (P10)", "p10"], ["High total (P90)", "p90"]] as const) {
    rows.push([
      { text: label, sort: `~${key}` },
      ...f.byCommodity.map((c) => ({ text: formatMoney(c.total?.[key], currency) })),
      ...(building ? [{ text: formatMoney(f.total?.[key], currency) }] : []),
    ]);
  }
  return {
    caption: `Budget by month and commodity: likely cost (P50), then the ${formatNumber(f.totalMonths)}-month total with its 80 % range (P10 to P90). Each figure is the median of its own outcomes, so months and commodities do not add up exactly to the totals.`,
    sortable: false,
    columns: [
      { label: "Month", numeric: false },
      ...f.byCommodity.map((c) => ({ label: commodityLabel(c.commodity), numeric: true })),
      ...(building ? [{ label: "Whole building", numeric: true }] : []),
    ],
    rows,
  };
}

/** "+$1,234.00 (+3.4 %)" style change against a base. */
function changeText(amount: number, base: number, currency: string): string {
  return base > 0 ? `${formatMoneySigned(amount, currency)} (${signedPct((100 * amount) / base)})` : formatMoneySigned(amount, currency);
}

/**
 * Plain sentences on the change vs last year and its three drivers (they add up to the change).
 * @example driverSentences(d, "USD")[0] // "Over the same 12 calendar months, next year's likely cost is $… against $… billed last year: +$… (+3.1 %)."
 */
export function driverSentences(d: ReportForecastDrivers, currency: string): string[] {
  const n = d.months.length;
  const billed = d.lastYearBilledCost ?? d.lastYearCost;
  const out = [
    `Over the same ${formatNumber(n)} calendar ${n === 1 ? "month" : "months"} (${formatMonth(d.months[0]!)} to ${formatMonth(d.months[n - 1]!)} last year), next year's likely cost is ${formatMoney(d.forecastCost, currency)} against ${formatMoney(billed, currency)} billed: ${changeText(d.change, billed, currency)}.`,
  ];
  const e = roundCents(d.billingErrors ?? 0);
  if (e !== 0) {
    out.push(
      `Billing errors corrected: ${formatMoneySigned(e, currency)}. Last year's bills as they should have been come to ${formatMoney(d.lastYearCost, currency)} (the audit's corrected amounts); ${e < 0 ? "the overcharge will not recur" : "the undercharge will not recur"}. The drivers below start from the corrected bills.`,
    );
  }
  const w = roundCents(d.weather);
  out.push(
    w === 0
      ? "Weather: no effect (last year's weather was close to typical, or no meter has a weather model)."
      : w > 0
        ? `Weather: ${formatMoneySigned(w, currency)}. Last year's weather was kinder than a typical year, so a typical year costs more.`
        : `Weather: ${formatMoneySigned(w, currency)}. Last year's weather was harsher than a typical year, so a typical year costs less.`,
  );
  const r = roundCents(d.rates);
  out.push(
    r === 0
      ? "Rates: no effect (the same prices apply next year)."
      : `Rates: ${formatMoneySigned(r, currency)}. Last year's use priced at next year's tariffs and escalation ${r > 0 ? "costs more" : "costs less"} than it did at last year's.`,
  );
  const u = roundCents(d.usageTrend);
  out.push(
    `Usage trend: ${formatMoneySigned(u, currency)}. The rest of the change: use expected to differ from last year's beyond the weather (and effects such as demand charges); billing errors are not part of it.`,
  );
  return out;
}

/** The drivers as a one-row table (last year, forecast, change, weather, rates, usage trend). */
function driversTable(d: ReportForecastDrivers, currency: string): TableModel {
  return {
    caption: "Change against last year's bills over the same calendar months, and what drives it (billing errors corrected + weather + rates + usage trend = change)",
    sortable: false,
    columns: [
      { label: "Months compared", numeric: false },
      { label: "Last year, billed", numeric: true },
      { label: "Last year, as it should have been", numeric: true },
      { label: "Forecast (P50)", numeric: true },
      { label: "Change", numeric: true },
      { label: "Billing errors corrected", numeric: true },
      { label: "Weather", numeric: true },
      { label: "Rates", numeric: true },
      { label: "Usage trend", numeric: true },
    ],
    rows: [
      [
        { text: `${formatMonth(d.months[0]!)} – ${formatMonth(d.months[d.months.length - 1]!)}` },
        { text: formatMoney(d.lastYearBilledCost ?? d.lastYearCost, currency) },
        { text: formatMoney(d.lastYearCost, currency) },
        { text: formatMoney(d.forecastCost, currency) },
        { text: changeText(d.change, d.lastYearBilledCost ?? d.lastYearCost, currency) },
        { text: formatMoneySigned(d.billingErrors ?? 0, currency) },
        { text: formatMoneySigned(d.weather, currency) },
        { text: formatMoneySigned(d.rates, currency) },
        { text: formatMoneySigned(d.usageTrend, currency) },
      ],
    ],
  };
}

/**
 * The escalation assumption for the building's commodities, and the caution.
 * @example escalationSentences(settings, ["electricity"]) // ["Prices after the last tariff version on file: 0 % a year assumed (not set in portfolio.yaml).", …]
 */
export function escalationSentences(settings: Pick<PortfolioSettings, "escalation" | "escalationStated">, commodities: readonly Commodity[]): string[] {
  let assumption: string;
  if (!settings.escalationStated) {
    assumption = "Prices after the last tariff version on file: 0 % a year assumed (escalation not set in portfolio.yaml).";
  } else {
    const parts = commodities.map((c) => `${commodityLabel(c).toLowerCase()} ${formatNumber((settings.escalation[c] ?? 0) * 100, 2)} %`);
    assumption = `Prices after the last tariff version on file rise by the stated escalation: ${parts.join(", ")} a year, compounded.`;
  }
  return [
    assumption,
    "Tariff versions dated in the future are used from their start dates. Forecasts are estimates, not quotes: they assume the weather and use the models expect, not the bills to come.",
  ];
}

/**
 * The forecast section of one building; null when there is nothing forecast for it.
 * Totals come from `forecastTotals` (percentiles of the building's summed scenarios) when
 * present, otherwise from summing the monthly rows (then the range is the wider sum of
 * per-month percentiles, and the page says so).
 */
export function forecastSection(
  buildingId: string,
  meters: Meter[],
  input: ReportInput,
  currency: string,
  /** forecastMethodShown(input, meters) when the caller made it already (a building slice carries it). */
  methodShown?: ReturnType<typeof forecastMethodShown>,
): ForecastSection | null {
  const detail = input.buildingForecasts?.find((b) => b.buildingId === buildingId && b.monthly.length > 0) ?? null;
  const chart = detail ? forecastChart(buildingId, detail, currency) : null;
  const monthlyTable = chart ? chart.table : forecastTable(buildingId, input, currency);
  const trackRecord = trackRecordTable(meters, input);
  const total = input.forecastTotals?.find((t) => t.buildingId === buildingId);
  if (!monthlyTable && !trackRecord && !total) return null;
  const months = (input.forecast ?? []).filter((f) => f.buildingId === buildingId);
  const monthCount = detail ? detail.monthly.length : new Set(months.map((f) => f.month)).size;
  let summary: string;
  if (total) {
    summary = `Likely cost over the next ${formatNumber(monthCount || input.portfolio.settings.forecastMonths)} months: ${formatMoney(total.p50, currency)}, with an 80 % range of ${formatMoney(total.p10, currency)} to ${formatMoney(total.p90, currency)}.`;
  } else if (months.length > 0) {
    const sum = (k: "costP10" | "costP50" | "costP90") => months.reduce((s, f) => s + f[k], 0);
    summary = `Likely cost over the next ${formatNumber(monthCount)} months: ${formatMoney(sum("costP50"), currency)}; adding each month's low and high gives ${formatMoney(sum("costP10"), currency)} to ${formatMoney(sum("costP90"), currency)}, wider than the true range for the whole period.`;
  } else {
    summary = "No forecast for the coming months; the track record below shows how the method did on past data.";
  }
  const commodities = [...new Set(meters.map((m) => m.commodity))];
  const drivers = detail?.drivers ?? null;
  const method = methodShown !== undefined ? methodShown : forecastMethodShown(input, meters);
  return {
    summary,
    chart,
    monthlyTable,
    budgetTable: detail ? budgetTable({ ...detail, total: total ?? null }, currency) : null,
    drivers: drivers ? driverSentences(drivers, currency) : [],
    driversTable: drivers ? driversTable(drivers, currency) : null,
    assumptions: escalationSentences(input.portfolio.settings, commodities),
    trackRecordTable: trackRecord,
    trackRecordVerdict: trackRecordVerdict(detail?.trackRecord),
    ...(method ? { method } : {}),
  };
}
