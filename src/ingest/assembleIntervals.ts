/**
 * Turns collected interval rows into one {@link IntervalSeries} per meter: sorts (stable, so
 * the first row read wins among equal instants), drops duplicate instants, infers the interval
 * length, shifts end-stamped readings to interval starts and counts negative readings.
 * Pure: no I/O; issues point back at the file and line of each row.
 */
import type { InputIssue } from "../core/issues.ts";
import type { IntervalSeries } from "../domain/types.ts";
import type { CollectedMeter } from "./intervalCollector.ts";

const INTERVAL_MINUTES_ALLOWED = [5, 15, 30, 60] as const;

/** How to fix a repeated interval reading. */
export const DUPLICATE_HINT = "remove the repeated row; on the autumn DST day write the repeated hour with a UTC offset if it is meant";

export interface DuplicateRejection {
  fileIndex: number;
  line: number;
  reason: string;
}

export interface AssembledIntervals {
  series: Map<string, IntervalSeries>;
  issues: InputIssue[];
  /** Rows dropped here; the caller moves them from "used" to "rejected" in the file reports. */
  duplicates: DuplicateRejection[];
}

/**
 * Most common step between consecutive instants among 5/15/30/60 minutes.
 * Example: instants 00:00, 00:15, 00:30, 01:30 → steps 15, 15, 60 → 15.
 * Returns null when there is no step at all (fewer than two instants).
 */
export function inferIntervalMinutes(sortedInstantsMs: ArrayLike<number>, count = sortedInstantsMs.length): number | null {
  const votes = [0, 0, 0, 0];
  let any = false;
  for (let k = 1; k < count; k++) {
    const stepMin = (sortedInstantsMs[k] - sortedInstantsMs[k - 1]) / 60000;
    if (stepMin <= 0) continue;
    any = true;
    const idx = INTERVAL_MINUTES_ALLOWED.indexOf(stepMin as 5 | 15 | 30 | 60);
    if (idx >= 0) votes[idx]++;
  }
  if (!any) return null;
  let best = -1;
  for (let i = 0; i < 4; i++) if (votes[i] > 0 && (best < 0 || votes[i] > votes[best])) best = i;
  return best < 0 ? null : INTERVAL_MINUTES_ALLOWED[best];
}

/**
 * Assembles every collected meter. `fileLabels[i]` names the file with index i;
 * `stamp` says whether timestamps mark interval starts or ends (portfolio setting).
 */
export function assembleIntervals(
  collected: readonly CollectedMeter[],
  fileLabels: readonly string[],
  stamp: "start" | "end",
): AssembledIntervals {
  const series = new Map<string, IntervalSeries>();
  const issues: InputIssue[] = [];
  const duplicates: DuplicateRejection[] = [];
  for (const m of collected) {
    if (m.count === 0) continue;
    const n = m.count;
    const firstFile = fileLabels[m.fileIndex[0]];
    const firstLine = m.lines[0];
    const warn = (message: string, hint: string): void => {
      issues.push({ file: firstFile, line: firstLine, column: 0, severity: "warning", message, hint });
    };

    let order: Uint32Array | null = null;
    for (let k = 1; k < n; k++) {
      if (m.instantMs[k] < m.instantMs[k - 1]) {
        order = new Uint32Array(n);
        for (let i = 0; i < n; i++) order[i] = i;
        const t = m.instantMs;
        order.sort((a, b) => t[a] - t[b] || a - b);
        warn(`meter ${m.meterId}: rows are not in time order; they were sorted`, "nothing to fix unless the order hides another problem");
        break;
      }
    }
    const at = (k: number): number => (order === null ? k : order[k]);

    const startMs = new Float64Array(n);
    const values = new Float64Array(n);
    let kept = 0;
    let negatives = 0;
    let keptSource = -1;
    for (let k = 0; k < n; k++) {
      const i = at(k);
      const t = m.instantMs[i];
      if (kept > 0 && t === startMs[kept - 1]) {
        const reason = `duplicate reading for meter ${m.meterId} at ${new Date(t).toISOString()}; the first one (${fileLabels[m.fileIndex[keptSource]]}:${m.lines[keptSource]}) is kept`;
        duplicates.push({ fileIndex: m.fileIndex[i], line: m.lines[i], reason });
        issues.push({ file: fileLabels[m.fileIndex[i]], line: m.lines[i], column: 0, severity: "error", message: reason,
          hint: DUPLICATE_HINT });
        continue;
      }
      startMs[kept] = t;
      values[kept] = m.values[i];
      if (m.values[i] < 0) negatives++;
      keptSource = i;
      kept++;
    }

    let minutes: number;
    const declared = [...m.declaredMinutes.entries()].sort((a, b) => b[1] - a[1]);
    const inferred = inferIntervalMinutes(startMs, kept);
    if (declared.length > 0) {
      minutes = declared[0][0];
      if (declared.length > 1) {
        warn(`meter ${m.meterId}: interval_minutes differs between rows (${declared.map((d) => d[0]).join(", ")}); using ${minutes}`,
          "one meter should have one interval length");
      }
    } else if (inferred !== null) {
      minutes = inferred;
    } else {
      minutes = 15;
      warn(`meter ${m.meterId}: cannot infer the interval length from a single reading; assuming 15 minutes`,
        "add an interval_minutes column");
    }
    if (stamp === "end") {
      const shift = minutes * 60000;
      for (let k = 0; k < kept; k++) startMs[k] -= shift;
    }
    if (negatives > 0) {
      warn(`meter ${m.meterId}: ${negatives} negative reading(s) kept as read`,
        "negative readings usually mean export or a meter reset; cleaning flags them later");
    }
    series.set(m.meterId, {
      meterId: m.meterId,
      intervalMinutes: minutes,
      startMs: kept === n ? startMs : startMs.slice(0, kept),
      values: kept === n ? values : values.slice(0, kept),
    });
  }
  return { series, issues, duplicates };
}
