/**
 * View models: what each page template receives. Plain objects; every number a reader sees is
 * already a formatted string (money, units, dates). Templates only place these values.
 * Fields named `sort` carry a machine-sortable form of a cell for the table-sort script.
 */
import type { ClaimSheet, DisputesPage, IndexDisputes } from "./disputeModels.ts";
import type { MeterBillsPage } from "./billPageModels.ts";

/** A link in the site navigation, `href` relative to the page that shows it. */
export interface NavLink {
  label: string;
  href: string;
  current: boolean;
}

export interface TableCell {
  text: string;
  /** Numeric or ISO value the sort script compares; absent = sort by `text`. */
  sort?: string;
  /** Optional link target (relative). */
  href?: string;
  /** A short second line under the text (e.g. "estimated read"). */
  note?: string;
  /** Emphasis: `pos` bill higher than recomputed, `neg` lower, `warn` a problem, `muted` absent. */
  tone?: "pos" | "neg" | "muted" | "warn";
}

export interface TableColumn {
  label: string;
  numeric: boolean;
}

export interface TableModel {
  caption: string;
  columns: TableColumn[];
  /** First cell of each row is the row header (`<th scope="row">`). */
  rows: TableCell[][];
  /** Whether the client script may offer sorting. */
  sortable: boolean;
}

/** One month of one series for a monthly chart; `value` is a plain number for the chart only. */
export interface ChartDatum {
  /** `YYYY-MM` */
  month: string;
  series: string;
  value: number;
}

/** What every chart carries, whatever its kind. */
export interface ChartBase {
  /** Unique within the page; used as the DOM id. */
  id: string;
  title: string;
  /** One-sentence description for screen readers and the figure caption. */
  description: string;
  /** The same numbers as a table: the text equivalent of the chart. */
  table: TableModel;
  /** Vega-Lite spec (filled by src/site/prepareSite.ts). */
  spec?: Record<string, unknown>;
  /** The spec compiled to Vega, as escaped JSON for the page (what the browser runs). */
  specJson?: string;
  /** Server-rendered SVG fallback. */
  svg?: string;
}

/**
 * A monthly bar chart (use or cost), stacked by series. The site stage fills `spec`,
 * `specJson`, `svg`; the template places the SVG fallback, the JSON spec and the table.
 */
export interface MonthlyChartModel extends ChartBase {
  kind: "monthly-usage" | "monthly-cost";
  /** Axis label for values, e.g. "Usage (kWh)". */
  valueLabel: string;
  /** Legend title of the series, e.g. "Meter" or "Commodity". */
  seriesLabel: string;
  data: ChartDatum[];
}

/** Use per day against period temperature, one point per bill, with the fitted model line. */
export interface BaselineScatterChartModel extends ChartBase {
  kind: "baseline-scatter";
  /** e.g. "Mean outdoor temperature (°C)". */
  tempLabel: string;
  /** e.g. "Use per day (kWh)". */
  useLabel: string;
  points: { billId: string; period: string; temp: number; usePerDay: number; status: string }[];
  curve: { temp: number; usePerDay: number }[];
}

/** Actual use per day of each bill over time, with the model's expectation at the actual weather. */
export interface BaselineTimeChartModel extends ChartBase {
  kind: "baseline-time";
  useLabel: string;
  /** `mid` is the period's middle day `YYYY-MM-DD` (plotted on a UTC time scale). */
  bills: { billId: string; period: string; mid: string; actualPerDay: number; expectedPerDay: number; lowPerDay: number | null; highPerDay: number | null }[];
  /** Whether any bill carries a prediction band (then the chart draws it). */
  hasBand: boolean;
}

/** Calendar heatmap of interval data: one cell per local day × hour, flagged hours marked. */
export interface HeatmapChartModel extends ChartBase {
  kind: "quality-heatmap";
  /** e.g. "Use per hour (kWh)". */
  valueLabel: string;
  /** One row per local day, ascending; `values[h]` the day's use in hour h (null = no data), `flagged[h]` 1 when any interval of that hour was flagged. */
  days: { day: string; values: (number | null)[]; flagged: number[] }[];
  /** Top of the colour scale: the 99th percentile of unflagged hours, so one spike does not wash out the rest (higher values show at full colour). */
  colorMax: number;
}

