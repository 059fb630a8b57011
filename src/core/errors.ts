import type { InputIssue } from "./issues.ts";

/** Base of every error ohmbook raises on purpose; only the CLI turns these into exit codes. */
export class OhmbookError extends Error {
  constructor(message: string, options?: { cause?: unknown }) {
    super(message, options);
    this.name = new.target.name;
  }
}

/** The input folder has errors; `issues` says where. Nothing was written. */
export class InputError extends OhmbookError {
  /** The portfolio folder as typed, put in front of issue paths when printed (set by the CLI). */
  folder?: string;
  constructor(readonly issues: InputIssue[]) {
    super(`${issues.filter((i) => i.severity === "error").length} input error(s)`);
  }
}

/** Wrong command-line usage. */
export class UsageError extends OhmbookError {}

/**
 * The message of a problem ohmbook raises on purpose (an {@link OhmbookError}: bad input, a
 * model that cannot be fitted, a tariff that cannot price a bill), for the page or the report.
 * Anything else — a TypeError, a RangeError from a broken invariant — is a bug and is rethrown,
 * so it can never pass as "building X could not be analysed" while the tests stay green.
 */
export function expectedProblem(error: unknown): string {
  if (error instanceof OhmbookError) return error.message;
  throw error;
}

/** What a build does with a bug at a per-building boundary: `fail` (tests, --strict) or `report` and go on. */
export type BugPolicy = "fail" | "report";

/** One line describing a bug for the terminal, with the first frame of its stack. */
export function bugReportLine(where: string, error: unknown): string {
  const e = error instanceof Error ? error : new Error(String(error));
  const frame = (e.stack ?? "").split("\n").find((l) => l.trim().startsWith("at "))?.trim() ?? "";
  return `internal error while ${where}: ${e.name}: ${e.message}${frame ? ` (${frame})` : ""} — this is a bug in ohmbook; please report it with this line`;
}

/** A date, month or time zone that cannot be used (an unknown IANA zone, a malformed date). */
export class TimeInputError extends OhmbookError {}

/**
 * Raised by the pure modelling and cleaning primitives when their numeric input cannot give a
 * meaningful answer (too few points, mismatched lengths, singular design). Callers catch it and
 * report it for the meter.
 */
export class ModelInputError extends OhmbookError {}
