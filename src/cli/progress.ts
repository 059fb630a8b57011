/**
 * Progress and message output for the CLI. The pipeline reports through this interface
 * so it never touches stdout itself; tests pass a silent or recording reporter.
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

/** Progress on a TTY as one redrawn line; plain lines per stage otherwise; nothing with quiet. */
export function consoleReporter(options: { quiet: boolean; tty: boolean; write: (s: string) => void }): Reporter {
  const { quiet, tty, write } = options;
  let lineOpen = false;
  const closeLine = () => {
    if (lineOpen) {
      write("\n");
      lineOpen = false;
    }
  };
  return {
    stage(message) {
      if (quiet) return;
      closeLine();
      write(`${message}\n`);
    },
    step(done, total, label) {
      if (quiet || !tty) return;
      const width = 24;
      const filled = total === 0 ? width : Math.round((done / total) * width);
      const bar = "#".repeat(filled) + "-".repeat(width - filled);
      write(`\r  [${bar}] ${done}/${total} ${label}`.padEnd(78).slice(0, 78));
      lineOpen = true;
    },
    warn(message) {
      closeLine();
      write(`${message}\n`);
    },
    finish() {
      closeLine();
    },
  };
}
