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
