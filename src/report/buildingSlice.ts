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
  /** Bills and printed lines by building id, in file order. */
  billsByBuilding: ReadonlyMap<string, Bill[]>;
  linesByBuilding: ReadonlyMap<string, BillLine[]>;
}

/** The source of every building's slice (one pass over the bills and lines, not one per building). */
export function sliceSource(input: ReportInput, billsByMeter: ReadonlyMap<string, Bill[]>, linesByBill: ReadonlyMap<string, BillLine[]>, asOf: string | null): SliceSource {
  const rows = billRowsByBuilding(input.portfolio);
  return { input, billsByMeter, linesByBill, asOf, billsByBuilding: rows.bills, linesByBuilding: rows.billLines };
}

const rowsByPortfolio = new WeakMap<Pick<Portfolio, "meters" | "bills" | "billLines">, { bills: Map<string, Bill[]>; billLines: Map<string, BillLine[]> }>();

/**
 * Bills and printed bill lines of each building, in file order (a bill whose meter is in no
 * building, and its lines, in none), grouped once per portfolio object: the analysis tasks and
 * the page slices both cut the portfolio by building, and filtering every bill per building
 * grows with buildings × bills.
 */
export function billRowsByBuilding(portfolio: Pick<Portfolio, "meters" | "bills" | "billLines">): { bills: Map<string, Bill[]>; billLines: Map<string, BillLine[]> } {
  let rows = rowsByPortfolio.get(portfolio);
  if (rows) return rows;
  const buildingOfMeter = new Map(portfolio.meters.map((m) => [m.meterId, m.buildingId]));
  const buildingOfBill = new Map(portfolio.bills.map((b) => [b.billId, buildingOfMeter.get(b.meterId)]));
  rows = {
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
  const meters = portfolio.meters.filter((m) => m.buildingId === id);
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
  const ownMeter = (meterId: string | null | undefined) => meterId != null && meterIds.has(meterId);
  const ownBill = (billId: string | null | undefined) => billId != null && billIds.has(billId);
  // Looked up by the building's own keys (its meters, its bills), in their order.
  const mapOf = <V>(map: ReadonlyMap<string, V> | undefined, keys: Iterable<string>): Map<string, V> | undefined => {
    if (map === undefined) return undefined;
    const out = new Map<string, V>();
    for (const k of keys) if (map.has(k)) out.set(k, map.get(k)!);
    return out;
  };
  const ofBuilding = <T extends { buildingId: string; meterId?: string | null }>(rows: readonly T[] | undefined): T[] | undefined =>
    rows?.filter((r) => r.buildingId === id || ownMeter(r.meterId));
  const ofMeters = <T extends { meterId: string }>(rows: readonly T[] | undefined): T[] | undefined => rows?.filter((r) => ownMeter(r.meterId));
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
    findings: input.findings?.filter((f) => f.buildingId === id || ownMeter(f.meterId) || ownBill(f.billId)),
    disputes: input.disputes?.filter((d) => d.buildingId === id || ownMeter(d.meterId) || d.billIds.some(ownBill) || d.bills.some((b) => ownBill(b.billId)) || d.relatedBillIds.some(ownBill)),
    models: ofMeters(input.models),
    forecast: ofBuilding(input.forecast),
    quality: ofBuilding(input.quality),
    weatherDetections: input.weatherDetections?.filter((w) => w.stationId === building.weatherStation),
    baselines: ofMeters(input.baselines),
    trackRecord: ofMeters(input.trackRecord),
    forecastTotals: input.forecastTotals?.filter((t) => t.buildingId === id),
    buildingForecasts: input.buildingForecasts?.filter((t) => t.buildingId === id),
    trackRecordNotes: ofBuilding(input.trackRecordNotes),
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
