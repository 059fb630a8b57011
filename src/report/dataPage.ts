/** View model of the data page: downloadable files and everything ingest reported. */
import type { InputIssue } from "../core/issues.ts";
import type { IngestReport } from "../domain/types.ts";
import type { DataFileRow, DataPage, TableModel } from "./siteModel.ts";
import { formatNumber } from "./format.ts";
import { navFor } from "./nav.ts";

/** What each file the build writes under data/ holds (outputs.md). */
export const DATA_FILE_DESCRIPTIONS: Readonly<Record<string, string>> = {
  "portfolio.json": "One object per building: floor area, use in the last 12 months, normalized use, intensity, model fit, cost forecast and findings by severity.",
  "findings.csv": "Every audit finding, one row each, with the money at stake (spreadsheet form).",
  "findings.json": "The same findings as a JSON array.",
  "disputes.csv": "Bills to dispute: one row per claim or back-billing risk, with billed, corrected and claim amounts (spreadsheet form).",
  "disputes.json": "The same disputes as a JSON array, with each bill's evidence: printed and corrected lines, usage and demand, tariff versions.",
  "forecast.csv": "Forecast use and cost by meter and calendar month, with a low, likely and high cost.",
  "bills-recomputed.csv": "Every bill with its billed total, the recomputed total and the difference.",
  "ingest-report.json": "Per input file: rows read, used and rejected, with the reason for each rejection.",
  "data-quality.csv": "Every problem detected in meter or weather data and what was done about it.",
  "alignment.json": "Per interval meter: the clock offset suggested and applied, with the evidence.",
  "models.json": "Every weather model tried per meter, its fit statistics, and which was chosen.",
};

/** Human size of a byte count: "512 B", "12.3 kB", "4.1 MB" (decimal units). */
export function formatBytes(bytes: number): string {
  if (bytes < 1000) return `${formatNumber(bytes)} B`;
  if (bytes < 1_000_000) return `${formatNumber(bytes / 1000, 1)} kB`;
  return `${formatNumber(bytes / 1_000_000, 1)} MB`;
}

/** Folder under data/ whose files belong to one building and are listed on its page. */
export function buildingDataFolder(buildingId: string): string {
  return `buildings/${buildingId}/`;
}

/**
 * What one data file holds. A building's own file (`buildings/<id>/forecast.csv`) is described
 * by its base name as that building's part of the portfolio-wide file.
 * @example describeDataFile("buildings/B1/forecast.csv") // "This building's rows of forecast.csv: forecast use and cost …"
 */
export function describeDataFile(name: string): string {
  const slash = name.lastIndexOf("/");
  if (slash === -1) return DATA_FILE_DESCRIPTIONS[name] ?? "Data file written by this build.";
  const base = name.slice(slash + 1);
  const what = DATA_FILE_DESCRIPTIONS[base];
  const part = base.endsWith(".json") ? "entries" : "rows";
  if (!what) return `This building's ${part} of ${base}.`;
  return `This building's ${part} of ${base}: ${what.charAt(0).toLowerCase()}${what.slice(1)}`;
}

/**
 * Rows of the downloads table for files with known byte sizes, in a stable order
 * (known files in outputs.md order, then others alphabetically).
 * @example describeDataFiles({ "findings.csv": 2048 }, "")[0].href // "data/findings.csv"
 */
export function describeDataFiles(sizes: Record<string, number>, root: string): DataFileRow[] {
  const known = Object.keys(DATA_FILE_DESCRIPTIONS);
  const names = Object.keys(sizes).sort((a, b) => {
    const ia = known.indexOf(a);
    const ib = known.indexOf(b);
    if (ia !== -1 || ib !== -1) return (ia === -1 ? 1e9 : ia) - (ib === -1 ? 1e9 : ib);
    return a < b ? -1 : 1;
  });
  return names.map((name) => ({
    name,
    href: `${root}data/${name.split("/").map(encodeURIComponent).join("/")}`,
    description: describeDataFile(name),
    size: formatBytes(sizes[name]),
  }));
}

function ingestTable(report: IngestReport): TableModel {
  return {
    caption: "Rows read, used and rejected per input file",
    sortable: true,
    columns: [
      { label: "File", numeric: false },
      { label: "Rows read", numeric: true },
      { label: "Used", numeric: true },
      { label: "Rejected", numeric: true },
      { label: "Warnings", numeric: true },
    ],
    rows: report.files.map((f) => [
      { text: f.file },
      { text: formatNumber(f.rowsRead), sort: String(f.rowsRead) },
      { text: formatNumber(f.rowsUsed), sort: String(f.rowsUsed) },
      { text: formatNumber(f.rowsRejected), sort: String(f.rowsRejected), tone: f.rowsRejected > 0 ? ("warn" as const) : undefined },
      { text: formatNumber(f.warnings.length), sort: String(f.warnings.length) },
    ]),
  };
}

function issuesTable(issues: InputIssue[]): TableModel {
  return {
    caption: "Problems found in the input files (file:line:column)",
    sortable: true,
    columns: [
      { label: "Where", numeric: false },
      { label: "Severity", numeric: false },
      { label: "Problem", numeric: false },
      { label: "Hint", numeric: false },
    ],
    rows: issues.map((i) => [
      { text: `${i.file}:${i.line}:${i.column}` },
      { text: i.severity, tone: i.severity === "error" ? ("warn" as const) : undefined },
      { text: i.message },
      { text: i.hint ?? "" },
    ]),
  };
}

/**
 * Builds the data page; `files` starts empty and is filled by the site writer, which knows
 * the files and their sizes (see `describeDataFiles`).
 */
export function buildDataPage(report: IngestReport, issues: InputIssue[]): Omit<DataPage, "canonical"> {
  const errors = issues.filter((i) => i.severity === "error").length;
  const warnings = issues.length - errors;
  return {
    title: "Data and downloads",
    root: "",
    path: "data.html",
    nav: navFor("data", ""),
    files: [],
    ingestTable: ingestTable(report),
    issuesTable: issuesTable(issues),
    issueSummary:
      issues.length === 0
        ? "No problems were found in the input files."
        : `${formatNumber(errors)} ${errors === 1 ? "error" : "errors"} and ${formatNumber(warnings)} ${warnings === 1 ? "warning" : "warnings"} were found in the input files.`,
  };
}
