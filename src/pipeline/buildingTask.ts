/**
 * The worker side of the analysis pool (analysisPool.ts): a building's slice of the portfolio as
 * plain data, its analysis, and its results as plain data and back. Imports nothing of the site
 * writer, so a worker thread loads only the analysis.
 */
import type { Building, Portfolio } from "../domain/types.ts";
import type { Tariff } from "../tariff/index.ts";
import { bugReportLine, type BugPolicy } from "../core/errors.ts";
import { fitChangePointAt, SHORT_HISTORY_WEEKS } from "../model/index.ts";
import { rowsByBuilding, type BuildingResults } from "../report/index.ts";
import { analyseBuilding, rethrow, type BugHandler } from "./analyseBuilding.ts";

/** One building's work, as sent to a worker: plain, structured-clonable data. */
export interface BuildingTask {
  buildingId: string;
  /** What a bug (not an expected problem) in the analysis does: fail the build, or become the building's failure, reported. */
  onBug: BugPolicy;
  portfolio: Portfolio<Tariff>;
  masks: Map<string, Uint8Array>;
}

const WEEK_MS = 7 * 24 * 3_600_000;

/** The part of `portfolio` that analysing `building` reads (see the module comment). */
export function buildingTask(portfolio: Portfolio<Tariff>, building: Building, masks: ReadonlyMap<string, Uint8Array>, onBug: BugPolicy = "fail"): BuildingTask {
  const rows = rowsByBuilding(portfolio);
  const own = [...(rows.meters.get(building.buildingId) ?? [])];
  const short = own.some((m) => {
    const s = m.commodity === "electricity" ? portfolio.intervals.get(m.meterId) : undefined;
    return s !== undefined && s.startMs.length > 0 && (s.startMs[s.startMs.length - 1]! - s.startMs[0]!) / WEEK_MS < SHORT_HISTORY_WEEKS;
  });
  const meterIds = new Set(own.map((m) => m.meterId));
  const buildingIds = new Set([building.buildingId]);
  if (short) {
    for (const m of portfolio.meters) {
      if (m.commodity === "electricity" && portfolio.intervals.has(m.meterId)) {
        meterIds.add(m.meterId);
        buildingIds.add(m.buildingId);
      }
    }
  }
  const buildings = portfolio.buildings.filter((b) => buildingIds.has(b.buildingId));
  // Meter ids are unique (readMeters refuses a repeat): without other buildings' meters, the building's own.
  const meters = short ? portfolio.meters.filter((m) => meterIds.has(m.meterId)) : own;
  const stations = new Set(buildings.map((b) => b.weatherStation));
  // Keys first: reading a value may mean reading a file (IntervalShelf).
  const pick = <V>(map: ReadonlyMap<string, V>, keep: (k: string) => boolean) => new Map([...map.keys()].filter(keep).map((k) => [k, map.get(k)!]));
  return {
    buildingId: building.buildingId,
    onBug,
    portfolio: {
      ...portfolio,
      // Not read by the analysis; left out so the task (and its cache key) is the building's own.
      root: "",
      report: { files: [] },
      buildings,
      meters,
      bills: rows.bills.get(building.buildingId) ?? [],
      billLines: rows.billLines.get(building.buildingId) ?? [],
      intervals: pick(portfolio.intervals, (k) => meterIds.has(k)),
      weather: pick(portfolio.weather, (k) => stations.has(k)),
      normals: pick(portfolio.normals, (k) => stations.has(k)),
      // Every tariff: the rate check re-prices a bill on the portfolio's other tariffs.
      tariffs: portfolio.tariffs,
    },
    masks: pick(masks, (k) => meterIds.has(k)),
  };
}

/** Results as plain data (what a worker returns), with the line reporting a bug when there was one. */
export type PlainResults = BuildingResults & { bugReport?: string };

/**
 * A deep copy of `value` without functions, keeping Map, Set, typed arrays and Date.
 * @throws Error on an instance of any other class (its methods would be lost silently).
 */
export function toPlain<T>(value: T): T {
  return copy(value, "results") as T;
}

function copy(value: unknown, path: string): unknown {
  if (value === null || typeof value !== "object") return typeof value === "function" ? undefined : value;
  if (ArrayBuffer.isView(value) || value instanceof Date) return value;
  if (Array.isArray(value)) return value.map((v, i) => copy(v, `${path}[${i}]`));
  if (value instanceof Map) return new Map([...value].map(([k, v]) => [k, copy(v, `${path}.get(${String(k)})`)]));
  if (value instanceof Set) return new Set([...value].map((v) => copy(v, `${path} item`)));
  const proto = Object.getPrototypeOf(value);
  if (proto !== Object.prototype && proto !== null) {
    throw new Error(`${path} is a ${proto?.constructor?.name ?? "class"} instance, which cannot cross to a worker thread as plain data`);
  }
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(value)) {
    if (typeof v === "function") continue;
    out[k] = copy(v, `${path}.${k}`);
  }
  return out;
}

/**
 * What a worker does with one task: analyse the building and return its results as plain data,
 * hourly models reduced to their summaries.
 */
export function analyseTask(task: BuildingTask): PlainResults {
  const building = task.portfolio.buildings.find((b) => b.buildingId === task.buildingId);
  if (!building) throw new Error(`building ${task.buildingId} is not in its own task`);
  let bugReport: string | undefined;
  const onBug: BugHandler =
    task.onBug === "fail"
      ? rethrow
      : (error) => {
          bugReport = bugReportLine(`analysing building ${task.buildingId}`, error);
          return `internal error (a bug in ohmbook, reported on the terminal): ${error instanceof Error ? error.message : String(error)}`;
        };
  const plain: PlainResults = plainResults(analyseBuilding(task.portfolio, building, task.masks, onBug));
  if (bugReport !== undefined) plain.bugReport = bugReport;
  return plain;
}

/** `results` with functions dropped and hourly models reduced to their summaries. */
export function plainResults(results: BuildingResults): PlainResults {
  const compact: BuildingResults = {
    ...results,
    intervalBaselines: results.intervalBaselines.map((o) => ({ meterId: o.meterId, problem: o.problem, baseline: o.baseline ? { summary: o.baseline.summary } : null })),
  };
  return toPlain(compact);
}

/**
 * Plain results made whole again: each meter's change-point fit rebuilt from its own points and
 * breakpoints (fitChangePointAt with the selection's weighting, as fitMeterBaseline chose it).
 * The degree-day fits stay data (nothing after the analysis calls them).
 */
export function hydrateResults(plain: PlainResults): BuildingResults {
  const { bugReport: _bugReport, ...results } = plain;
  return {
    ...results,
    baselines: results.baselines.map((b) => (b.fit ? { ...b, fit: fitChangePointAt(b.points, b.fit.kind, b.fit.breakpoints, { weightByDays: true }) } : b)),
  };
}

