/**
 * Per-file bookkeeping shared by every reader: the FileReport (rows read/used/rejected with
 * reasons) and the issues, kept consistent so every row is accounted for.
 */
import type { InputIssue } from "../core/issues.ts";
import type { FileReport } from "../domain/types.ts";

export class FileContext {
  readonly report: FileReport;
  readonly issues: InputIssue[] = [];

  constructor(readonly file: string) {
    this.report = { file, rowsRead: 0, rowsUsed: 0, rowsRejected: 0, rejections: [], warnings: [] };
  }

  /** Counts a row as rejected and records why (an `error` issue at file:line:column). */
  reject(line: number, column: number, message: string, hint?: string): void {
    this.report.rowsRejected++;
    this.report.rejections.push({ line, reason: message });
    this.issues.push({ file: this.file, line, column, severity: "error", message, hint });
  }

  /** An error that does not by itself count a row (file-level, or a second problem in a row). */
  error(line: number, column: number, message: string, hint?: string): void {
    this.issues.push({ file: this.file, line, column, severity: "error", message, hint });
  }

  warn(line: number, column: number, message: string, hint?: string): void {
    this.report.warnings.push(line > 0 ? `line ${line}: ${message}` : message);
    this.issues.push({ file: this.file, line, column, severity: "warning", message, hint });
  }

  use(): void {
    this.report.rowsUsed++;
  }
}
