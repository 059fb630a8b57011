/**
 * Structured problems found in input files. Every stage that reads user input returns
 * these instead of throwing; the CLI formats them once, as `file:line:column: message`.
 */

export type IssueSeverity = "error" | "warning";

export interface InputIssue {
  /** Path relative to the portfolio folder, "/"-separated (never the builder's own folders). */
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
  return formatIssueIn(issue, undefined);
}

/**
 * Like {@link formatIssue}, for the terminal: issue paths are relative to the portfolio folder,
 * and `folder` (as the user typed it) is put in front so the path opens from where they are.
 * @example formatIssueIn({ file: "bills.csv", line: 3, column: 2, … }, "data/demo") → "data/demo/bills.csv:3:2: error: …"
 */
export function formatIssueIn(issue: InputIssue, folder: string | undefined): string {
  const file = folder === undefined || folder === "" || folder === "." ? issue.file : `${folder.replace(/[\\/]+$/, "")}/${issue.file}`;
  const where = `${file}:${issue.line}:${issue.column}`;
  const hint = issue.hint ? ` (hint: ${issue.hint})` : "";
  return `${where}: ${issue.severity}: ${issue.message}${hint}`;
}

/**
 * Longest piece of user text quoted inside a message. A cell can hold megabytes (a pasted
 * blob, a file without line breaks); echoing it whole would flood the terminal and the
 * published data page. 200 characters shows enough to find the cell (common practice).
 */
const MAX_QUOTED_CHARS = 200;

/** Longest message or hint kept; longer ones are cut with "…" (a safety net over quoteValue). */
export const MAX_MESSAGE_CHARS = 600;

/**
 * Cuts `text` to at most `max` characters (UTF-16 units, never splitting a surrogate pair),
 * marking the cut with "…" and the full length.
 * @example shorten("a".repeat(500), 10) === "aaaaaaaaaa… (500 characters)"
 */
export function shorten(text: string, max: number = MAX_QUOTED_CHARS): string {
  if (text.length <= max) return text;
  let end = max;
  const c = text.charCodeAt(end - 1);
  if (c >= 0xd800 && c <= 0xdbff) end--;
  return `${text.slice(0, end)}… (${text.length.toLocaleString("en-US")} characters)`;
}

/** A user value quoted for a message: JSON-quoted (control characters visible) and shortened. */
export function quoteValue(value: string): string {
  return JSON.stringify(shorten(value));
}

/** The same issue with message and hint capped at {@link MAX_MESSAGE_CHARS}. */
export function capIssue(issue: InputIssue): InputIssue {
  if (issue.message.length <= MAX_MESSAGE_CHARS && (issue.hint === undefined || issue.hint.length <= MAX_MESSAGE_CHARS)) return issue;
  return {
    ...issue,
    message: shorten(issue.message, MAX_MESSAGE_CHARS),
    hint: issue.hint === undefined ? undefined : shorten(issue.hint, MAX_MESSAGE_CHARS),
  };
}

/**
 * Appends `items` to `target` one by one. `target.push(...items)` passes every item as a call
 * argument, and V8 throws "Maximum call stack size exceeded" above roughly 125,000 of them.
 */
export function appendAll<T>(target: T[], items: Iterable<T>): void {
  for (const item of items) target.push(item);
}
