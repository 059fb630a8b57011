/**
 * `ohmbook import espi`: adds the usage points of ESPI ("Green Button") files to a portfolio folder.
 *
 * - one meter per usage point and reading type, id `<building>-<E|G|W>-<8 hex>` (see espiMeterId),
 *   appended to meters.csv unless already there;
 * - readings of 5, 15, 30 or 60 minutes → `intervals/<meter_id>-<year>.csv` (meter_id, timestamp with
 *   the building's UTC offset, value in the meter's unit, interval_minutes), merged with what is there;
 *   reading quality codes → `espi/reading-quality/<meter_id>-<year>.csv` (the input contract has no
 *   column for them); longer readings (daily, monthly) are counted and reported, not written;
 * - usage summaries stating billLastPeriod → bills.csv, their cost details → bill_lines.csv;
 * - the building is added to buildings.csv when missing (then a time zone is required).
 *
 * Two streaming passes per file (resources, then readings), so memory does not grow with the file.
 * Nothing is written unless every file maps without error; interval files are staged and renamed
 * into place, CSV files replaced through a rename. Importing the same data again adds nothing.
 */
import { existsSync } from "node:fs";
import { mkdtemp, readFile, readdir, rm } from "node:fs/promises";
import { join } from "node:path";
import { isValidZone, isoWithOffset, localPartsOf } from "../../core/time/index.ts";
import { parse as parseYaml } from "yaml";
import { InputError, UsageError } from "../../core/errors.ts";
import type { InputIssue } from "../../core/issues.ts";
import { appendRows, readCsvTable, replaceFile, type CsvTable } from "../portfolioCsv.ts";
import { StartsSeen } from "../startsSeen.ts";
import { YearFileStore } from "../yearFiles.ts";
import { INTERVAL_SECONDS, QUALITY } from "./codes.ts";
import { decimalToScaled, isIntegerText, scaledToDecimal, shiftDecimal } from "./decimal.ts";
import { type FeedPlan, type PlannedMeter, planFeed } from "./mapFeed.ts";
import { FeedSyntaxError, child, readEspiFeed } from "./readFeed.ts";

export interface EspiImportOptions {
  files: string[];
  intoDir: string;
  buildingId: string;
  /** IANA zone; required when the building is new, checked against it otherwise. */
  timezone?: string;
  /** Tariff id written on new meters. */
  tariff?: string;
  /** For a new building: its name, floor area (ft² unless area unit given) and weather station. */
  buildingName?: string;
  floorArea?: string;
  weatherStation?: string;
  /** Readings buffered before a merge into the interval files (tests use small values). */
  flushRows?: number;
}

export interface EspiMeterReport {
  meterId: string;
  commodity: string;
  unit: string;
  isNew: boolean;
  /** Readings of 5–60 minutes in the file and their sum (exact decimal, meter unit). */
  intervalReadings: number;
  intervalTotal: string;
  /** Of those, rows added to the interval files and rows already there. */
  added: number;
  alreadyPresent: number;
  /** Readings longer than an hour (not interval data in ohmbook), counted and summed. */
  longReadings: number;
  longTotal: string;
  /** Readings left out with a warning: no duration, or a second reading of the same start. */
  skippedReadings: number;
  skippedTotal: string;
  qualityFlagged: number;
}

export interface EspiFileReport {
  file: string;
  entries: number;
  meters: EspiMeterReport[];
  bills: { billId: string; meterId: string; periodStart: string; periodEnd: string; usage: string; total: string; added: boolean }[];
}

export interface EspiImportResult {
  files: EspiFileReport[];
  buildingCreated: boolean;
  metersAdded: number;
  billsAdded: number;
  billLinesAdded: number;
  intervalRowsAdded: number;
  /** Files written or replaced, relative to the portfolio folder. */
  written: string[];
  warnings: InputIssue[];
}

