/**
 * View models: what each page template receives. Plain objects; every number a reader sees is
 * already a formatted string (money, units, dates). Templates only place these values.
 * Fields named `sort` carry a machine-sortable form of a cell for the table-sort script.
 */

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

/**
 * A chart as the report stage describes it. The site stage fills `spec`, `specJson`, `svg`
 * (src/site/prepareCharts.ts); the template places the SVG fallback, the JSON spec and the table.
 */
export interface ChartModel {
  /** Unique within the page; used as the DOM id. */
  id: string;
  kind: "monthly-usage" | "monthly-cost";
  title: string;
  /** One-sentence description for screen readers and the figure caption. */
  description: string;
  /** Axis label for values, e.g. "Usage (kWh)". */
  valueLabel: string;
  /** Legend title of the series, e.g. "Meter" or "Commodity". */
  seriesLabel: string;
  data: ChartDatum[];
  /** The same numbers as a table: the text equivalent of the chart. */
  table: TableModel;
  spec?: Record<string, unknown>;
  specJson?: string;
  svg?: string;
}

export interface LabelValue {
  label: string;
  value: string;
}

export interface PageBase {
  /** `<title>` and `<h1>`. */
  title: string;
  /** Relative prefix from this page to the site root: "" or "../". */
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

export interface IndexPage extends PageBase {
  /** Opening sentence, e.g. "Utility bills for 6 buildings, each re-priced from its tariff and checked." */
  lede: string;
  headline: LabelValue[];
  buildingsTable: TableModel;
  /** Sentence naming the 12-month window used, e.g. "Jan 1, 2025 – Dec 31, 2025". */
  windowText: string;
  buildings: IndexBuildingRow[];
  /** Portfolio charts (monthly billed cost by commodity). */
  charts: ChartModel[];
}

export interface MathLine {
  label: string;
  kind: string;
  quantity: string;
  rate: string;
  amount: string;
  status: string;
  note: string;
}

/** The line-by-line re-pricing of one bill, shown in a `<details>`. */
export interface BillMath {
  billId: string;
  period: string;
  /** "priced" with lines, or "not-priced" with a reason. */
  state: "priced" | "not-priced";
  reason: string;
  lines: MathLine[];
  total: string;
  billed: string;
  difference: string;
  facts: LabelValue[];
  notes: string[];
}

export interface MeterSection {
  meterId: string;
  heading: string;
  facts: LabelValue[];
  billsTable: TableModel;
  math: BillMath[];
  /** Interval data by calendar month, when the meter has any. */
  meteredTable: TableModel | null;
}

export interface CommoditySection {
  commodity: string;
  heading: string;
  charts: ChartModel[];
}

export interface BuildingPage extends PageBase {
  buildingId: string;
  summary: LabelValue[];
  commodities: CommoditySection[];
  meters: MeterSection[];
  findingsTable: TableModel | null;
  /** This building's own data files (`data/buildings/<id>/…`), filled by the site writer. */
  downloads: DataFileRow[];
  forecastTable: TableModel | null;
  modelsTable: TableModel | null;
}

export interface UnitFactorRow {
  from: string;
  to: string;
  factor: string;
  source: string;
}

export interface MethodsPage extends PageBase {
  currency: string;
  unitFactors: UnitFactorRow[];
  windowText: string;
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
  /** `base_path` from portfolio.yaml; used only for canonical links (all site links are relative). */
  basePath: string;
}

export interface SiteModel {
  meta: SiteMeta;
  index: IndexPage;
  buildings: BuildingPage[];
  methods: MethodsPage;
  data: DataPage;
}
