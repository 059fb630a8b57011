/**
 * The tenant page of a building: for each commodity the building is billed for, its latest bill
 * against what the weather of those days led us to expect and against the bill a year earlier,
 * and a chart of the last 14 calendar months. Plain words; no money, findings or model details.
 */
import type { Bill, Building, Meter } from "../domain/types.ts";
import type { ReportBaseline } from "./input.ts";
import type { TableModel, TenantChartModel, TenantCommodity, TenantMonthStatus, TenantPage } from "./siteModel.ts";
import { NOT_AVAILABLE, formatMonth, formatNumber, formatPeriod, formatQuantity } from "./format.ts";
import { commodityLabel } from "./labels.ts";
import { kwhPerM2ToKbtuPerFt2, siteKwh } from "./energy.ts";
import { addMonthsIso, daysBetween as periodDays, isoDateToDayNumber, spreadOverMonths } from "../core/time/index.ts";
import { DEFAULT_HEAT_CONTENT_THERM_PER_CCF, FT2_PER_M2, KBTU_PER_KWH, KWH_PER_THERM } from "../core/units.ts";

/** A bill counts as "a year earlier" when its start is within this many days of one year before. */
const SAME_PERIOD_TOLERANCE_DAYS = 20;

/** Calendar months the tenant chart shows: the latest complete month and the 13 before it. */
const TENANT_CHART_MONTHS = 14;

/** Path of a building's tenant page relative to the site root. */
export function tenantPath(buildingId: string): string {
  return `buildings/${encodeURIComponent(buildingId)}/tenant.html`;
}

/** One side of a comparison (the latest bill or the one a year earlier), summed over a commodity's meters. */
export interface TenantPeriod {
  start: string;
  end: string;
  /** Use in `unit` over the period(s). */
  use: number;
  /** Σ over meters of use ÷ that meter's billing days. */
  usePerDay: number;
  /**
   * Use per day the building's weather baseline expects at the period's actual temperatures
   * (Σ over meters of expected use ÷ billing days); null unless every meter has a baseline
   * that meets ASHRAE Guideline 14 and an expectation for its bill.
   */
  expectedPerDay: number | null;
  /** Whether any bill of the period is an estimated read (not read from the meter). */
  estimated: boolean;
}

export interface TenantComparison {
  commodity: string;
  /** kWh for electricity and gas (site energy), the meter unit for water. */
  unit: string;
  current: TenantPeriod;
  /** The bills a year earlier; null when any meter of `current` has no bill then. */
  lastYear: TenantPeriod | null;
  /** Percent change of use per day, a year earlier → latest. */
  changePct: number | null;
  /** Percent by which the latest use per day differs from the weather expectation. */
  vsExpectedPct: number | null;
  /** Use of the latest period per m² of floor area (unit/m²). */
  perM2: number | null;
  /** Use of the latest period per ft² (kBtu/ft² for energy, unit/ft² for water). */
  perFt2: number | null;
}

type Expectations = Map<string, { expectedAtActualWeather: number }>;

/** A commodity's meters with a usable unit, and how to bring their quantities to the page's unit. */
interface CommodityMeters {
  unit: string;
  meters: Meter[];
  convert: (m: Meter, q: number) => number | null;
}

function commodityMeters(commodity: string, meters: readonly Meter[]): CommodityMeters | null {
  const energy = commodity === "electricity" || commodity === "gas";
  const cm = meters.filter((m) => m.commodity === commodity);
  if (cm.length === 0) return null;
  const unit = energy ? "kWh" : cm[0].unit;
  const convert = (m: Meter, q: number) => (energy ? siteKwh(commodity, m.unit, q) : m.unit === unit ? q : null);
  return { unit, meters: cm.filter((m) => convert(m, 1) != null), convert };
}