const PLACES = 24;
const INTERVAL_HEADER = "meter_id,timestamp,value,interval_minutes";
const QUALITY_HEADER = "meter_id,timestamp,quality,meaning";
const MAX_ERRORS = 200;
const MAX_SKIP_WARNINGS = 20;

const DEFAULT_HEADERS = {
  buildings: ["building_id", "name", "floor_area", "area_unit", "timezone", "weather_station", "use_type", "tenant_page"],
  meters: ["meter_id", "building_id", "commodity", "unit", "tariff", "multiplier", "account"],
  bills: ["meter_id", "bill_id", "period_start", "period_end", "usage", "read_type", "demand", "power_factor", "total", "statement_date"],
  billLines: ["bill_id", "label", "amount"],
} as const;

/**
 * Imports `options.files` into `options.intoDir`.
 * @throws UsageError for wrong options (no portfolio, unknown zone, missing --timezone)
 * @throws InputError with file:line issues when a file cannot be mapped (nothing is written)
 */
export async function importEspi(options: EspiImportOptions): Promise<EspiImportResult> {
  const dir = options.intoDir;
  const issues: InputIssue[] = [];
  const fileIssue = (file: string, line: number, severity: "error" | "warning", message: string, hint?: string): void => {
    issues.push({ file, line, column: 0, severity, message, hint });
  };
  if (!/^[A-Za-z0-9_-]+$/.test(options.buildingId)) throw new UsageError(`--building '${options.buildingId}' may hold only letters, digits, '_' and '-'`);
  if (!existsSync(join(dir, "portfolio.yaml"))) {
    throw new UsageError(`${dir} is not a portfolio folder (no portfolio.yaml); create one with 'ohmbook init ${dir}' or give the right --into`);
  }
  if (options.timezone !== undefined && !isValidZone(options.timezone)) {
    throw new UsageError(`--timezone '${options.timezone}' is not an IANA zone name (e.g. America/Chicago)`);
  }
  for (const f of options.files) if (!existsSync(f)) throw new UsageError(`cannot read '${f}': no such file`);

  const currency = await portfolioCurrency(join(dir, "portfolio.yaml"));
  const buildings = await readTable(join(dir, "buildings.csv"), DEFAULT_HEADERS.buildings);
  const meters = await readTable(join(dir, "meters.csv"), DEFAULT_HEADERS.meters);
  const bills = await readTable(join(dir, "bills.csv"), DEFAULT_HEADERS.bills);
  const billLines = await readTable(join(dir, "bill_lines.csv"), DEFAULT_HEADERS.billLines);

  // The building: existing (its zone rules) or new (needs --timezone).
  const existingBuilding = buildings.rows.find((r) => r.cells.building_id === options.buildingId);
  let zone: string;
  const newBuildingRows: Record<string, string>[] = [];
  if (existingBuilding) {
    zone = existingBuilding.cells.timezone ?? "";
    if (!isValidZone(zone)) {
      throw new InputError([{ file: buildings.path, line: existingBuilding.line, column: 0, severity: "error", message: `building ${options.buildingId} has timezone '${zone}', not an IANA zone`, hint: "fix it in buildings.csv, e.g. America/Chicago" }]);
    }
    if (options.timezone !== undefined && options.timezone !== zone) {
      throw new UsageError(`--timezone ${options.timezone} differs from building ${options.buildingId}'s timezone ${zone} (${buildings.path}:${existingBuilding.line}); leave out --timezone or correct buildings.csv`);
    }
  } else {
    if (options.timezone === undefined) {
      throw new UsageError(`building ${options.buildingId} is not in ${buildings.path}; give --timezone ZONE (an IANA name such as America/New_York) to create it`);
    }
    zone = options.timezone;
    newBuildingRows.push({
      building_id: options.buildingId,
      name: options.buildingName ?? options.buildingId,
      floor_area: options.floorArea ?? "",
      timezone: zone,
      weather_station: options.weatherStation ?? "",
    });
    const missing = [options.floorArea === undefined ? "floor_area" : "", options.weatherStation === undefined ? "weather_station" : ""].filter(Boolean);
    if (missing.length > 0) {
      fileIssue(buildings.path, buildings.rows.length + 2, "warning", `building ${options.buildingId} was added without ${missing.join(" and ")}`,
        "fill in the empty cells of buildings.csv before building (or pass --floor-area and --weather-station when importing into a new building)");
    }
  }

  // Pass 1: resources of every file.
  const plans: { file: string; plan: FeedPlan }[] = [];
  for (const file of options.files) {
    try {
      const plan = await planFeed(file, { fileLabel: file, buildingId: options.buildingId, zone, currency });
      issues.push(...plan.issues);
      plans.push({ file, plan });
    } catch (error) {
      if (!(error instanceof FeedSyntaxError)) throw error;
      fileIssue(file, error.line, "error", error.message, "the file must be the XML the utility's Green Button download produced, unchanged");
    }
  }
  if (issues.some((i) => i.severity === "error")) throw new InputError(issues);

  const tariffCommodity = options.tariff === undefined ? null : await commodityOfTariff(join(dir, "tariffs"), options.tariff);
  if (options.tariff !== undefined && tariffCommodity === null) {
    fileIssue(join(dir, "tariffs"), 0, "warning", `no tariff file in tariffs/ has id ${options.tariff}`, "add that tariff file before building, or correct --tariff");
  }
  // Meters: new ones appended, existing ones must agree.
  const meterRowById = new Map(meters.rows.map((r) => [r.cells.meter_id ?? "", r]));
  const newMeterRows: Record<string, string>[] = [];
  const newMeterIds = new Set<string>();
  for (const { file, plan } of plans) {
    for (const m of plan.meters) {
      const row = meterRowById.get(m.meterId);
      if (row) {
        const c = row.cells;
        if (c.building_id !== options.buildingId || c.commodity !== m.commodity || c.unit !== m.unit) {
          fileIssue(meters.path, row.line, "error", `meter ${m.meterId} is already in meters.csv as ${c.commodity} in ${c.unit} of building ${c.building_id}, but ${file} has it as ${m.commodity} in ${m.unit} of building ${options.buildingId}`,
            "import into the building the meter belongs to, or remove the old row");
        }
        continue;
      }
      if (newMeterIds.has(m.meterId)) continue;
      newMeterIds.add(m.meterId);
      // --tariff goes on the meters of its commodity only (a gas meter never gets an electric tariff).
      const tariff = options.tariff !== undefined && (tariffCommodity === null || tariffCommodity === m.commodity) ? options.tariff : "";
      if (options.tariff !== undefined && tariff === "") {
        fileIssue(meters.path, 0, "warning", `meter ${m.meterId} is ${m.commodity} but tariff ${options.tariff} is for ${tariffCommodity}; its tariff column was left empty`, "write the id of a tariff file for that commodity in meters.csv");
      }
      newMeterRows.push({ meter_id: m.meterId, building_id: options.buildingId, commodity: m.commodity, unit: m.unit, tariff, multiplier: "1" });
    }
  }
  const untariffed = newMeterRows.filter((r) => r.tariff === "");
  if (untariffed.length > 0 && options.tariff === undefined) {
    fileIssue(meters.path, meters.rows.length + 2, "warning", `${untariffed.length} meter(s) added without a tariff: ${untariffed.map((r) => r.meter_id).join(", ")}`,
      "write the id of a tariff file in their tariff column (or pass --tariff ID when importing)");
  }
  if (issues.some((i) => i.severity === "error")) throw new InputError(issues);

  // Pass 2: readings, staged.
  const staging = await mkdtemp(join(dir, ".ohmbook-import-"));
  try {
    const store = new YearFileStore(dir, staging, options.flushRows ?? 25_000);
    const reports: EspiFileReport[] = [];
    let errors = 0;
    for (const { file, plan } of plans) {
      const perMeter = new Map<string, { m: PlannedMeter; n: number; sum: bigint; longN: number; longSum: bigint; skipN: number; skipSum: bigint; flagged: number }>();
      for (const m of plan.meters) perMeter.set(m.meterId, { m, n: 0, sum: 0n, longN: 0, longSum: 0n, skipN: 0, skipSum: 0n, flagged: 0 });
      const seen = new StartsSeen(); // starts already read in this file, per meter
      const err = (line: number, message: string, hint: string): void => {
        if (errors++ < MAX_ERRORS) fileIssue(file, line, "error", message, hint);
      };
      let skippedShown = 0;
      const skip = (tally: { skipN: number; skipSum: bigint }, value: string, line: number, message: string, hint: string): void => {
        tally.skipN++;
        tally.skipSum += decimalToScaled(value, PLACES);
        if (skippedShown++ < MAX_SKIP_WARNINGS) fileIssue(file, line, "warning", message, hint);
      };
      await readEspiFeed(file, {
        reading: (ordinal, block, _blockIndex, readingIndex, reading) => {
          const m = plan.meterOfEntry.get(ordinal);
          if (!m) return;
          const tally = perMeter.get(m.meterId)!;
          const period = child(reading, "timePeriod");
          let start: number;
          let duration: number;
          if (period) {
            const s = child(period, "start")?.text.trim() ?? "";
            const d = child(period, "duration")?.text.trim() ?? "";
            if (!isIntegerText(s) || !isIntegerText(d)) {
              err(period.line, `timePeriod start '${s.slice(0, 30)}' / duration '${d.slice(0, 30)}' are not whole numbers of seconds`, "start is Unix seconds (UTC), duration seconds");
              return;
            }
            start = Number(s);
            duration = Number(d);
          } else {
            const bs = child(child(block, "interval"), "start")?.text.trim() ?? "";
            if (!isIntegerText(bs) || m.intervalSeconds === null) {
              err(reading.line, "IntervalReading has no timePeriod, and its block's interval start or the ReadingType's intervalLength is missing", "give each reading a <timePeriod> with start and duration");
              return;
            }
            duration = m.intervalSeconds;
            start = Number(bs) + readingIndex * duration;
          }
          const valueNode = child(reading, "value");
          const raw = valueNode?.text.trim() ?? "";
          if (!isIntegerText(raw)) {
            err(valueNode?.line ?? reading.line, valueNode ? `IntervalReading value '${raw.slice(0, 30)}' is not a whole number` : "IntervalReading has no value", "the value is an integer scaled by the ReadingType's powerOfTenMultiplier");
            return;
          }
          const value = shiftDecimal(raw, m.power);
          if (duration === 0) {
            skip(tally, value, period?.line ?? reading.line, `meter ${m.meterId}: a reading of 0 s at ${start} (value ${value} ${m.unit}) was left out`, "a reading with no duration is not interval data (some producers write one at a clock change)");
            return;
          }
          if (duration > 3600) {
            tally.longN++;
            tally.longSum += decimalToScaled(value, PLACES);
            return;
          }
          if (!INTERVAL_SECONDS.has(duration)) {
            err(child(period, "duration")?.line ?? reading.line, `a reading of ${duration} s is not an interval length ohmbook reads`, "interval data must be 5, 15, 30 or 60 minutes (300, 900, 1800 or 3600 s)");
            return;
          }
          if (seen.has(m.meterId, start)) {
            skip(tally, value, reading.line, `meter ${m.meterId}: a second reading starting at ${start} (value ${value} ${m.unit}) was left out; the first one in the file is kept`, "the file states this interval twice (some producers do at a clock change)");
            return;
          }
          seen.add(m.meterId, start);
          tally.n++;
          tally.sum += decimalToScaled(value, PLACES);
          const timestamp = isoWithOffset(start * 1000, zone);
          const local = localPartsOf(start * 1000, zone);
          const source = { file, line: reading.line };
          const waits: (Promise<void> | null)[] = [];
          waits.push(store.add(`intervals/${m.meterId}-${local.year}.csv`, INTERVAL_HEADER, { epochS: start, cells: [m.meterId, timestamp, value, String(duration / 60)], source }));
          for (const q of reading.children.filter((c) => c.name === "ReadingQuality")) {
            const code = child(q, "quality")?.text.trim() ?? "";
            if (!isIntegerText(code) || QUALITY[Number(code)] === undefined) {
              err(child(q, "quality")?.line ?? q.line, `reading quality '${code.slice(0, 30)}' is not a QualityOfReading code`, `known codes: ${Object.entries(QUALITY).map(([k, v]) => `${k} ${v}`).join(", ")}`);
              continue;
            }
            tally.flagged++;
            waits.push(store.add(`espi/reading-quality/${m.meterId}-${local.year}.csv`, QUALITY_HEADER, { epochS: start, cells: [m.meterId, timestamp, code, QUALITY[Number(code)]!], source }));
          }
          const merging = waits.filter((w): w is Promise<void> => w !== null);
          return merging.length > 0 ? Promise.all(merging).then(() => undefined) : null;
        },
      }).catch((error: unknown) => {
        if (!(error instanceof FeedSyntaxError)) throw error;
        err(error.line, error.message, "the file must be the XML the utility's Green Button download produced, unchanged");
      });
      reports.push({
        file,
        entries: plan.entries,
        meters: [...perMeter.values()].map((t) => ({
          meterId: t.m.meterId, commodity: t.m.commodity, unit: t.m.unit, isNew: newMeterIds.has(t.m.meterId),
          intervalReadings: t.n, intervalTotal: scaledToDecimal(t.sum, PLACES), added: 0, alreadyPresent: 0,
          longReadings: t.longN, longTotal: scaledToDecimal(t.longSum, PLACES),
          skippedReadings: t.skipN, skippedTotal: scaledToDecimal(t.skipSum, PLACES), qualityFlagged: t.flagged,
        })),
        bills: [],
      });
      if (skippedShown > MAX_SKIP_WARNINGS) fileIssue(file, 0, "warning", `${skippedShown - MAX_SKIP_WARNINGS} more reading(s) left out as above`);
      for (const t of perMeter.values()) {
        if (t.longN > 0) {
          fileIssue(file, 0, "warning", `meter ${t.m.meterId}: ${t.longN} reading(s) longer than an hour (such as daily or monthly totals; ${scaledToDecimal(t.longSum, PLACES)} ${t.m.unit}) were not written`,
            "ohmbook's interval data is 5 to 60 minutes; bills come from the usage summaries");
        }
      }
    }
    await store.flush();
    for (const c of store.conflicts) {
      if (errors++ < MAX_ERRORS) {
        fileIssue(c.row.source.file, c.row.source.line, "error", `meter ${c.row.cells[0]} at ${c.row.cells[1]}: ${c.path} already holds ${c.existing}, this file says ${c.row.cells[2]}`,
          "the utility has revised this reading: remove the old row (or the whole file) and import again");
      }
    }
    if (errors > MAX_ERRORS) fileIssue(options.files[0]!, 0, "error", `${errors - MAX_ERRORS} more error(s) not shown`, "fix the ones above first");
    if (issues.some((i) => i.severity === "error")) throw new InputError(issues);

    // Bills and bill lines: those not yet in bills.csv.
    const billRowById = new Map(bills.rows.map((r) => [r.cells.bill_id || `${r.cells.meter_id}:${r.cells.period_start}`, r]));
    const newBillRows: Record<string, string>[] = [];
    const newLineRows: Record<string, string>[] = [];
    for (const [i, { file, plan }] of plans.entries()) {
      for (const b of plan.bills) {
        const have = billRowById.get(b.billId);
        const added = !have && !newBillRows.some((r) => `${r.meter_id}:${r.period_start}` === b.billId);
        if (have && Number(have.cells.total) !== Number(b.total)) {
          fileIssue(file, b.line, "error", `bill ${b.billId} is already in bills.csv (line ${have.line}) with total ${have.cells.total}; this file says ${b.total}`,
            "a corrected bill: remove the old row (and its bill_lines) and import again");
          continue;
        }
        if (added) {
          newBillRows.push({ meter_id: b.meterId, period_start: b.periodStart, period_end: b.periodEnd, usage: b.usage, read_type: b.readType, total: b.total });
          for (const l of b.lines) newLineRows.push({ bill_id: b.billId, label: l.label, amount: l.amount });
        }
        reports[i]!.bills.push({ billId: b.billId, meterId: b.meterId, periodStart: b.periodStart, periodEnd: b.periodEnd, usage: b.usage, total: b.total, added });
      }
    }
    if (issues.some((i) => i.severity === "error")) throw new InputError(issues);

    for (const r of reports) {
      for (const m of r.meters) {
        m.added = store.added.get(m.meterId) ?? 0;
        m.alreadyPresent = store.alreadyPresent.get(m.meterId) ?? 0;
      }
    }

    // Commit: interval files, then the CSV files.
    const written = await store.commit();
    const writes: [CsvTable, Record<string, string>[], string][] = [
      [buildings, newBuildingRows, "buildings.csv"],
      [meters, newMeterRows, "meters.csv"],
      [bills, newBillRows, "bills.csv"],
      [billLines, newLineRows, "bill_lines.csv"],
    ];
    for (const [table, rows, name] of writes) {
      if (rows.length === 0) continue;
      const { text, dropped } = appendRows(table, rows);
      if (dropped.length > 0) fileIssue(table.path, 1, "warning", `${name} has no ${dropped.join(", ")} column; those values were not written`, `add the column(s) to the header to keep them`);
      await replaceFile(table.path, text);
      written.push(name);
    }
    return {
      files: reports,
      buildingCreated: newBuildingRows.length > 0,
      metersAdded: newMeterRows.length,
      billsAdded: newBillRows.length,
      billLinesAdded: newLineRows.length,
      intervalRowsAdded: [...store.added.values()].reduce((a, b) => a + b, 0),
      written,
      warnings: issues.filter((i) => i.severity === "warning"),
    };
  } finally {
    await rm(staging, { recursive: true, force: true });
  }
}

