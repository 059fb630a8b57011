/**
 * Progress and message output for the CLI: the terminal implementation of the pipeline's
 * Reporter interface (src/pipeline/reporter.ts).
 */
import type { Reporter } from "../pipeline/index.ts";

export type { Reporter };
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
