/**
 * How the pipeline reports progress and messages without touching stdout: the CLI implements
 * this interface (src/cli/progress.ts); tests pass a silent or recording reporter.
 */
export interface Reporter {
  /** A stage begins (e.g. "Reading data/demo"). */
  stage(message: string): void;
  /** One unit of a counted task is done (e.g. building 3 of 8). */
  step(done: number, total: number, label: string): void;
  /** A line that must reach the user even with --quiet (errors, final summary go elsewhere). */
  warn(message: string): void;
  /** End of a counted task; clears any progress line. */
  finish(): void;
}

export const silentReporter: Reporter = {
  stage() {},
  step() {},
  warn() {},
  finish() {},
};