async function readTable(path: string, header: readonly string[]): Promise<CsvTable> {
  try {
    return await readCsvTable(path, header);
  } catch (error) {
    throw new InputError([{ file: path, line: 0, column: 0, severity: "error", message: `not readable as CSV: ${(error as Error).message}`, hint: "fix the file, then import again" }]);
  }
}

/** The commodity of the tariff file in `tariffsDir` whose `id` is `id`, or null when none has it. */
async function commodityOfTariff(tariffsDir: string, id: string): Promise<string | null> {
  if (!existsSync(tariffsDir)) return null;
  for (const name of await readdir(tariffsDir)) {
    if (!/\.ya?ml$/i.test(name)) continue;
    try {
      const doc = parseYaml(await readFile(join(tariffsDir, name), "utf8")) as { id?: unknown; commodity?: unknown } | null;
      if (doc?.id === id) return typeof doc.commodity === "string" ? doc.commodity : null;
    } catch {
      // a broken tariff file is reported by `ohmbook check`
    }
  }
  return null;
}

/** The portfolio's currency (portfolio.yaml `currency`, default USD). */
async function portfolioCurrency(path: string): Promise<string> {
  try {
    const doc = parseYaml(await readFile(path, "utf8")) as { currency?: unknown } | null;
    return typeof doc?.currency === "string" ? doc.currency : "USD";
  } catch {
    return "USD"; // `ohmbook check` reports a broken portfolio.yaml with its line
  }
}
