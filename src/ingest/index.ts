/**
 * Ingest: reads a whole portfolio folder into a validated {@link Portfolio}, with every
 * problem reported as an InputIssue (`file:line:column`) and a FileReport per file read.
 * This is the only stage that reads files.
 */
import { readdir, realpath } from "node:fs/promises";
import { join, resolve } from "node:path";
import { appendAll, capIssue, type InputIssue } from "../core/issues.ts";
import type { FileReport, IngestReport, Portfolio, PortfolioSettings } from "../domain/types.ts";
import { DUPLICATE_HINT, assembleIntervals } from "./assembleIntervals.ts";
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
import { checkInputFile, describeFsError, NOT_UTF8_HINT, NOT_UTF8_MESSAGE, notUtf8Line, openInputFile, readInputText } from "./inputFile.ts";

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

/**
 * Largest portfolio.yaml or tariff file read. Real ones are a few kilobytes; 1 MiB leaves room
 * for a tariff with thousands of charges while refusing a wrong file before YAML parsing,
 * whose memory use grows with the text (common practice).
 */
const MAX_YAML_BYTES = 1 << 20;

/**
 * Reads the portfolio folder `dir`. Issue paths and report paths are relative to the
 * portfolio folder, with "/" separators (e.g. `intervals/2024.csv`), so published files never
 * show the builder's own folders; the CLI prefixes the folder when printing. Row-level problems
 * reject the row and go on; only the problems listed on `LoadResult.fatal` make the portfolio
 * null. Only regular files inside the folder are read (symbolic links followed when they stay
 * inside). Never throws on bad input.
 * Example: `const { portfolio, issues, fatal } = await loadPortfolio("data/demo")`.
 */
