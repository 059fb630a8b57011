/**
 * Progress and message output for the CLI: the terminal implementation of the pipeline's
 * Reporter interface (src/pipeline/reporter.ts).
 */
import type { Reporter } from "../pipeline/index.ts";

export type { Reporter };

/** A duration for people: `45s`, `3m 05s`, `1h 02m`. */
export function formatDuration(seconds: number): string {
  const s = Math.max(0, Math.round(seconds));
  if (s < 60) return `${s}s`;
  if (s < 3600) return `${Math.floor(s / 60)}m ${String(s % 60).padStart(2, "0")}s`;
  return `${Math.floor(s / 3600)}h ${String(Math.floor((s % 3600) / 60)).padStart(2, "0")}m`;
}

/** Units per second as read at a glance: `2.4/s` or, below one a second, `36/min`. */
export function formatRate(perSecond: number): string {
  if (perSecond >= 1) return `${perSecond.toFixed(perSecond >= 10 ? 0 : 1)}/s`;
  const perMinute = perSecond * 60;
  return `${perMinute.toFixed(perMinute >= 10 ? 0 : 1)}/min`;
}

/** Redraws of the progress line are at least this far apart (the last one always shows). */
const REDRAW_MS = 200;

/**
 * Progress on a TTY as one redrawn line — done/total, the rate so far and the time left at that
 * rate — plain lines per stage otherwise; nothing with quiet. `now` (ms) is for tests.
 */
export function consoleReporter(options: { quiet: boolean; tty: boolean; write: (s: string) => void; now?: () => number; width?: number }): Reporter {
  const { quiet, tty, write } = options;
  const now = options.now ?? (() => performance.now());
  const width = Math.max(40, options.width ?? 78);
  let lineOpen = false;
  // The counted task in progress: when its first step was reported, and the last redraw.
  let task: { total: number; startMs: number; startDone: number; drawnMs: number } | null = null;
  const closeLine = () => {
    if (lineOpen) {
      write("\n");
      lineOpen = false;
    }
  };
  return {
    stage(message) {
      task = null;
      if (quiet) return;
      closeLine();
      write(`${message}\n`);
    },
    step(done, total, label) {
      if (quiet || !tty) return;
      const t = now();
      if (task === null || task.total !== total || done < task.startDone) task = { total, startMs: t, startDone: done, drawnMs: -Infinity };
      if (done < total && t - task.drawnMs < REDRAW_MS) return;
      task.drawnMs = t;
      const bar = 20;
      const filled = total === 0 ? bar : Math.round((done / total) * bar);
      let text = `  [${"#".repeat(filled)}${"-".repeat(bar - filled)}] ${done}/${total}`;
      const elapsedS = (t - task.startMs) / 1000;
      const counted = done - task.startDone;
      if (counted > 0 && elapsedS > 0) {
        const rate = counted / elapsedS;
        text += ` · ${formatRate(rate)}`;
        text += done < total ? ` · ${formatDuration((total - done) / rate)} left` : ` · ${formatDuration(elapsedS)}`;
      }
      if (label) text += ` · ${label}`;
      write(`\r${text.slice(0, width).padEnd(width)}`);
      lineOpen = true;
    },
    warn(message) {
      closeLine();
      write(`${message}\n`);
    },
    finish() {
      task = null;
      closeLine();
    },
  };
}
