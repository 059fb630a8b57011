/**
 * One building's part of the report input: everything its pages (the building page, its meter
 * pages and its tenant page) are made from, and nothing else. The pages are made from the slice
 * alone (buildSiteModel.ts), never from the whole input, so the slice's content is a complete
 * key of those pages: while it is unchanged (and the program, templates and site-wide page parts
 * are), the pages are too, and a rebuild can reuse them without making their view models
 * (src/site/pageReuse.ts). Portfolio-wide figures a building page shows (how the forecast was
 * made) are in the slice as the text the page shows, so a change that does not change that text
 * does not change every building's key.
 *
 * Each list is the whole input's list filtered to the building's own rows (its id, its meters,
 * its bills), in the same order; an absent block stays absent. A page made from the slice equals
 * the page made from the whole input (test/report/buildingSlice.test.ts).
 */
import type { Bill, BillLine, Building, Meter, Portfolio } from "../domain/types.ts";
import type { ReportInput } from "./input.ts";
import type { TableModel } from "./siteModel.ts";
import { forecastMethodShown } from "./forecastSection.ts";
import { groupBy } from "../core/groupBy.ts";

export interface BuildingSlice {
  building: Building;
  meters: Meter[];
  /** Bills of the building's meters by meter id, sorted by period start (then bill id). */
  billsByMeter: Map<string, Bill[]>;
  /** Printed bill lines of the building's bills, by bill id, in file order. */
  linesByBill: Map<string, BillLine[]>;
  asOf: string | null;
  /** The forecast method's sentences and tables as this building's page shows them; null without a forecast. */
  forecastMethod: { sentences: string[]; tables: TableModel[] } | null;
  /** The report input cut to this building (see the module comment). */
  input: ReportInput;
}

/** The parts of a whole input shared by every building's slice, grouped once per build (sliceSource). */
export interface SliceSource {
  input: ReportInput;
  billsByMeter: ReadonlyMap<string, Bill[]>;
  linesByBill: ReadonlyMap<string, BillLine[]>;
  asOf: string | null;
  /** Meters, bills and printed lines by building id, in file order. */
  metersByBuilding: ReadonlyMap<string, Meter[]>;
  billsByBuilding: ReadonlyMap<string, Bill[]>;
  linesByBuilding: ReadonlyMap<string, BillLine[]>;
  /** The input's other portfolio-wide lists by building (ownedRows). */
  owned: OwnedRows;
}

/** The source of every building's slice (one pass over the bills and lines, not one per building). */
export function sliceSource(input: ReportInput, billsByMeter: ReadonlyMap<string, Bill[]>, linesByBill: ReadonlyMap<string, BillLine[]>, asOf: string | null): SliceSource {
  const rows = rowsByBuilding(input.portfolio);
  return { input, billsByMeter, linesByBill, asOf, metersByBuilding: rows.meters, billsByBuilding: rows.bills, linesByBuilding: rows.billLines, owned: ownedRows(input, billsByMeter) };
}

/** A list of the input cut by building: each building's rows in list order; absent when the list is. */
type ByBuilding<T> = ReadonlyMap<string, T[]> | undefined;

/**
 * The rows of the input's portfolio-wide lists that belong to each building, grouped once per
 * build: filtering every list for every building grew with buildings × rows (at 1,000 buildings,
 * seconds). A row belongs to every building it names: by its building id, its meter's or its
 * bills' (a dispute can name several); weather detections go by station.
 */
interface OwnedRows {
  findings: ByBuilding<NonNullable<ReportInput["findings"]>[number]>;
  disputes: ByBuilding<NonNullable<ReportInput["disputes"]>[number]>;
  models: ByBuilding<NonNullable<ReportInput["models"]>[number]>;
  forecast: ByBuilding<NonNullable<ReportInput["forecast"]>[number]>;
  quality: ByBuilding<NonNullable<ReportInput["quality"]>[number]>;
  weatherByStation: ReadonlyMap<string, NonNullable<ReportInput["weatherDetections"]>[number][]> | undefined;
  baselines: ByBuilding<NonNullable<ReportInput["baselines"]>[number]>;
  trackRecord: ByBuilding<NonNullable<ReportInput["trackRecord"]>[number]>;
  forecastTotals: ByBuilding<NonNullable<ReportInput["forecastTotals"]>[number]>;
  buildingForecasts: ByBuilding<NonNullable<ReportInput["buildingForecasts"]>[number]>;
  trackRecordNotes: ByBuilding<NonNullable<ReportInput["trackRecordNotes"]>[number]>;
}

