import fc from "fast-check";
import { DateTime } from "luxon";
import { describe, expect, it } from "vitest";
import { parse } from "csv-parse/sync";
import { parseText } from "./helpers.ts";

/**
 * Reference check: for random valid files the fast parser must agree with csv-parse
 * (field splitting, quoting), Number() (values) and luxon (timestamps with an offset,
 * and local New York times away from DST changes).
 */
const row = fc.record({
  meter: fc.constantFrom("M1", "M-2", "M,3", 'M"4'),
  day: fc.integer({ min: 0, max: 700 }),
  minute: fc.integer({ min: 0, max: 1439 }),
  offset: fc.constantFrom("Z", "+05:30", "-04:00", "-0800", ""),
  value: fc.double({ min: -1e6, max: 1e6, noNaN: true, noDefaultInfinity: true }),
  decimals: fc.integer({ min: 0, max: 6 }),
  quote: fc.boolean(),
});

const csvCell = (s: string, force: boolean): string => (force || /[",]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s);

describe("parseIntervalStream agrees with csv-parse + Number + luxon (property)", () => {
  it("on random valid rows, in random chunk sizes", async () => {
    await fc.assert(
      fc.asyncProperty(fc.array(row, { minLength: 1, maxLength: 40 }), fc.integer({ min: 1, max: 200 }), async (rows, chunk) => {
        const lines = rows.map((r) => {
          const wall = DateTime.fromMillis(Date.UTC(2023, 0, 1) + r.day * 86400000 + r.minute * 60000, { zone: "UTC" });
          // Local times only away from the two DST days of each year, where the mapping is unique.
          const local = r.offset === "" && !["2023-03-12", "2023-11-05", "2024-03-10", "2024-11-03"].includes(wall.toISODate()!);
          const ts = `${wall.toFormat("yyyy-LL-dd'T'HH:mm")}${r.offset === "" && !local ? "Z" : r.offset}`;
          return { ts, text: `${csvCell(r.meter, r.quote)},${csvCell(ts, r.quote)},${csvCell(r.value.toFixed(r.decimals), r.quote)}` };
        });
        const text = `meter_id,timestamp,value\n${lines.map((l) => l.text).join("\n")}\n`;
        const { rows: got, result } = await parseText(text, () => "America/New_York", chunk);
        const ref = (parse(text, { columns: true }) as { meter_id: string; timestamp: string; value: string }[]).map((r) => ({
          meterId: r.meter_id,
          instantMs: DateTime.fromISO(r.timestamp, { zone: "America/New_York" }).toMillis(),
          value: Number(r.value),
        }));
        expect(result.report.rowsRejected).toBe(0);
        expect(got.map((g) => ({ meterId: g.meterId, instantMs: g.instantMs, value: g.value }))).toEqual(ref);
      }),
      { numRuns: 150, seed: 20241103 },
    );
  });
});
