/**
 * Sink for {@link parseIntervalStream} that keeps every accepted row, per meter, in growable
 * typed arrays (time, value, source file and line), across any number of files.
 */
import type { IntervalSink } from "./intervalStream.ts";

export interface CollectedMeter {
  meterId: string;
  count: number;
  /** UTC instants of the timestamps as written (start or end of the interval). */
  instantMs: Float64Array;
  values: Float64Array;
  lines: Int32Array;
  fileIndex: Uint16Array;
  /** Declared interval_minutes per distinct value → number of rows stating it. */
  declaredMinutes: Map<number, number>;
}

export class IntervalCollector implements IntervalSink {
  /** Index (into the caller's list of files) of the file being read; set before each file. */
  fileIndex = 0;
  readonly meters: CollectedMeter[] = [];
  private readonly byId = new Map<string, number>();

  meter(meterId: string): number {
    const known = this.byId.get(meterId);
    if (known !== undefined) return known;
    const cap = 1024;
    this.meters.push({
      meterId, count: 0,
      instantMs: new Float64Array(cap), values: new Float64Array(cap),
      lines: new Int32Array(cap), fileIndex: new Uint16Array(cap),
      declaredMinutes: new Map(),
    });
    this.byId.set(meterId, this.meters.length - 1);
    return this.meters.length - 1;
  }

  row(meterIndex: number, instantMs: number, value: number, line: number, intervalMinutes: number): void {
    const m = this.meters[meterIndex];
    if (m.count === m.instantMs.length) grow(m);
    const k = m.count++;
    m.instantMs[k] = instantMs;
    m.values[k] = value;
    m.lines[k] = line;
    m.fileIndex[k] = this.fileIndex;
    if (intervalMinutes === intervalMinutes) {
      m.declaredMinutes.set(intervalMinutes, (m.declaredMinutes.get(intervalMinutes) ?? 0) + 1);
    }
  }
}

function grow(m: CollectedMeter): void {
  const cap = m.instantMs.length * 2;
  const t = new Float64Array(cap);
  t.set(m.instantMs);
  m.instantMs = t;
  const v = new Float64Array(cap);
  v.set(m.values);
  m.values = v;
  const l = new Int32Array(cap);
  l.set(m.lines);
  m.lines = l;
  const f = new Uint16Array(cap);
  f.set(m.fileIndex);
  m.fileIndex = f;
}