/** Expected use at actual weather per bill, from baselines that meet Guideline 14 only (a poor fit is no yardstick for occupants). */
function reliableExpectations(meters: readonly Meter[], baselines: readonly ReportBaseline[] | undefined): Expectations {
  const out: Expectations = new Map();
  for (const b of baselines ?? []) {
    if (!b.meetsGuideline14 || b.kind === "none" || !meters.some((m) => m.meterId === b.meterId)) continue;
    for (const e of b.perBill) if (Number.isFinite(e.expectedAtActualWeather) && e.expectedAtActualWeather >= 0) out.set(e.billId, e);
  }
  return out;
}

function sameBillLastYear(bills: readonly Bill[], latest: Bill): Bill | null {
  const target = isoDateToDayNumber(addMonthsIso(latest.periodStart, -12));
  let best: Bill | null = null;
  let bestGap = Infinity;
  for (const b of bills) {
    const gap = Math.abs(isoDateToDayNumber(b.periodStart) - target);
    if (gap <= SAME_PERIOD_TOLERANCE_DAYS && gap < bestGap) {
      best = b;
      bestGap = gap;
    }
  }
  return best;
}

function sumPeriod(picks: { meter: Meter; bill: Bill }[], convert: CommodityMeters["convert"], expectations: Expectations): TenantPeriod | null {
  let use = 0;
  let perDay = 0;
  let expected: number | null = 0;
  let start = "";
  let end = "";
  let estimated = false;
  let used = 0;
  for (const { meter, bill } of picks) {
    const q = convert(meter, bill.usage);
    const days = periodDays(bill.periodStart, bill.periodEnd);
    if (q == null || days <= 0) continue;
    used++;
    use += q;
    perDay += q / days;
    const e = expectations.get(bill.billId);
    const eConverted = e == null ? null : convert(meter, e.expectedAtActualWeather);
    expected = expected == null || eConverted == null ? null : expected + eConverted / days;
    if (bill.readType === "estimated") estimated = true;
    if (!start || bill.periodStart < start) start = bill.periodStart;
    if (!end || bill.periodEnd > end) end = bill.periodEnd;
  }
  if (used === 0) return null;
  return { start, end, use, usePerDay: perDay, expectedPerDay: expected, estimated };
}

const changeOf = (now: number | null, before: number | null) => (now == null || before == null || !(before > 0) ? null : (100 * (now - before)) / before);

/**
 * Compares a commodity's latest bill with the weather expectation for its days and with the bill
 * a year earlier, per meter then summed. Electricity and gas are in site kWh (therm × 29.3071;
 * ccf × 1.037 therm); water stays in its unit. Null when the commodity has no usable bill.
 * @example compareCommodity("electricity", meters, billsByMeter, baselines, 4830.96)?.changePct // 3.57…
 */
export function compareCommodity(
  commodity: string,
  meters: readonly Meter[],
  billsByMeter: Map<string, Bill[]>,
  baselines: readonly ReportBaseline[] | undefined,
  floorAreaM2: number,
): TenantComparison | null {
  const cm = commodityMeters(commodity, meters);
  if (!cm) return null;
  const expectations = reliableExpectations(cm.meters, baselines);
  const current: { meter: Meter; bill: Bill }[] = [];
  const previous: { meter: Meter; bill: Bill }[] = [];
  for (const m of cm.meters) {
    const bills = billsByMeter.get(m.meterId) ?? [];
    if (bills.length === 0) continue;
    const latest = bills.reduce((a, b) => (b.periodEnd > a.periodEnd ? b : a));
    current.push({ meter: m, bill: latest });
    const before = sameBillLastYear(bills, latest);
    if (before) previous.push({ meter: m, bill: before });
  }
  const now = sumPeriod(current, cm.convert, expectations);
  if (!now) return null;
  // Compare like with like: a year earlier only when every meter of the latest period has its match.
  const then = previous.length === current.length ? sumPeriod(previous, cm.convert, expectations) : null;
  const energy = commodity !== "water";
  const perM2 = floorAreaM2 > 0 ? now.use / floorAreaM2 : null;
  return {
    commodity,
    unit: cm.unit,
    current: now,
    lastYear: then,
    changePct: then ? changeOf(now.usePerDay, then.usePerDay) : null,
    vsExpectedPct: changeOf(now.usePerDay, now.expectedPerDay),
    perM2,
    perFt2: perM2 == null ? null : energy ? kwhPerM2ToKbtuPerFt2(perM2) : perM2 / FT2_PER_M2,
  };
}

