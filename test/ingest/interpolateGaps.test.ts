import { describe, expect, it } from "vitest";
import { interpolateGaps } from "../../src/ingest/interpolateGaps.ts";

const N = Number.NaN;

describe("interpolateGaps (all expected values hand-computed: a + (b − a)(k + 1)/(L + 1))", () => {
  it("fills a 2-value gap between 10 and 16 with 12 and 14", () => {
    const r = interpolateGaps([10, N, N, 16], 2);
    expect(Array.from(r.values)).toEqual([10, 12, 14, 16]);
    expect(Array.from(r.filled)).toEqual([0, 1, 1, 0]);
    expect(r.gaps).toEqual([{ start: 1, length: 2, action: "interpolated" }]);
  });

  it("fills a falling 3-value gap: 8 → 0 gives 6, 4, 2", () => {
    const r = interpolateGaps([8, N, N, N, 0], 6);
    expect(Array.from(r.values)).toEqual([8, 6, 4, 2, 0]);
  });

  it("fills one missing value with the mean of its neighbours: (−3.5 + 1.5)/2 = −1", () => {
    expect(Array.from(interpolateGaps([-3.5, N, 1.5], 1).values)).toEqual([-3.5, -1, 1.5]);
  });

  it("leaves a gap longer than the limit missing and reports it as kept", () => {
    const r = interpolateGaps([10, N, N, 16], 1);
    expect(Number.isNaN(r.values[1]) && Number.isNaN(r.values[2])).toBe(true);
    expect(Array.from(r.filled)).toEqual([0, 0, 0, 0]);
    expect(r.gaps).toEqual([{ start: 1, length: 2, action: "kept" }]);
  });

  it("a gap of exactly the limit is filled; limit 0 fills nothing", () => {
    expect(interpolateGaps([0, N, N, N, N, N, N, 7], 6).values[3]).toBe(3);
    expect(interpolateGaps([0, N, 2], 0).gaps[0].action).toBe("kept");
  });

  it("keeps gaps at the ends (no neighbour on one side) and handles several gaps", () => {
    const r = interpolateGaps([N, 1, N, 3, N, N, N, N, 8, N], 2);
    expect(r.gaps).toEqual([
      { start: 0, length: 1, action: "kept" },
      { start: 2, length: 1, action: "interpolated" },
      { start: 4, length: 4, action: "kept" },
      { start: 9, length: 1, action: "kept" },
    ]);
    expect(r.values[2]).toBe(2);
  });

  it("does not modify its input", () => {
    const input = new Float64Array([1, N, 3]);
    interpolateGaps(input, 6);
    expect(Number.isNaN(input[1])).toBe(true);
  });
});