export async function loadPortfolio(dir: string, options: LoadOptions = {}): Promise<LoadResult> {
  const root = resolve(dir);
  const label = (...parts: string[]): string => parts.join("/");
  const abs = (...parts: string[]): string => join(root, ...parts);
  const issues: InputIssue[] = [];
  const files: FileReport[] = [];
  let fatal = false;
  let rootReal: string;
  try {
    rootReal = await realpath(root);
  } catch (err) {
    issues.push({ file: ".", line: 0, column: 0, severity: "error", message: `cannot open the portfolio folder: ${describeFsError(err)}`, hint: "check the folder name and its permissions" });
    return { portfolio: null, issues, fatal: true, weatherGaps: [], report: { files } };
  }
  const open = (file: string): FileContext => {
    options.onFile?.(file);
    return new FileContext(file, rootReal);
  };
  const close = (ctx: FileContext): void => {
    ctx.finish();
    files.push(ctx.report);
    appendAll(issues, ctx.issues);
  };
  const exists = async (...parts: string[]): Promise<boolean> => {
    const c = await checkInputFile(rootReal, abs(...parts));
    return !(!c.ok && c.missing);
  };
  /**
   * Sorted names of the `.ext` entries directly in a folder (none when the folder is absent).
   * Entries that are not regular files inside the portfolio folder are reported and left out;
   * an unreadable folder is reported once, naming it.
   */
  const listFiles = async (sub: string, exts: readonly string[]): Promise<string[]> => {
    const rel = sub === "" ? [] : sub.split("/");
    let names: string[];
    try {
      names = (await readdir(abs(...rel))).filter((n) => exts.some((x) => n.toLowerCase().endsWith(x))).sort();
    } catch (err) {
      const code = (err as { code?: string }).code;
      if (code !== "ENOENT") {
        issues.push({ file: `${sub}/`, line: 0, column: 0, severity: "error", message: `cannot list the folder: ${describeFsError(err)}`,
          hint: code === "ENOTDIR" ? `${sub} must be a folder` : "check the folder's permissions" });
      }
      return [];
    }
    const kept: string[] = [];
    for (const n of names) {
      // normals/ is a folder inside weather/, read on its own.
      const c = await checkInputFile(rootReal, abs(...rel, n));
      if (c.ok) kept.push(n);
      else if (!c.missing) issues.push({ file: label(...rel, n), line: 0, column: 0, severity: "error", message: c.message, hint: c.hint });
    }
    return kept;
  };
  const fatalIssue = (file: string, message: string, hint: string): void => {
    fatal = true;
    issues.push({ file, line: 0, column: 0, severity: "error", message, hint });
  };

  // portfolio.yaml
  let settings: PortfolioSettings = { name: "", ...structuredClone(DEFAULT_SETTINGS) };
  let contactPositions: Record<string, { line: number; column: number }> = {};
  const yamlLabel = label("portfolio.yaml");
  const yamlText = await readInputText(rootReal, abs("portfolio.yaml"), MAX_YAML_BYTES);
  if (!yamlText.ok && !yamlText.missing) fatalIssue(yamlLabel, yamlText.message, yamlText.hint);
  else if (yamlText.ok) {
    const ctx = open(yamlLabel);
    const parsed = parsePortfolioYaml(yamlText.text.replace(/^\uFEFF/, ""), yamlLabel);
    appendAll(ctx.issues, parsed.issues);
    const bad = notUtf8Line(yamlText.text);
    if (bad > 0) ctx.warn(bad, 0, NOT_UTF8_MESSAGE, NOT_UTF8_HINT);
    ctx.report.rowsRead = 1;
    if (parsed.settings) {
      settings = parsed.settings;
      contactPositions = parsed.contactPositions ?? {};
      ctx.report.rowsUsed = 1;
    } else {
      ctx.report.rowsRejected = 1;
      ctx.report.rejections.push({ line: 0, reason: "settings unreadable or without name" });
    }
    if (parsed.fatal) fatal = true;
    close(ctx);
  } else fatalIssue(yamlLabel, "no portfolio.yaml in the portfolio folder", "create it with at least `name: Your Portfolio`");

  // buildings.csv
  const bCtx = open(label("buildings.csv"));
  const { buildings, table: bTable } = await readBuildings(abs("buildings.csv"), bCtx);
  if (bTable.notFound) fatalIssue(bCtx.file, "buildings.csv is missing", "every portfolio needs buildings.csv (one row per building)");
  else {
    if (bTable.missingColumns.length > 0) fatal = true;
    close(bCtx);
  }
  const buildingById = new Map(buildings.map((b) => [b.buildingId, b]));
  // A contact line is shown only on a tenant page: say so when it cannot be.
  for (const id of Object.keys(settings.contacts ?? {})) {
    const b = buildingById.get(id);
    if (b && b.tenantPage) continue;
    const pos = contactPositions[id] ?? { line: 0, column: 0 };
    issues.push({
      file: yamlLabel, ...pos, severity: "warning",
      message: b ? `contact for ${id} is not shown: the building has no tenant page` : `contacts names building ${JSON.stringify(id)}, which is not in buildings.csv`,
      hint: b ? "set tenant_page to yes for it in buildings.csv, or remove the contact" : "use a building_id from buildings.csv",
    });
  }

  // tariffs/*.yaml
  const tariffNames = await listFiles("tariffs", [".yaml", ".yml"]);
  const tLoad = await loadTariffFiles(tariffNames.map((n) => abs("tariffs", n)), tariffNames.map((n) => label("tariffs", n)), options.onFile,
    (path) => readInputText(rootReal, path, MAX_YAML_BYTES), settings.currency);
  appendAll(files, tLoad.reports);
  appendAll(issues, tLoad.issues);

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
  if (await exists("bill_lines.csv")) {
    const ctx = open(label("bill_lines.csv"));
    billLines = (await readBillLines(abs("bill_lines.csv"), ctx, new Set(bills.map((b) => b.billId)))).lines;
    close(ctx);
  }

  // weather/*.csv and weather/normals/*.csv
  const w = await loadWeatherFolder({ buildings, maxGapHours: settings.weatherMaxGapHours, listFiles: (parts, exts) => listFiles(parts.join("/"), exts), abs, label, open, close });
  const { weather, normals, gaps: weatherGaps } = w;
  appendAll(issues, w.issues);

  // intervals/*.csv
  const intervalNames = await listFiles("intervals", [".csv"]);
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
    const opened = await openInputFile(rootReal, abs("intervals", intervalNames[i]));
    if (!opened.ok) {
      // Checked while listing; this is a file replaced or removed since.
      const message = opened.missing ? "file disappeared while the portfolio was read" : opened.message;
      issues.push({ file: intervalLabels[i], line: 0, column: 0, severity: "error", message, hint: opened.missing ? "run again" : opened.hint });
      intervalReports.push({ file: intervalLabels[i], rowsRead: 0, rowsUsed: 0, rowsRejected: 0, rejections: [], warnings: [] });
      continue;
    }
    try {
      const res = await parseIntervalStream(opened.handle.createReadStream({ highWaterMark: 1 << 20, autoClose: false }), {
        fileLabel: intervalLabels[i], zoneOfMeter, sink: collector,
        unknownMeterReason: (id) => (rejectedMeters.has(id) ? `was rejected in ${rejectedMeters.get(id)}` : null),
      });
      intervalReports.push(res.report);
      appendAll(issues, res.issues);
    } catch (err) {
      issues.push({ file: intervalLabels[i], line: 0, column: 0, severity: "error", message: `cannot read the file: ${describeFsError(err)}`, hint: "check the file and the drive it is on" });
      intervalReports.push({ file: intervalLabels[i], rowsRead: 0, rowsUsed: 0, rowsRejected: 0, rejections: [], warnings: [] });
    } finally {
      await opened.handle.close().catch(() => undefined);
    }
  }
  const assembled = assembleIntervals(collector.meters, intervalLabels, settings.intervalTimestamp);
  // Duplicates are found across files; each is a rejected row of its file, listed and grouped
  // like every other rejection (the first few one by one, then a count).
  const dupContexts = new Map<number, FileContext>();
  for (const d of assembled.duplicates) {
    const r = intervalReports[d.fileIndex];
    r.rowsUsed--;
    r.rowsRejected++;
    let ctx = dupContexts.get(d.fileIndex);
    if (!ctx) dupContexts.set(d.fileIndex, (ctx = new FileContext(intervalLabels[d.fileIndex], rootReal)));
    ctx.reject(d.line, 0, d.reason, DUPLICATE_HINT);
  }
  for (const [fileIndex, ctx] of dupContexts) {
    ctx.finish();
    appendAll(intervalReports[fileIndex].rejections, ctx.report.rejections);
    appendAll(issues, ctx.issues);
  }
  appendAll(files, intervalReports);
  // The duplicate errors were listed above, grouped; keep assembly's warnings.
  appendAll(issues, assembled.issues.filter((x) => x.severity !== "error"));

  const portfolio: Portfolio<Tariff> | null = fatal
    ? null
    : {
        root, settings, buildings, meters, bills, billLines,
        intervals: assembled.series, weather, normals, tariffs: tLoad.tariffs,
        report: { files },
      };
  return { portfolio, issues: issues.map(capIssue), fatal, weatherGaps, report: { files } };
}

// Used by other folders (see test/architecture/layers.test.ts).
export { describeFsError } from "./inputFile.ts";
export { MAX_BILL_USAGE } from "./limits.ts";
export { readMeterIntervalFile, type MeterIntervalFile } from "./meterIntervalFile.ts";
