/**
 * The portfolio as ingest hands it to every later stage: plain, validated, typed data.
 * Dates are ISO `YYYY-MM-DD` strings (calendar days in the building's zone);
 * instants are UTC epoch milliseconds.
 */

export type Commodity = "electricity" | "gas" | "water";
export const COMMODITIES: readonly Commodity[] = ["electricity", "gas", "water"];

/** Where a record came from, so any later finding can point back at the input line. */
export interface SourceRef {
  file: string;
  line: number;
}

export interface Tolerances {
  usagePct: number;
  demandPct: number;
  costAbs: number;
  costPct: number;
}

export interface PortfolioSettings {
  name: string;
  currency: string;
  /** Last day of data to use; null = last bill end. */
  asOf: string | null;
  forecastMonths: number;
  /** Yearly price drift as a fraction (0.03 = 3 %), per commodity; `escalationStated` says whether the user gave it. */
  escalation: Record<Commodity, number>;
  escalationStated: boolean;
  tolerances: Tolerances;
  degreeDayBase: { heating: number; cooling: number; unit: "C" | "F" };
  /** URL prefix, always starting and ending with "/". */
  basePath: string;
  /** Whether interval timestamps mark the interval start (default) or end. */
  intervalTimestamp: "start" | "end";
  /** Longest weather gap, in hours, filled by linear interpolation. */
  weatherMaxGapHours: number;
  /** Detector settings from the `cleaning:` block (section → setting → number), camelCase keys. */
  cleaning: Record<string, Record<string, number>>;
  /**
   * Meter clock corrections: hours by which a meter's timestamps run ahead of true time
   * (they are shifted back by that much), and whether strong suggestions are applied automatically.
   */
  alignment: { offsetsHours: Record<string, number>; auto: boolean };
  /** One contact line per building id for its tenant page (`contacts:` in portfolio.yaml); absent = none given. */
  contacts?: Record<string, string>;
}

export interface Building {
  buildingId: string;
  name: string;
  floorArea: number;
  areaUnit: "ft2" | "m2";
  floorAreaM2: number;
  timezone: string;
  weatherStation: string;
  useType: string | null;
  tenantPage: boolean;
  source: SourceRef;
}

export interface Meter {
  meterId: string;
  buildingId: string;
  commodity: Commodity;
  /** Usage unit on bills, as written (kWh, MWh, therm, ccf, m3, gal). */
  unit: string;
  tariffId: string;
  multiplier: number;
  account: string | null;
  source: SourceRef;
}

export interface Bill {
  billId: string;
  meterId: string;
  /** First day of service (inclusive). */
  periodStart: string;
  /** Next meter-read date (exclusive). */
  periodEnd: string;
  usage: number;
  readType: "actual" | "estimated";
  demandKw: number | null;
  powerFactor: number | null;
  total: number;
  statementDate: string | null;
  source: SourceRef;
}

export interface BillLine {
  billId: string;
  label: string;
  amount: number;
  source: SourceRef;
}

/**
 * One meter's interval data, sorted by time, one entry per distinct interval start.
 * `values` are in the meter's unit BEFORE the multiplier (as in the file).
 */
export interface IntervalSeries {
  meterId: string;
  intervalMinutes: number;
  /** Interval start instants, UTC epoch ms, strictly increasing. */
  startMs: Float64Array;
  values: Float64Array;
}

/** Hourly temperature for one station, on a regular UTC hour grid; NaN = missing (gap too long). */
export interface WeatherSeries {
  stationId: string;
  /** First hour, UTC epoch ms (top of an hour). */
  startMs: number;
  /** Temperature in °C for each hour from startMs. */
  tempC: Float64Array;
  /** Which hours were filled by interpolation or from daily max/min. */
  filled: Uint8Array;
}

export interface RowRejection {
  line: number;
  reason: string;
}

export interface FileReport {
  file: string;
  rowsRead: number;
  rowsUsed: number;
  rowsRejected: number;
  rejections: RowRejection[];
  warnings: string[];
}

export interface IngestReport {
  files: FileReport[];
}

/** Everything ingest read from a portfolio folder. Tariffs are kept as parsed by src/tariff. */
export interface Portfolio<TariffT = unknown> {
  /** Absolute path of the folder read. */
  root: string;
  settings: PortfolioSettings;
  buildings: Building[];
  meters: Meter[];
  bills: Bill[];
  billLines: BillLine[];
  /** Keyed by meter_id. */
  intervals: ReadonlyMap<string, IntervalSeries>;
  /** Keyed by station_id; hourly, gaps filled up to the configured limit. */
  weather: Map<string, WeatherSeries>;
  /** Typical-year hourly temperatures by station, when weather/normals has them. */
  normals: Map<string, WeatherSeries>;
  /** Keyed by tariff id. */
  tariffs: Map<string, TariffT>;
  report: IngestReport;
}

export interface WeatherGap {
  stationId: string;
  /** First missing hour, UTC epoch ms. */
  startMs: number;
  /** First hour after the gap (exclusive end), UTC epoch ms. */
  endMs: number;
  hours: number;
  action: "interpolated" | "kept";
}
