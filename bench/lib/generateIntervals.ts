/**
 * Writes a synthetic interval file for benchmarks: `meters` fictional meters × `days` days of
 * 15-minute readings, local wall time of `timezone` without offset (so the DST logic is
 * exercised), grouped by meter as utility exports usually are. Values are invented.
 */
import { openSync, writeSync, closeSync } from "node:fs";
import { DateTime } from "luxon";

export interface GeneratedFile {
  path: string;
  rows: number;
  bytes: number;
}

/** Generates the file; deterministic for the same arguments (simple LCG, no Math.random). */
export function generateIntervalFile(path: string, meters: number, days: number, timezone: string, startDate = "2024-01-01"): GeneratedFile {
  const start = DateTime.fromISO(startDate, { zone: timezone });
  const end = start.plus({ days });
  // Wall-clock labels for every 15-minute instant, computed once and reused for every meter.
  const labels: string[] = [];
  for (let t = start.toMillis(); t < end.toMillis(); t += 900000) {
    labels.push(DateTime.fromMillis(t, { zone: timezone }).toFormat("yyyy-LL-dd'T'HH:mm"));
  }
  const fd = openSync(path, "w");
  let bytes = 0;
  let rows = 0;
  let seed = 12345;
  const write = (s: string): void => {
    bytes += Buffer.byteLength(s);
    writeSync(fd, s);
  };
  write("meter_id,timestamp,value\n");
  for (let m = 0; m < meters; m++) {
    const id = `BENCH-M${String(m + 1).padStart(4, "0")}`;
    let block = "";
    for (let k = 0; k < labels.length; k++) {
      seed = (seed * 1103515245 + 12345) % 2147483648;
      const kwh = (5 + (seed % 20000) / 1000).toFixed(3);
      block += `${id},${labels[k]},${kwh}\n`;
      rows++;
      if (block.length > 1 << 20) {
        write(block);
        block = "";
      }
    }
    write(block);
  }
  closeSync(fd);
  return { path, rows, bytes };
}