function ownedRows(input: ReportInput, billsByMeter: ReadonlyMap<string, Bill[]>): OwnedRows {
  const { portfolio } = input;
  const buildingsOfMeter = new Map<string, string[]>();
  for (const m of portfolio.meters) addOwner(buildingsOfMeter, m.meterId, m.buildingId);
  // A bill is a building's when its meter is (the bills grouped under one of the building's meters).
  const buildingsOfBill = new Map<string, string[]>();
  for (const [meterId, bills] of billsByMeter) for (const owner of buildingsOfMeter.get(meterId) ?? []) for (const b of bills) addOwner(buildingsOfBill, b.billId, owner);
  const ofMeter = (meterId: string | null | undefined): readonly string[] => (meterId == null ? NONE : (buildingsOfMeter.get(meterId) ?? NONE));
  const ofBill = (billId: string | null | undefined): readonly string[] => (billId == null ? NONE : (buildingsOfBill.get(billId) ?? NONE));
  const byIdOrMeter = <T extends { buildingId: string; meterId?: string | null }>(rows: readonly T[] | undefined) => groupByOwners(rows, (r, add) => {
    add(r.buildingId);
    for (const o of ofMeter(r.meterId)) add(o);
  });
  const byMeter = <T extends { meterId: string }>(rows: readonly T[] | undefined) => groupByOwners(rows, (r, add) => {
    for (const o of ofMeter(r.meterId)) add(o);
  });
  const byId = <T extends { buildingId: string }>(rows: readonly T[] | undefined) => groupByOwners(rows, (r, add) => add(r.buildingId));
  return {
    findings: groupByOwners(input.findings, (f, add) => {
      add(f.buildingId);
      for (const o of ofMeter(f.meterId)) add(o);
      for (const o of ofBill(f.billId)) add(o);
    }),
    disputes: groupByOwners(input.disputes, (d, add) => {
      add(d.buildingId);
      for (const o of ofMeter(d.meterId)) add(o);
      for (const id of d.billIds) for (const o of ofBill(id)) add(o);
      for (const b of d.bills) for (const o of ofBill(b.billId)) add(o);
      for (const id of d.relatedBillIds) for (const o of ofBill(id)) add(o);
    }),
    models: byMeter(input.models),
    forecast: byIdOrMeter(input.forecast),
    quality: byIdOrMeter(input.quality),
    weatherByStation: input.weatherDetections === undefined ? undefined : groupBy(input.weatherDetections, (w) => w.stationId),
    baselines: byMeter(input.baselines),
    trackRecord: byMeter(input.trackRecord),
    forecastTotals: byId(input.forecastTotals),
    buildingForecasts: byId(input.buildingForecasts),
    trackRecordNotes: byIdOrMeter(input.trackRecordNotes),
  };
}

const NONE: readonly string[] = [];

function addOwner(owners: Map<string, string[]>, key: string, owner: string): void {
  const list = owners.get(key);
  if (list === undefined) owners.set(key, [owner]);
  else if (!list.includes(owner)) list.push(owner);
}

/** `rows` under each building `owners` names for a row (a row once per building, however often named), in list order. */
function groupByOwners<T>(rows: readonly T[] | undefined, owners: (row: T, add: (buildingId: string | null | undefined) => void) => void): Map<string, T[]> | undefined {
  if (rows === undefined) return undefined;
  const out = new Map<string, T[]>();
  for (const row of rows) {
    owners(row, (buildingId) => {
      if (buildingId == null) return;
      const list = out.get(buildingId);
      if (list === undefined) out.set(buildingId, [row]);
      // Rows are added in list order, so a row named twice for a building is that list's last.
      else if (list[list.length - 1] !== row) list.push(row);
    });
  }
  return out;
}

/** Meters, bills and printed bill lines of each building, in file order. */
export interface RowsByBuilding {
  meters: Map<string, Meter[]>;
  bills: Map<string, Bill[]>;
  billLines: Map<string, BillLine[]>;
}

const rowsByPortfolio = new WeakMap<Pick<Portfolio, "meters" | "bills" | "billLines">, RowsByBuilding>();

/**
 * Meters, bills and printed bill lines of each building, in file order (a bill whose meter is in
 * no building, and its lines, in none), grouped once per portfolio object: the analysis tasks and
 * the page slices both cut the portfolio by building, and filtering every meter or bill per
 * building grows with buildings × rows. The lists are shared: take a copy to change one.
 */
