/** Test helpers: feed text to the interval parser and collect what it accepted. */
import { Readable } from "node:stream";
import { parseIntervalStream, type IntervalFileResult } from "../../src/ingest/intervalStream.ts";

export interface CollectedRow {
  meterId: string;
  instantMs: number;
  value: number;
  line: number;
  minutes: number;
}

/** Parses `text` delivered in chunks of `chunkSize` bytes (to exercise chunk boundaries). */
export async function parseText(
  text: string,
  zoneOfMeter: (id: string) => string | null = () => "America/New_York",
  chunkSize = 1 << 16,
): Promise<{ rows: CollectedRow[]; result: IntervalFileResult }> {
  const bytes = Buffer.from(text, "utf8");
  const chunks: Buffer[] = [];
  for (let i = 0; i < bytes.length; i += chunkSize) chunks.push(bytes.subarray(i, i + chunkSize));
  const ids: string[] = [];
  const rows: CollectedRow[] = [];
  const result = await parseIntervalStream(Readable.from(chunks), {
    fileLabel: "data/x/intervals/a.csv",
    zoneOfMeter,
    sink: {
      meter: (id) => ids.push(id) - 1,
      row: (i, instantMs, value, line, minutes) => rows.push({ meterId: ids[i], instantMs, value, line, minutes }),
    },
  });
  return { rows, result };
}

/** Local wall-clock labels `YYYY-MM-DDTHH:MM` for every 15 minutes of one calendar day. */
export function wallLabels(date: string): string[] {
  const out: string[] = [];
  for (let h = 0; h < 24; h++) for (const m of [0, 15, 30, 45]) out.push(`${date}T${String(h).padStart(2, "0")}:${String(m).padStart(2, "0")}`);
  return out;
}
