/**
 * One meter's interval data from one CSV file, read exactly as `build` reads the intervals folder
 * (same streaming reader, timestamp rules, DST handling, interval inference and duplicate check),
 * for commands that price a single bill (`ohmbook price --intervals`).
 */
import { createReadStream } from "node:fs";
import type { InputIssue } from "../core/issues.ts";
import type { IntervalSeries } from "../domain/types.ts";
import { assembleIntervals } from "./assembleIntervals.ts";
import { IntervalCollector } from "./intervalCollector.ts";
import { parseIntervalStream } from "./intervalStream.ts";

export interface MeterIntervalFile {
  /** The meter's series (values before the multiplier), or null when the file has no usable row of it. */
  series: IntervalSeries | null;
  /** Rows of the meter that were read and kept. */
  rowsForMeter: number;
  /** Rows of other meters in the file (read, not used). */
  rowsOtherMeters: number;
  otherMeters: string[];
  /** Problems with file:line:column, as `build` would report them (errors reject rows). */
  issues: InputIssue[];
}

/**
 * Reads `path` and keeps the rows of `meterId`; timestamps without an offset are local time in
 * `zone`. `stamp` says whether timestamps mark interval starts or ends.
 * @example await readMeterIntervalFile("m1.csv", { fileLabel: "m1.csv", meterId: "M1", zone: "America/Chicago", stamp: "start" })
 */
export async function readMeterIntervalFile(
  path: string,
  options: { fileLabel: string; meterId: string; zone: string; stamp: "start" | "end" },
): Promise<MeterIntervalFile> {
  const collector = new IntervalCollector();
  const res = await parseIntervalStream(createReadStream(path, { highWaterMark: 1 << 20 }), {
    fileLabel: options.fileLabel,
    zoneOfMeter: () => options.zone,
    sink: collector,
  });
  const ours = collector.meters.filter((m) => m.meterId === options.meterId);
  const others = collector.meters.filter((m) => m.meterId !== options.meterId);
  const assembled = assembleIntervals(ours, [options.fileLabel], options.stamp);
  const series = assembled.series.get(options.meterId) ?? null;
  return {
    series,
    rowsForMeter: (ours[0]?.count ?? 0) - assembled.duplicates.length,
    rowsOtherMeters: others.reduce((s, m) => s + m.count, 0),
    otherMeters: others.map((m) => m.meterId),
    // Assembly reports each duplicate as an error of its row, with its hint.
    issues: [...res.issues, ...assembled.issues],
  };
}