/** Horizontal bars ranking labelled items (e.g. intensity by building, money by check). */
export interface RankingChartModel extends ChartBase {
  kind: "ranking";
  valueLabel: string;
  /** d3-format of the value in tooltips, e.g. ",.0f". */
  valueFormat: string;
  /** Largest first. `note` is an extra tooltip line (e.g. "3 findings"). */
  items: { label: string; value: number; note: string }[];
}

/** Monthly cost forecast: the P10–P90 band as an area, the P50 line, last year's billed cost as points. */
export interface ForecastChartModel extends ChartBase {
  kind: "forecast-band";
  /** e.g. "Cost (USD)". */
  valueLabel: string;
  /** One per forecast month; `lastYear` is the billed cost of the same calendar month a year earlier (null = not completely billed). */
  months: { month: string; p10: number; p50: number; p90: number; lastYear: number | null; lastYearMonth: string }[];
}

/** How a month is drawn on a tenant chart. */
export type TenantMonthStatus = "Earlier months" | "Latest month" | "Includes an estimate";

/** A tenant page's chart: use per day of the last 14 calendar months (bars) and the weather expectation (line). */
export interface TenantChartModel extends ChartBase {
  kind: "tenant-months";
  /** e.g. "kWh a day". */
  useLabel: string;
  /** Whether any month carries an expectation (then the chart draws the line). */
  hasExpected: boolean;
  /** Ascending; `label` is the month as people read it ("Mar 2025"); `perDay` null = not completely billed (no bar). */
  months: { month: string; label: string; perDay: number | null; expectedPerDay: number | null; status: TenantMonthStatus }[];
}

export type ChartModel = MonthlyChartModel | BaselineScatterChartModel | BaselineTimeChartModel | HeatmapChartModel | RankingChartModel | ForecastChartModel | TenantChartModel;

export interface LabelValue {
  label: string;
  value: string;
}

export interface PageBase {
  /** `<title>` and `<h1>`. */
  title: string;
  /** Relative prefix from this page to the site root: "", "../" or "../../". */
  root: string;
  /** Path of the page relative to the site root, e.g. `index.html`, `buildings/B1.html`. */
  path: string;
  /** `base_path` + `path`: the page's canonical URL path (the only use of base_path). */
  canonical: string;
  nav: NavLink[];
}

export interface IndexBuildingRow {
  buildingId: string;
  name: string;
  href: string;
}

/** A money figure at the top of the index. */
export interface HeadlineFigure {
  /** DOM id of the figure (stable for tests and links). */
  id: string;
  label: string;
  value: string;
  /** A short line under the figure (the range, the basis). */
  note: string;
}

/**
 * What the index says of a per-building list it shows only in part (indexSubset.ts), and its
 * link to the page with every row.
 */
export interface IndexListCut {
  /** Which rows are shown and in what order, e.g. "Showing the 10 of 48 buildings with the largest billed cost …". */
  shown: string;
  /** Totals over every building of the list, never only the rows shown. */
  totals: string;
  /** The page with the whole list, relative to the site root. */
  href: string;
  /** e.g. "All 48 buildings". */
  linkText: string;
  /** What follows the link in its sentence, e.g. ": the same columns, …". */
  linkNote: string;
}

export interface IndexPage extends PageBase {
  /** Opening sentence, e.g. "Utility bills for 6 buildings, each re-priced from its tariff and checked." */
  lede: string;
  /** What was checked: counts of buildings, meters, bills and how far they were checked (no money). */
  headline: LabelValue[];
  /** Next year's likely cost and last year's billed cost; shown first with the claim and risk totals. */
  costFigures: HeadlineFigure[];
  /** One sentence on the weather-adjusted change of site energy; null without weather baselines. */
  energyTrend: string | null;
  /** Every building, or only the first INDEX_LIST_SHOWN of a long portfolio (then `buildingsCut` says which). */
  buildingsTable: TableModel;
  /** Null when `buildingsTable` holds every building. */
  buildingsCut: IndexListCut | null;
  /** Sentence naming the 12-month window used, e.g. "Jan 1, 2025 – Dec 31, 2025". */
  windowText: string;
  buildings: IndexBuildingRow[];
  /** Portfolio charts (monthly billed cost by commodity). */
  charts: ChartModel[];
  /** EUI ranking (kWh/m²); null when no building has energy use and floor area. */
  intensityChart: RankingChartModel | null;
  /** Sentence naming the site-energy basis of the ranking. */
  intensityNote: string;
  /** Bills to dispute: the claim total, the largest claims and the back-billing risks; null when the dispute stage did not run. */
  disputes: IndexDisputes | null;
  /** Findings by check with their claims and money; null when the audit did not run or found nothing. */
  findingsTable: TableModel | null;
  /** Buildings ranked by forecast change vs last year, with the drivers (all, or the subset `forecastCut` names); null without forecast drivers. */
  forecastChangeTable: TableModel | null;
  /** Null when `forecastChangeTable` holds every building with drivers (or there is none). */
  forecastCut: IndexListCut | null;
  /** Sentence on the portfolio's forecast track record; null without a backtest. */
  forecastTrackRecord: string | null;
  /** Tenant pages, for the index's list. */
  tenantLinks: { name: string; href: string }[];
}

