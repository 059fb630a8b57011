/**
 * Per-file bookkeeping shared by every reader: the FileReport (rows read/used/rejected with
 * reasons) and the issues, kept consistent so every row is accounted for.
 *
 * Repeated problems are grouped: the first {@link DETAILS_PER_REASON} issues of one kind (same
 * severity and same message once the quoted values and numbers are blanked out) are listed
 * one by one, at most {@link DETAILS_PER_FILE} per file; the rest become one line such as
 * "1,203 more rows with the same problem". Every rejected row is still counted in
 * `rowsRejected`.
 */
import { capIssue, quoteValue, type InputIssue } from "../core/issues.ts";
import type { FileReport } from "../domain/types.ts";

/**
 * Issues of one kind listed one by one per file. Twenty examples are enough to see a pattern
 * and fix it; 120,000 identical lines only hide the other problems (common practice).
 */
export const DETAILS_PER_REASON = 20;

/** Issues listed one by one per file, all kinds together (the terminal stays readable). */
export const DETAILS_PER_FILE = 200;

/** Distinct kinds of problem tracked per file before further kinds are pooled. */
const MAX_GROUPS = 500;

/** The kind of a message: quoted values and numbers blanked, so "meter_id "A"…" and "meter_id "B"…" group. */
export function reasonKey(message: string): string {
  return message.replace(/"(?:[^"\\]|\\.)*"/g, "\"…\"").replace(/'[^']*'/g, "'…'").replace(/[+-]?\d[\d.,:eE+-]*/g, "#");
}

interface Group {
  severity: "error" | "warning";
  count: number;
  suppressed: number;
  firstSuppressedLine: number;
  firstSuppressedColumn: number;
  /** The first message of the group; once details stop, the first message not listed. */
  sample: string;
  hint?: string;
  rejection: boolean;
}

export class FileContext {
  readonly report: FileReport;
  readonly issues: InputIssue[] = [];
  private readonly groups = new Map<string, Group>();
  private detailed = 0;
  private finished = false;

  /**
   * @param file label used in issues and the report: the path relative to the portfolio folder
   * @param rootReal real path of the portfolio folder (symbolic links inside it are followed,
   *   outside refused); null lets a reader used alone take the file's own folder
   */
  constructor(
    readonly file: string,
    readonly rootReal: string | null = null,
  ) {
    this.report = { file, rowsRead: 0, rowsUsed: 0, rowsRejected: 0, rejections: [], warnings: [] };
  }

  /** Counts a row as rejected and records why (an `error` issue at file:line:column). */
  reject(line: number, column: number, message: string, hint?: string): void {
    this.report.rowsRejected++;
    this.record("error", line, column, message, hint, true);
  }

  /** An error that does not by itself count a row (file-level, or a second problem in a row). */
  error(line: number, column: number, message: string, hint?: string): void {
    this.record("error", line, column, message, hint, false);
  }

  warn(line: number, column: number, message: string, hint?: string): void {
    this.record("warning", line, column, message, hint, false);
  }

  use(): void {
    this.report.rowsUsed++;
  }

  /** Quotes a cell value for a message (shortened; see quoteValue). */
  quote(value: string): string {
    return quoteValue(value);
  }

  /**
   * Adds one summary issue per group that had more than its share of details. Called once
   * when the file is done; later calls do nothing.
   */
  finish(): void {
    if (this.finished) return;
    this.finished = true;
    for (const g of this.groups.values()) {
      if (g.suppressed === 0) continue;
      const what = g.rejection ? (g.suppressed === 1 ? "row" : "rows") : g.suppressed === 1 ? "line" : "lines";
      const message = `${g.suppressed.toLocaleString("en-US")} more ${what} with the same problem from line ${g.firstSuppressedLine} on, the first: ${g.sample}`;
      this.issues.push(capIssue({ file: this.file, line: g.firstSuppressedLine, column: g.firstSuppressedColumn, severity: g.severity, message, hint: g.hint }));
      if (g.rejection) this.report.rejections.push({ line: g.firstSuppressedLine, reason: capIssue({ file: "", line: 0, column: 0, severity: "error", message }).message });
      else if (g.severity === "warning") this.report.warnings.push(`line ${g.firstSuppressedLine}: ${message}`);
    }
  }

  private record(severity: "error" | "warning", line: number, column: number, rawMessage: string, rawHint: string | undefined, rejection: boolean): void {
    const issue = capIssue({ file: this.file, line, column, severity, message: rawMessage, hint: rawHint });
    let key = `${severity}|${rejection ? "r" : "-"}|${reasonKey(issue.message)}`;
    // Messages that never repeat must not grow the table without bound: past MAX_GROUPS kinds,
    // the rest share one group.
    if (!this.groups.has(key) && this.groups.size >= MAX_GROUPS) key = `${severity}|${rejection ? "r" : "-"}|other`;
    let g = this.groups.get(key);
    if (!g) {
      g = { severity, count: 0, suppressed: 0, firstSuppressedLine: 0, firstSuppressedColumn: 0, sample: issue.message, hint: issue.hint, rejection };
      this.groups.set(key, g);
    }
    g.count++;
    if (g.count <= DETAILS_PER_REASON && this.detailed < DETAILS_PER_FILE) {
      this.detailed++;
      this.issues.push(issue);
      if (rejection) this.report.rejections.push({ line, reason: issue.message });
      else if (severity === "warning") this.report.warnings.push(line > 0 ? `line ${line}: ${issue.message}` : issue.message);
      return;
    }
    if (g.suppressed === 0) {
      g.firstSuppressedLine = line;
      g.firstSuppressedColumn = column;
      g.sample = issue.message;
    }
    g.suppressed++;
  }
}