/** One calendar month of a commodity on the tenant chart. */
export interface TenantMonth {
  /** `YYYY-MM` */
  month: string;
  /** Use per day over the month, every meter's bills shared out by days; null when the bills leave days of the month out or cover some twice. */
  perDay: number | null;
  /** Expected use per day at the month's actual weather; null unless every bill touching the month has a reliable expectation. */
  expectedPerDay: number | null;
  /** Whether a bill touching the month is an estimated read. */
  estimated: boolean;
}

const daysInMonth = (month: string) => periodDays(`${month}-01`, addMonthsIso(`${month}-01`, 1));

/**
 * The calendar months of a commodity the tenant chart shows: the latest month completely covered
 * by the bills of every meter and the 13 months before it, from the first of them that is
 * completely covered. A month in between whose bills leave days out or cover some twice is kept
 * with no use (null), so the chart shows the hole instead of closing it up.
 * Bills are shared out over months by days (the rule of every monthly figure on the site).
 * @example tenantMonths("electricity", meters, billsByMeter, baselines).at(-1)?.month // "2025-02"
 */
export function tenantMonths(commodity: string, meters: readonly Meter[], billsByMeter: Map<string, Bill[]>, baselines: readonly ReportBaseline[] | undefined): TenantMonth[] {
  const cm = commodityMeters(commodity, meters);
  if (!cm) return [];
  const expectations = reliableExpectations(cm.meters, baselines);
  const withBills = cm.meters.filter((m) => (billsByMeter.get(m.meterId) ?? []).length > 0);
  if (withBills.length === 0) return [];
  interface Acc { days: Map<string, number>; use: number; expected: number | null; estimated: boolean }
  const byMonth = new Map<string, Acc>();
  for (const m of withBills) {
    for (const b of billsByMeter.get(m.meterId) ?? []) {
      const q = cm.convert(m, b.usage);
      if (q == null) continue;
      const e = expectations.get(b.billId);
      const eq = e == null ? null : cm.convert(m, e.expectedAtActualWeather);
      const dayShares = spreadOverMonths(periodDays(b.periodStart, b.periodEnd), b.periodStart, b.periodEnd);
      const useShares = spreadOverMonths(q, b.periodStart, b.periodEnd);
      const expShares = eq == null ? null : spreadOverMonths(eq, b.periodStart, b.periodEnd);
      useShares.forEach((s, i) => {
        const acc = byMonth.get(s.month) ?? { days: new Map<string, number>(), use: 0, expected: 0, estimated: false };
        acc.use += s.amount;
        acc.days.set(m.meterId, (acc.days.get(m.meterId) ?? 0) + dayShares[i].amount);
        acc.expected = acc.expected == null || expShares == null ? null : acc.expected + expShares[i].amount;
        if (b.readType === "estimated") acc.estimated = true;
        byMonth.set(s.month, acc);
      });
    }
  }
  // Complete: every meter covers every day of the month (overlapping bills count once too many
  // days and make a month incomplete too, rather than doubling its use).
  const complete = [...byMonth.entries()]
    .filter(([month, acc]) => withBills.every((m) => Math.abs((acc.days.get(m.meterId) ?? 0) - daysInMonth(month)) < 1e-9))
    .sort((a, b) => (a[0] < b[0] ? -1 : 1));
  if (complete.length === 0) return [];
  const last = complete[complete.length - 1][0];
  const windowStart = addMonthsIso(`${last}-01`, -(TENANT_CHART_MONTHS - 1)).slice(0, 7);
  const completeMonths = new Map(complete);
  const first = complete.find(([month]) => month >= windowStart)![0];
  const out: TenantMonth[] = [];
  for (let month = first; month <= last; month = addMonthsIso(`${month}-01`, 1).slice(0, 7)) {
    const acc = completeMonths.get(month);
    const days = daysInMonth(month);
    out.push(
      acc
        ? { month, perDay: acc.use / days, expectedPerDay: acc.expected == null ? null : acc.expected / days, estimated: acc.estimated }
        : { month, perDay: null, expectedPerDay: null, estimated: byMonth.get(month)?.estimated ?? false },
    );
  }
  return out;
}