export function rowsByBuilding(portfolio: Pick<Portfolio, "meters" | "bills" | "billLines">): RowsByBuilding {
  let rows = rowsByPortfolio.get(portfolio);
  if (rows) return rows;
  const buildingOfMeter = new Map(portfolio.meters.map((m) => [m.meterId, m.buildingId]));
  const buildingOfBill = new Map(portfolio.bills.map((b) => [b.billId, buildingOfMeter.get(b.meterId)]));
  rows = {
    meters: groupBy(portfolio.meters, (m) => m.buildingId),
    bills: groupBy(portfolio.bills, (b) => buildingOfMeter.get(b.meterId)),
    billLines: groupBy(portfolio.billLines, (l) => buildingOfBill.get(l.billId)),
  };
  rowsByPortfolio.set(portfolio, rows);
  return rows;
}

/**
 * The slice of `building` (see the module comment).
 * @example buildingSlice(source, building).input.findings // the building's own findings
 */
export function buildingSlice(source: SliceSource, building: Building): BuildingSlice {
  const { input } = source;
  const { portfolio } = input;
  const id = building.buildingId;
  const { owned } = source;
  // The building's rows of a list (a copy: a caller may change its slice's lists); absent when the list is.
  const rowsOf = <T>(index: ReadonlyMap<string, T[]> | undefined, key: string = id): T[] | undefined => (index === undefined ? undefined : [...(index.get(key) ?? [])]);
  const meters = rowsOf(source.metersByBuilding)!;
  const meterIds = new Set(meters.map((m) => m.meterId));
  const billsByMeter = new Map<string, Bill[]>();
  for (const m of meters) {
    const bills = source.billsByMeter.get(m.meterId);
    if (bills) billsByMeter.set(m.meterId, bills);
  }
  const bills = [...billsByMeter.values()].flat();
  const billIds = new Set(bills.map((b) => b.billId));
  const linesByBill = new Map<string, BillLine[]>();
  for (const b of bills) {
    const lines = source.linesByBill.get(b.billId);
    if (lines) linesByBill.set(b.billId, lines);
  }
  // Looked up by the building's own keys (its meters, its bills), in their order.
  const mapOf = <V>(map: ReadonlyMap<string, V> | undefined, keys: Iterable<string>): Map<string, V> | undefined => {
    if (map === undefined) return undefined;
    const out = new Map<string, V>();
    for (const k of keys) if (map.has(k)) out.set(k, map.get(k)!);
    return out;
  };
  const ownPortfolio: Portfolio = {
    root: "",
    settings: portfolio.settings,
    buildings: [building],
    meters,
    // A bill whose meter is not in meters.csv belongs to no building (as the pages see it).
    bills: source.billsByBuilding.get(id) ?? [],
    billLines: source.linesByBuilding.get(id) ?? [],
    intervals: mapOf(portfolio.intervals, meterIds)!,
    weather: new Map(),
    normals: new Map(),
    tariffs: new Map(),
    report: { ...portfolio.report, files: [] },
  };
  const own: ReportInput = {
    portfolio: ownPortfolio,
    priced: mapOf(input.priced, billIds)!,
    monthlyMetered: mapOf(input.monthlyMetered, meterIds)!,
    issues: [],
    buildDate: input.buildDate,
    buildDateKind: input.buildDateKind,
    heatContentByMeter: mapOf(input.heatContentByMeter, meterIds),
    rejectedRowsByBuilding: mapOf(input.rejectedRowsByBuilding, [id]),
    findings: rowsOf(owned.findings),
    disputes: rowsOf(owned.disputes),
    models: rowsOf(owned.models),
    forecast: rowsOf(owned.forecast),
    quality: rowsOf(owned.quality),
    weatherDetections: rowsOf(owned.weatherByStation, building.weatherStation),
    baselines: rowsOf(owned.baselines),
    trackRecord: rowsOf(owned.trackRecord),
    forecastTotals: rowsOf(owned.forecastTotals),
    buildingForecasts: rowsOf(owned.buildingForecasts),
    trackRecordNotes: rowsOf(owned.trackRecordNotes),
  };
  return {
    building,
    meters,
    billsByMeter,
    linesByBill,
    asOf: source.asOf,
    forecastMethod: forecastMethodShown(input, meters),
    input: own,
  };
}
