/**
 * Ingest: reads a whole portfolio folder into a validated {@link Portfolio}, with every
 * problem reported as an InputIssue (`file:line:column`) and a FileReport per file read.
 * This is the only stage that reads files.
 */
import { createReadStream } from "node:fs";
import { readFile, readdir, stat } from "node:fs/promises";
import { join, resolve } from "node:path";
import type { InputIssue } from "../core/issues.ts";
import type { FileReport, IngestReport, Portfolio, PortfolioSettings } from "../domain/types.ts";
import { assembleIntervals } from "./assembleIntervals.ts";
import { FileContext } from "./fileContext.ts";
import { IntervalCollector } from "./intervalCollector.ts";
import { parseIntervalStream } from "./intervalStream.ts";
import { DEFAULT_SETTINGS, parsePortfolioYaml } from "./portfolioYaml.ts";
import { readBillLines, readBills } from "./readBills.ts";
import { readBuildings } from "./readBuildings.ts";
import { readMeters } from "./readMeters.ts";
import { loadTariffFiles, type Tariff } from "./tariffs.ts";
import type { WeatherGap } from "./weatherGrid.ts";
import { loadWeatherFolder } from "./loadWeather.ts";

export type { WeatherGap } from "./weatherGrid.ts";
export type { Tariff } from "./tariffs.ts";
export { parseIntervalStream, type IntervalSink, type IntervalParseOptions } from "./intervalStream.ts";
export { monthlyTotals, MonthlyTotalsSink, type MonthTotal } from "./monthlyTotals.ts";
export { interpolateGaps } from "./interpolateGaps.ts";
export { FILL_MEASURED, FILL_INTERPOLATED, FILL_FROM_DAILY, hourFromDailyMaxMin } from "./weatherGrid.ts";

export interface LoadResult {
  /** Null when a fatal problem stops the build (see `fatal`). */
  portfolio: Portfolio<Tariff> | null;
  /** Every problem found, in file order. */
  issues: InputIssue[];
  /** portfolio.yaml missing/unreadable/unnamed, or buildings/meters/bills missing or lacking a required column. */
  fatal: boolean;
  /** Every weather gap, filled or not. */
  weatherGaps: WeatherGap[];
  /** One FileReport per file read; also present when the portfolio is null (fatal). */
  report: IngestReport;
}

export interface LoadOptions {
  /** Called with each file's label just before it is read (progress display). */
  onFile?: (file: string) => void;
}

async function exists(path: string): Promise<boolean> {
  try {
    await stat(path);
    return true;
  } catch {
    return false;
  }
}

/** Sorted `.ext` files directly in `dir` (none when the folder is absent). */
async function listFiles(dir: string, exts: readonly string[]): Promise<string[]> {
  try {
    const entries = await readdir(dir, { withFileTypes: true });
    return entries
      .filter((e) => e.isFile() && exts.some((x) => e.name.toLowerCase().endsWith(x)))
      .map((e) => e.name)
      .sort();
  } catch {
    return [];
  }
}

/**
 * Reads the portfolio folder `dir`. Issue paths are `dir` joined with the file name as the
 * user typed it (e.g. `data/demo/bills.csv`). Row-level problems reject the row and go on;
 * only the problems listed on `LoadResult.fatal` make the portfolio null. Never throws on bad
 * input. Example: `const { portfolio, issues, fatal } = await loadPortfolio("data/demo")`.
 */