/** buildings.html: the table of every building, in the portfolio's order. */
export interface BuildingListPage extends PageBase {
  lede: string;
  table: TableModel;
}

/** forecast.html: next year's cost against last year of every building with forecast drivers. */
export interface ForecastListPage extends PageBase {
  lede: string;
  /** Totals over every building of the table; null without forecast drivers. */
  totals: string | null;
  /** Sentence on the portfolio's forecast track record; null without a backtest. */
  trackRecord: string | null;
  /** Null without forecast drivers (the lede says so). */
  table: TableModel | null;
}

/** One meter on its building's page: a summary of its bills and a link to its bills page. */
export interface MeterSection {
  meterId: string;
  heading: string;
  /** Relative to the site root: the meter's bills page (`meterBillsPath`). */
  billsHref: string;
}

export interface CommoditySection {
  commodity: string;
  heading: string;
  charts: MonthlyChartModel[];
}

/** The weather baseline of one meter: charts, statistics against Guideline 14, every model tried. */
export interface BaselineSection {
  meterId: string;
  heading: string;
  /** Plain verdict, e.g. "Close fit: CV(RMSE) 8.2 % and NMBE 0.40 % are inside the monthly limits of ASHRAE Guideline 14 …". */
  verdict: string;
  /** `ok` meets the thresholds, `warn` does not, `none` no model. */
  verdictTone: "ok" | "warn" | "none";
  facts: LabelValue[];
  charts: ChartModel[];
  /** Statistic, value, Guideline 14 threshold, met? Null without a model. */
  statsTable: TableModel | null;
  triedTable: TableModel | null;
}

/** Data quality of one interval meter: heatmap, every detection, the clock-offset check. */
export interface QualitySection {
  meterId: string;
  heading: string;
  summary: string;
  charts: ChartModel[];
  /** Every detection; null when there are none (the summary says so). */
  detectionsTable: TableModel | null;
  /** Sentences about the clock-offset check (empty when not checked). */
  alignment: string[];
  alignmentTable: TableModel | null;
}

/** Forecast of one building: totals with range, month by month, budget, drivers, assumptions and the backtest record. */
export interface ForecastSection {
  summary: string;
  /** Monthly chart (band, P50, last year); null without the building's monthly bands. */
  chart: ForecastChartModel | null;
  /** Month by month with the range; shown when there is no chart (the chart carries the same table). */
  monthlyTable: TableModel | null;
  /** Likely cost by month and commodity, with each commodity's total and range. */
  budgetTable: TableModel | null;
  /** Plain sentences on why next year differs from last year (weather, rates, usage trend). */
  drivers: string[];
  driversTable: TableModel | null;
  /** Escalation assumption and the caution that forecasts are estimates. */
  assumptions: string[];
  trackRecordTable: TableModel | null;
  /** One line: the backtest against the naive "same month last year" forecast; null without a backtest. */
  trackRecordVerdict: string | null;
  /** How the forecast was made: weather basis, band calibration, and why (sentences, then the backtest tables). */
  method?: { sentences: string[]; tables: TableModel[] };
}

