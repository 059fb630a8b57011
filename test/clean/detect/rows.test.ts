import { describe, expect, it } from "vitest";
import { DATA_QUALITY_COLUMNS, detectionsToRows } from "../../../src/clean/detect/index.ts";
import type { Detection } from "../../../src/clean/detect/index.ts";

const spike: Detection = {
  meterId: "M1", kind: "spike", startMs: Date.UTC(2025, 5, 3, 15), endMs: Date.UTC(2025, 5, 3, 15, 15), intervals: 1, action: "excluded", detail: "x",
};
const gap: Detection = {
  meterId: null, stationId: "WX", kind: "weather-gap", startMs: Date.UTC(2025, 5, 3), endMs: Date.UTC(2025, 5, 3, 8), intervals: 8, action: "excluded", detail: "y",
};

describe("detectionsToRows", () => {
  it("columns in data-quality.csv order (outputs.md), ISO instants with Z offset", () => {
    const rows = detectionsToRows([spike], (m) => (m === "M1" ? "B1" : "?"));
    expect(rows).toEqual([
      { building_id: "B1", meter_id: "M1", start: "2025-06-03T15:00:00.000Z", end: "2025-06-03T15:15:00.000Z", kind: "spike", intervals: 1, action: "excluded" },
    ]);
    expect(Object.keys(rows[0]!)).toEqual([...DATA_QUALITY_COLUMNS]);
  });
  it("a weather gap becomes one row per building on the station, or one row with blanks", () => {
    expect(detectionsToRows([gap], () => "?", () => ["B1", "B2"]).map((r) => [r.building_id, r.meter_id, r.intervals])).toEqual([
      ["B1", "", 8],
      ["B2", "", 8],
    ]);
    expect(detectionsToRows([gap], () => "?").map((r) => r.building_id)).toEqual([""]);
  });
});