/** Rounds to one decimal, halves away from zero (−12.25 → −12.3), so a change reads the same either way. */
function round1(pct: number): number {
  return (Math.sign(pct) * Math.round(Math.abs(pct) * 10)) / 10;
}

/**
 * A signed percentage for a table cell, rounded to one decimal; a change that rounds to zero is
 * "0 %" (never "−0 %" or "+0 %").
 * @example signedPct(-0.04) // "0 %"; signedPct(3.57) // "+3.6 %"
 */
export function signedPct(pct: number | null): string {
  if (pct == null || !Number.isFinite(pct)) return NOT_AVAILABLE;
  const r = round1(pct);
  if (r === 0) return "0 %";
  return `${r > 0 ? "+" : "−"}${formatNumber(Math.abs(r), 1)} %`;
}

/** "5.2 % higher than", "2 % lower than", "level with" (the rounded figure decides, so never "0 % higher"). */
function relation(pct: number): string {
  const r = round1(pct);
  if (r === 0) return "level with";
  return `${formatNumber(Math.abs(r), 1)} % ${r > 0 ? "higher than" : "lower than"}`;
}

const ESTIMATE_WORDS = "an estimate by the utility, not a meter reading";

function tenantChart(commodity: string, unit: string, months: TenantMonth[]): TenantChartModel | null {
  if (months.length === 0) return null;
  const label = commodityLabel(commodity);
  const latest = months[months.length - 1];
  const hasExpected = months.some((m) => m.expectedPerDay != null);
  const status = (m: TenantMonth): TenantMonthStatus => (m.estimated ? "Includes an estimate" : m === latest ? "Latest month" : "Earlier months");
  const holes = months.filter((m) => m.perDay == null).map((m) => formatMonth(m.month));
  const useLabel = `${unit} a day`;
  const span = `${formatMonth(months[0].month)} to ${formatMonth(latest.month)}`;
  return {
    id: `tenant-${commodity}-months`,
    kind: "tenant-months",
    title: `${label} use per day`,
    description:
      `Bars: ${label.toLowerCase()} use per day in ${unit} for each calendar month from ${span}, ${formatMonth(latest.month)} the latest.` +
      (hasExpected ? " Line: the use per day expected for each month's weather, an estimate from the building's own past use." : "") +
      (months.some((m) => m.estimated) ? " Months that include an estimated bill are drawn in a different colour." : "") +
      (holes.length ? ` No bar for ${holes.join(", ")}: the bills for ${holes.length === 1 ? "that month" : "those months"} leave days out or cover some twice.` : "") +
      " Bills are shared out over calendar months by days.",
    useLabel,
    hasExpected,
    months: months.map((m) => ({ month: m.month, label: formatMonth(m.month), perDay: m.perDay == null ? null : Math.round(m.perDay * 1000) / 1000, expectedPerDay: m.expectedPerDay == null ? null : Math.round(m.expectedPerDay * 1000) / 1000, status: status(m) })),
    table: {
      caption: `${label}: use per day by month (${unit}), ${span}`,
      sortable: false,
      columns: [
        { label: "Month", numeric: false },
        { label: `Use per day (${unit})`, numeric: true },
        ...(hasExpected ? [{ label: `Expected for the weather (${unit} a day)`, numeric: true }] : []),
        { label: "Reading", numeric: false },
      ],
      rows: months.map((m) => [
        { text: formatMonth(m.month), sort: m.month },
        m.perDay == null ? { text: NOT_AVAILABLE, sort: "" } : { text: formatQuantity(m.perDay, ""), sort: String(m.perDay) },
        ...(hasExpected ? [{ text: m.expectedPerDay == null ? NOT_AVAILABLE : formatQuantity(m.expectedPerDay, ""), sort: m.expectedPerDay == null ? "" : String(m.expectedPerDay) }] : []),
        m.perDay == null
          ? { text: "not shown: the bills leave days out or cover some twice", tone: "muted" as const }
          : { text: m.estimated ? "includes an estimate" : "meter reading", tone: m.estimated ? ("warn" as const) : undefined },
      ]),
    },
  };
}

