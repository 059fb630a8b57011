import { describe, expect, it } from "vitest";
import { cleanSeries } from "../../src/clean/cleanSeries.ts";
import { detectAnomalies } from "../../src/clean/detect/index.ts";
import type { Detection } from "../../src/clean/detect/index.ts";
import type { IntervalSeries } from "../../src/domain/types.ts";

const T0 = Date.UTC(2025, 0, 6);
const Q = 15 * 60_000;
const series: IntervalSeries = {
  meterId: "M1",
  intervalMinutes: 15,
  startMs: Float64Array.from([0, 1, 2, 3, 4, 5], (k) => T0 + k * Q),
  values: Float64Array.from([10, 11, 400, 12, -3, 13]),
};
const det = (over: Partial<Detection>): Detection => ({
  meterId: "M1", kind: "spike", startMs: T0 + 2 * Q, endMs: T0 + 3 * Q, intervals: 1, action: "excluded", detail: "", ...over,
});

describe("cleanSeries", () => {
  it("blanks excluded intervals, keeps the raw series untouched beside them (hand-computed sums)", () => {
    const c = cleanSeries(series, [det({}), det({ kind: "negative", startMs: T0 + 4 * Q, endMs: T0 + 5 * Q })]);
    expect(c.raw).toBe(series);
    expect(Array.from(series.values)).toEqual([10, 11, 400, 12, -3, 13]);
    expect(Array.from(c.mask)).toEqual([0, 0, 1, 0, 1, 0]);
    expect(Array.from(c.cleanedValues)).toEqual([10, 11, NaN, 12, NaN, 13]);
    expect(c.excludedCount).toBe(2);
    // Raw sum 443 and cleaned sum 46 both stay available for bill reconciliation.
    const rawSum = series.values.reduce((a, b) => a + b, 0);
    const cleanSum = c.cleanedValues.reduce((a, b) => (Number.isNaN(b) ? a : a + b), 0);
    expect([rawSum, cleanSum]).toEqual([443, 46]);
  });

  it("ignores other meters, weather detections and actions other than excluded", () => {
    const c = cleanSeries(series, [
      det({ meterId: "OTHER" }),
      det({ meterId: null, stationId: "WX", kind: "weather-gap" }),
      det({ action: "kept" }),
    ]);
    expect(c.excludedCount).toBe(0);
    expect(Array.from(c.cleanedValues)).toEqual(Array.from(series.values));
  });

  it("a multi-interval detection masks every interval starting inside [start, end)", () => {
    const c = cleanSeries(series, [det({ kind: "zero-run", startMs: T0 + Q, endMs: T0 + 4 * Q, intervals: 3 })]);
    expect(Array.from(c.mask)).toEqual([0, 1, 1, 1, 0, 0]);
  });

  it("agrees with the mask detectAnomalies returns", () => {
    const { detections, mask } = detectAnomalies(series);
    expect(Array.from(cleanSeries(series, detections).mask)).toEqual(Array.from(mask));
  });
});
