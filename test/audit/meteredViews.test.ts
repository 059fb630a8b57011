/** Raw vs cleaned metered usage per bill (hand-computed). */
import { describe, expect, it } from "vitest";
import type { Portfolio } from "../../src/domain/types.ts";
import { DEFAULT_SETTINGS } from "../../src/ingest/portfolioYaml.ts";
import { meteredViewsByBill } from "../../src/audit/meteredViews.ts";

const src = { file: "x.csv", line: 2 };
const HOUR = 3_600_000;

describe("meteredViewsByBill", () => {
  it("sums the bill's local day raw and without flagged readings, multiplier applied", () => {
    // 2024-01-02 in UTC: 24 hourly readings of 1, 2, …, 24; readings at 10:00 and 11:00 flagged.
    const start = Date.UTC(2024, 0, 2);
    const startMs = Float64Array.from({ length: 48 }, (_, i) => start - 12 * HOUR + i * HOUR);
    const values = Float64Array.from({ length: 48 }, (_, i) => (i >= 12 && i < 36 ? i - 11 : 100));
    const mask = new Uint8Array(48);
    mask[12 + 10] = 1;
    mask[12 + 11] = 1;
    const portfolio = {
      root: "/x",
      settings: { name: "T", ...structuredClone(DEFAULT_SETTINGS) },
      buildings: [{ buildingId: "B", name: "B", floorArea: 1, areaUnit: "m2", floorAreaM2: 1, timezone: "UTC", weatherStation: "W", useType: null, tenantPage: false, source: src }],
      meters: [{ meterId: "E", buildingId: "B", commodity: "electricity", unit: "kWh", tariffId: "T", multiplier: 10, account: null, source: src }],
      bills: [{ billId: "E1", meterId: "E", periodStart: "2024-01-02", periodEnd: "2024-01-03", usage: 0, readType: "actual", demandKw: null, powerFactor: null, total: 0, statementDate: null, source: src }],
      billLines: [],
      intervals: new Map([["E", { meterId: "E", intervalMinutes: 60, startMs, values }]]),
      weather: new Map(),
      normals: new Map(),
      tariffs: new Map(),
      report: { files: [] },
    } as Portfolio;
    const v = meteredViewsByBill(portfolio, new Map([["E", mask]])).get("E1")!;
    // Raw: (1 + … + 24) × 10 = 3,000. Flagged readings are 11 and 12: cleaned = (300 − 23) × 10 = 2,770.
    expect(v).toEqual({ raw: 3000, cleaned: 2770, flaggedIntervals: 2, intervals: 24 });
  });
});