/**
 * The sentences of one commodity. Each comparison says whether it rests on an estimated read,
 * and a year-earlier bill that was only estimated is used only beside the weather expectation,
 * never alone.
 */
export function tenantSentences(c: TenantComparison): string[] {
  const label = commodityLabel(c.commodity).toLowerCase();
  const days = periodDays(c.current.start, c.current.end);
  const asEnergy = c.commodity === "gas" ? " (counted as energy)" : "";
  const out = [
    `Latest bill: ${formatPeriod(c.current.start, c.current.end)}, ${formatNumber(days)} days. The building used ${formatQuantity(c.current.use, c.unit)} of ${label}${asEnergy}, or ${formatQuantity(c.current.usePerDay, c.unit)} a day on average.`,
  ];
  if (c.current.estimated) out.push(`This figure is ${ESTIMATE_WORDS}; it will be put right when the meter is next read, so treat the comparisons below with care.`);
  const hasExpected = c.vsExpectedPct != null && c.current.expectedPerDay != null;
  if (hasExpected) {
    out.push(`Given the temperatures of those days, the building's own record points to about ${formatQuantity(c.current.expectedPerDay, c.unit)} a day. Actual use was ${relation(c.vsExpectedPct!)} that estimate.`);
  }
  const ly = c.lastYear;
  if (ly && c.changePct != null && (!ly.estimated || hasExpected)) {
    out.push(
      `A year earlier (${formatPeriod(ly.start, ly.end)}) it used ${formatQuantity(ly.usePerDay, c.unit)} a day; the latest bill is ${relation(c.changePct)} that.` +
        (ly.estimated ? ` The earlier figure is ${ESTIMATE_WORDS}.` : "") +
        " The two periods had different weather.",
    );
  } else if (ly && ly.estimated) {
    out.push(`The bill a year earlier (${formatPeriod(ly.start, ly.end)}) is ${ESTIMATE_WORDS}, so it is not used as a comparison on its own.`);
  }
  if (!hasExpected && !(ly && c.changePct != null)) {
    out.push("There is nothing reliable to compare this bill with yet: no bill from a year earlier and no weather expectation for this building.");
  } else if (!hasExpected) {
    out.push("There is no reliable weather expectation for this building yet, so the weather's share of any change is not known.");
  }
  return out;
}

function summaryTable(c: TenantComparison): TableModel {
  const label = commodityLabel(c.commodity);
  const energy = c.commodity !== "water";
  const ly = c.lastYear;
  const cell = (v: number | null | undefined, digits: number, unit: string) => ({ text: v == null ? NOT_AVAILABLE : `${formatNumber(v, digits)} ${unit}` });
  const read = (p: TenantPeriod | null) => (p == null ? { text: NOT_AVAILABLE } : p.estimated ? { text: "estimate", tone: "warn" as const } : { text: "meter reading" });
  const lastPerM2 = ly && c.perM2 != null && c.current.use > 0 ? (ly.use / c.current.use) * c.perM2 : null;
  const ft2Unit = energy ? "kBtu/ft²" : `${c.unit}/ft²`;
  return {
    caption: `${label}: the latest bill beside the bill a year earlier`,
    sortable: false,
    columns: [
      { label: "Measure", numeric: false },
      { label: "Latest bill", numeric: true },
      { label: "A year earlier", numeric: true },
      { label: "Change", numeric: true },
    ],
    rows: [
      [{ text: "Dates" }, { text: formatPeriod(c.current.start, c.current.end) }, { text: ly ? formatPeriod(ly.start, ly.end) : NOT_AVAILABLE }, { text: "" }],
      [{ text: "Reading" }, read(c.current), read(ly), { text: "" }],
      [{ text: "Use" }, cell(c.current.use, 0, c.unit), cell(ly?.use, 0, c.unit), { text: "" }],
      [{ text: "Use per day" }, cell(c.current.usePerDay, 1, c.unit), cell(ly?.usePerDay, 1, c.unit), { text: signedPct(c.changePct) }],
      [{ text: "Expected per day for the weather (estimate)" }, cell(c.current.expectedPerDay, 1, c.unit), cell(ly?.expectedPerDay, 1, c.unit), { text: "" }],
      [{ text: "Use per m² of floor" }, cell(c.perM2, 2, `${c.unit}/m²`), cell(lastPerM2, 2, `${c.unit}/m²`), { text: "" }],
      [{ text: "Use per ft² of floor" }, cell(c.perFt2, 3, ft2Unit), cell(lastPerM2 == null ? null : energy ? kwhPerM2ToKbtuPerFt2(lastPerM2) : lastPerM2 / FT2_PER_M2, 3, ft2Unit), { text: "" }],
    ],
  };
}

