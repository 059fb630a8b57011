import { describe, expect, it } from "vitest";
import { csvInSlices } from "../../src/report/dataFiles.ts";
import { toCsv } from "../../src/core/csv.ts";

describe("csvInSlices", () => {
  const rows = Array.from({ length: 11 }, (_, i) => ({ id: `b${i}`, note: i % 3 === 0 ? "quoted, with a comma" : "", amount: i * 1.5 }));
  const whole = (slice: typeof rows) => toCsv(["id", "note", "amount"], slice);

  it("gives the text of one call, whatever the slice size", () => {
    for (const size of [1, 2, 5, 10, 11, 50]) expect(csvInSlices(rows, whole, size)).toBe(whole(rows));
  });

  it("keeps the header of an empty table", () => {
    expect(csvInSlices([], whole, 2)).toBe("id,note,amount\n");
  });
});
