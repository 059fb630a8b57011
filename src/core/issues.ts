/**
 * Structured problems found in input files. Every stage that reads user input returns
 * these instead of throwing; the CLI formats them once, as `file:line:column: message`.
 */

export type IssueSeverity = "error" | "warning";

export interface InputIssue {
  /** Path as the user gave it (relative to the portfolio folder where possible). */
  file: string;
  /** 1-based line; 0 when the problem concerns the whole file. */
  line: number;
  /** 1-based column; 0 when unknown or the whole line. */
  column: number;
  severity: IssueSeverity;
  /** What is wrong, in plain words. */
  message: string;
  /** How to fix it. */
  hint?: string;
}

/** Formats one issue the way compilers do, so editors can jump to it. */
export function formatIssue(issue: InputIssue): string {
  const where = `${issue.file}:${issue.line}:${issue.column}`;
  const hint = issue.hint ? ` (hint: ${issue.hint})` : "";
  return `${where}: ${issue.severity}: ${issue.message}${hint}`;
}

/** Small collector so readers can append issues without threading arrays around. */
export class IssueList {
  readonly items: InputIssue[] = [];

  error(file: string, line: number, column: number, message: string, hint?: string): void {
    this.items.push({ file, line, column, severity: "error", message, hint });
  }

  warning(file: string, line: number, column: number, message: string, hint?: string): void {
    this.items.push({ file, line, column, severity: "warning", message, hint });
  }

  add(...issues: InputIssue[]): void {
    this.items.push(...issues);
  }

  get errorCount(): number {
    return this.items.filter((i) => i.severity === "error").length;
  }
}