export interface BuildingPage extends PageBase {
  buildingId: string;
  summary: LabelValue[];
  commodities: CommoditySection[];
  meters: MeterSection[];
  /** One row per meter: bills, how far they were checked, claims, and a link to the meter's bills page. */
  metersTable: TableModel;
  /** Bills with a claim, a back-billing risk or an audit finding (each linked to its re-pricing); null when none. */
  flaggedBillsTable: TableModel | null;
  findingsTable: TableModel | null;
  /** This building's own data files (`data/buildings/<id>/…`), filled by the site writer. */
  downloads: DataFileRow[];
  forecastTable: TableModel | null;
  modelsTable: TableModel | null;
  /** One row per meter with a weather baseline: its verdict, linked to the meter's page (null when none). */
  baselinesTable: TableModel | null;
  /** One row per interval meter with quality results: its summary, linked to the meter's page (null when none). */
  qualityTable: TableModel | null;
  /** Weather gaps of the building's station; null when none were reported. */
  weatherQualityTable: TableModel | null;
  /** How gaps are handled (the interpolation limit), shown above the weather-gap table. */
  weatherQualityNote: string;
  forecast: ForecastSection | null;
  /** Relative link to the tenant page, or null when the building has none. */
  tenantHref: string | null;
}

/** The tenant site's front page: links to each building's tenant page, nothing else. */
export interface TenantIndexPage extends PageBase {
  intro: string;
  links: { name: string; href: string }[];
}

/** One commodity on a tenant page. */
export interface TenantCommodity {
  commodity: string;
  heading: string;
  /** Plain sentences: the latest bill against the weather expectation and the bill a year earlier. */
  sentences: string[];
  /** The last 14 months; null when no calendar month is completely billed. */
  chart: TenantChartModel | null;
  /** The latest bill beside the bill a year earlier. */
  table: TableModel;
}

/** A plain monthly page for a building's occupants: no audit, no money. */
export interface TenantPage extends PageBase {
  buildingId: string;
  buildingName: string;
  intro: string;
  commodities: TenantCommodity[];
  /** Where the figures come from and what is estimated. */
  caution: string;
  /** The building's contact line (`contacts` in portfolio.yaml), or null. */
  contact: string | null;
  /** How the figures are made (weather expectation, conversions). */
  notes: string[];
}

export interface UnitFactorRow {
  from: string;
  to: string;
  factor: string;
  source: string;
}

/** One audit check explained on the methods page, with its stable code. */
export interface CheckProse {
  code: string;
  /** Our plain name of the check (checkTitle). */
  title: string;
  looksFor: string;
  rule: string;
  severity: string;
  amount: string;
  source: string;
}

/** Checks that call for the same action (claim, ask, note). */
export interface CheckGroupModel {
  id: string;
  heading: string;
  intro: string;
  checks: CheckProse[];
}

export interface MethodsPage extends PageBase {
  currency: string;
  unitFactors: UnitFactorRow[];
  windowText: string;
  /** This portfolio's audit tolerances in words. */
  tolerances: LabelValue[];
  /** Every audit check, grouped by what the reader does about a finding. */
  checkGroups: CheckGroupModel[];
  /** Each basis of a dispute's corrected total, in plain words. */
  disputeBases: LabelValue[];
}

export interface DataFileRow {
  name: string;
  href: string;
  description: string;
  size: string;
}

export interface DataPage extends PageBase {
  files: DataFileRow[];
  ingestTable: TableModel;
  issuesTable: TableModel;
  issueSummary: string;
}

export interface SiteMeta {
  portfolioName: string;
  currency: string;
  /** Readable build date. */
  buildDate: string;
  buildDateIso: string;
  /** The page stamp, e.g. "Built Dec 2, 2026" or "Figures as of Dec 31, 2025". */
  stamp: string;
  /** `internal`: the full site; `tenants`: tenant pages only (no internal page, link, CSV or JSON). */
  audience: "internal" | "tenants";
  /** `base_path` from portfolio.yaml; used only for canonical links (all site links are relative). */
  basePath: string;
}

export interface SiteModel {
  meta: SiteMeta;
  index: IndexPage;
  buildings: BuildingPage[];
  /** One page per meter: its bills and the re-pricing of each, its interval data, baseline and data quality. */
  meterBills: MeterBillsPage[];
  /** Tenant pages of buildings with `tenant_page: yes`. */
  tenants: TenantPage[];
  /** Front page of the tenant site (audience `tenants` only). */
  tenantIndex?: TenantIndexPage;
  methods: MethodsPage;
  data: DataPage;
  /** Every claim and back-billing risk (disputes.html). */
  disputes: DisputesPage;
  /** Every building (buildings.html). */
  buildingList: BuildingListPage;
  /** Next year's cost of every building (forecast.html). */
  forecastList: ForecastListPage;
  /** One printable sheet per dispute (claims/<id>.html). */
  claims: ClaimSheet[];
}