export async function loadPortfolio(dir: string, options: LoadOptions = {}): Promise<LoadResult> {
  const root = resolve(dir);
  const label = (...parts: string[]): string => join(dir, ...parts);
  const abs = (...parts: string[]): string => join(root, ...parts);
  const issues: InputIssue[] = [];
  const files: FileReport[] = [];
  let fatal = false;
  const open = (file: string): FileContext => {
    options.onFile?.(file);
    return new FileContext(file);
  };
  const close = (ctx: FileContext): void => {
    files.push(ctx.report);
    issues.push(...ctx.issues);
  };
  const fatalIssue = (file: string, message: string, hint: string): void => {
    fatal = true;
    issues.push({ file, line: 0, column: 0, severity: "error", message, hint });
  };

  // portfolio.yaml
  let settings: PortfolioSettings = { name: "", ...structuredClone(DEFAULT_SETTINGS) };
  const yamlLabel = label("portfolio.yaml");
  if (await exists(abs("portfolio.yaml"))) {
    const ctx = open(yamlLabel);
    const parsed = parsePortfolioYaml((await readFile(abs("portfolio.yaml"), "utf8")).replace(/^\uFEFF/, ""), yamlLabel);
    ctx.issues.push(...parsed.issues);
    ctx.report.rowsRead = 1;
    if (parsed.settings) {
      settings = parsed.settings;
      ctx.report.rowsUsed = 1;
    } else {
      ctx.report.rowsRejected = 1;
      ctx.report.rejections.push({ line: 0, reason: "settings unreadable or without name" });
    }
    if (parsed.fatal) fatal = true;
    close(ctx);
  } else fatalIssue(yamlLabel, `no portfolio.yaml in ${dir}`, "create it with at least `name: Your Portfolio`");

  // buildings.csv
  const bCtx = open(label("buildings.csv"));
  const { buildings, table: bTable } = await readBuildings(abs("buildings.csv"), bCtx);
  if (bTable.notFound) fatalIssue(bCtx.file, "buildings.csv is missing", "every portfolio needs buildings.csv (one row per building)");
  else {
    if (bTable.missingColumns.length > 0) fatal = true;
    close(bCtx);
  }
  const buildingById = new Map(buildings.map((b) => [b.buildingId, b]));

  // tariffs/*.yaml
  const tariffNames = await listFiles(abs("tariffs"), [".yaml", ".yml"]);
  const tLoad = await loadTariffFiles(tariffNames.map((n) => abs("tariffs", n)), tariffNames.map((n) => label("tariffs", n)), options.onFile);
  files.push(...tLoad.reports);
  issues.push(...tLoad.issues);

  // meters.csv
  const mCtx = open(label("meters.csv"));
  const { meters, rejectedIds: rejectedMeters, table: mTable } = await readMeters(abs("meters.csv"), mCtx, {
    buildingIds: new Set(buildingById.keys()),
    tariffIds: new Set(tLoad.tariffs.keys()),
    failedTariffs: tLoad.failedIds,
  });
  if (mTable.notFound) fatalIssue(mCtx.file, "meters.csv is missing", "every portfolio needs meters.csv (one row per meter)");
  else {
    if (mTable.missingColumns.length > 0) fatal = true;
    for (const m of meters) {
      const t = tLoad.tariffs.get(m.tariffId);
      if (t && t.commodity !== m.commodity) {
        mCtx.warn(m.source.line, 0, `meter ${m.meterId} is ${m.commodity} but tariff ${t.id} is for ${t.commodity}`, "check the tariff column");
      }
    }
    close(mCtx);
  }
  const meterById = new Map(meters.map((m) => [m.meterId, m]));

  // bills.csv
  const billCtx = open(label("bills.csv"));
  const { bills, table: billTable } = await readBills(abs("bills.csv"), billCtx, new Set(meterById.keys()), rejectedMeters);
  if (billTable.notFound) fatalIssue(billCtx.file, "bills.csv is missing", "every portfolio needs bills.csv (one row per bill)");
  else {
    if (billTable.missingColumns.length > 0) fatal = true;
    close(billCtx);
  }

  // bill_lines.csv (optional)
  let billLines: Portfolio["billLines"] = [];
  if (await exists(abs("bill_lines.csv"))) {
    const ctx = open(label("bill_lines.csv"));
    billLines = (await readBillLines(abs("bill_lines.csv"), ctx, new Set(bills.map((b) => b.billId)))).lines;
    close(ctx);
  }

  // weather/*.csv and weather/normals/*.csv
  const w = await loadWeatherFolder({ buildings, maxGapHours: settings.weatherMaxGapHours, listFiles, abs, label, open, close });
  const { weather, normals, gaps: weatherGaps } = w;
  issues.push(...w.issues);

  // intervals/*.csv
  const intervalNames = await listFiles(abs("intervals"), [".csv"]);
  const intervalLabels = intervalNames.map((n) => label("intervals", n));
  const collector = new IntervalCollector();
  const zoneOfMeter = (meterId: string): string | null => {
    const m = meterById.get(meterId);
    return m ? (buildingById.get(m.buildingId)?.timezone ?? null) : null;
  };
  const intervalReports: FileReport[] = [];
  for (let i = 0; i < intervalNames.length; i++) {
    options.onFile?.(intervalLabels[i]);
    collector.fileIndex = i;
    const res = await parseIntervalStream(createReadStream(abs("intervals", intervalNames[i]), { highWaterMark: 1 << 20 }), {
      fileLabel: intervalLabels[i], zoneOfMeter, sink: collector,
      unknownMeterReason: (id) => (rejectedMeters.has(id) ? `was rejected in ${rejectedMeters.get(id)}` : null),
    });
    intervalReports.push(res.report);
    issues.push(...res.issues);
  }
  const assembled = assembleIntervals(collector.meters, intervalLabels, settings.intervalTimestamp);
  for (const d of assembled.duplicates) {
    const r = intervalReports[d.fileIndex];
    r.rowsUsed--;
    r.rowsRejected++;
    r.rejections.push({ line: d.line, reason: d.reason });
  }
  files.push(...intervalReports);
  issues.push(...assembled.issues);

  const portfolio: Portfolio<Tariff> | null = fatal
    ? null
    : {
        root, settings, buildings, meters, bills, billLines,
        intervals: assembled.series, weather, normals, tariffs: tLoad.tariffs,
        report: { files },
      };
  return { portfolio, issues, fatal, weatherGaps, report: { files } };
}