/** How the tenant page's figures are made; each conversion factor named. */
const TENANT_NOTES: readonly string[] = [
  "Use per day is compared rather than the bill total, because bills cover slightly different numbers of days.",
  "The expectation for the weather comes from how much this building used in past months as warm or as cold as these. It is shown only where that record follows the weather closely (the monthly limits of ASHRAE Guideline 14).",
  `Electricity and gas are shown as energy in kWh: gas in therms × ${KWH_PER_THERM.toFixed(4)} kWh per therm (1 therm = 100,000 Btu, U.S. EIA), gas in ccf first × ${DEFAULT_HEAT_CONTENT_THERM_PER_CCF} therm per ccf.`,
  `Per floor area: kWh per m², and kBtu per ft² with 1 kWh = ${KBTU_PER_KWH.toFixed(6)} kBtu (Btu of the International Table, NIST SP 811) and 1 m² = ${FT2_PER_M2.toFixed(4)} ft² (international foot = 0.3048 m).`,
];

/** The caution every tenant page carries. */
const TENANT_CAUTION =
  "These figures come from the utility's meter readings and local weather records. Expected figures are estimates, not measurements, and a bill marked as an estimate may change when the meter is next read.";

/**
 * Builds the tenant page of a building: one section per commodity it has bills for.
 * @example buildTenantPage(b, meters, billsByMeter, baselines, null).path // "buildings/B1/tenant.html"
 */
export function buildTenantPage(
  building: Building,
  meters: readonly Meter[],
  billsByMeter: Map<string, Bill[]>,
  baselines: readonly ReportBaseline[] | undefined,
  contact: string | null,
): Omit<TenantPage, "canonical"> {
  const commodities: TenantCommodity[] = [];
  for (const commodity of ["electricity", "gas", "water"] as const) {
    const c = compareCommodity(commodity, meters, billsByMeter, baselines, building.floorAreaM2);
    if (!c) continue;
    commodities.push({
      commodity,
      heading: commodityLabel(commodity),
      sentences: tenantSentences(c),
      chart: tenantChart(commodity, c.unit, tenantMonths(commodity, meters, billsByMeter, baselines)),
      table: summaryTable(c),
    });
  }
  const names = commodities.map((c) => c.heading.toLowerCase());
  const list = names.length <= 1 ? (names[0] ?? "") : `${names.slice(0, -1).join(", ")} and ${names[names.length - 1]}`;
  return {
    title: commodities.length > 0 ? `${building.name}: ${list} use` : `${building.name}: utility use`,
    root: "../../",
    path: tenantPath(building.buildingId),
    nav: [],
    buildingId: building.buildingId,
    buildingName: building.name,
    intro:
      commodities.length > 0
        ? `How much ${list} ${building.name} has used, bill by bill: the latest bill beside what the weather led us to expect and beside the same time a year ago, and the last 14 months in a chart.`
        : `There are no bills for ${building.name} yet.`,
    commodities,
    caution: TENANT_CAUTION,
    contact,
    notes: [...TENANT_NOTES],
  };
}
