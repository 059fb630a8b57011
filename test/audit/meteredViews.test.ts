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

  it("reads each meter's readings once, whatever the order of the bills, and keys bills as they come (a repeated id keeps its first place and last value)", () => {
    const start = Date.UTC(2024, 0, 1);
    const series = (id: string, scale: number) => ({ meterId: id, intervalMinutes: 60, startMs: Float64Array.from({ length: 96 }, (_, i) => start + i * HOUR), values: Float64Array.from({ length: 96 }, (_, i) => scale * (i + 1)) });
    const bill = (billId: string, meterId: string, from: string, to: string) => ({ billId, meterId, periodStart: from, periodEnd: to, usage: 0, readType: "actual", demandKw: null, powerFactor: null, total: 0, statementDate: null, source: src });
    const reads: string[] = [];
    const stored = new Map([["A", series("A", 1)], ["B", series("B", 1000)]]);
    const counting: ReadonlyMap<string, ReturnType<typeof series>> = Object.assign(Object.create(stored) as Map<string, ReturnType<typeof series>>, {
      get: (k: string) => (reads.push(k), stored.get(k)),
    });
    const portfolio = {
      root: "/x",
      settings: { name: "T", ...structuredClone(DEFAULT_SETTINGS) },
      buildings: [{ buildingId: "X", name: "X", floorArea: 1, areaUnit: "m2", floorAreaM2: 1, timezone: "UTC", weatherStation: "W", useType: null, tenantPage: false, source: src }],
      meters: ["A", "B"].map((meterId) => ({ meterId, buildingId: "X", commodity: "electricity", unit: "kWh", tariffId: "T", multiplier: 1, account: null, source: src })),
      bills: [bill("A1", "A", "2024-01-01", "2024-01-02"), bill("D", "A", "2024-01-02", "2024-01-03"), bill("B1", "B", "2024-01-01", "2024-01-02"), bill("A2", "A", "2024-01-03", "2024-01-04"), bill("D", "B", "2024-01-03", "2024-01-04")],
      billLines: [],
      intervals: counting,
      weather: new Map(),
      normals: new Map(),
      tariffs: new Map(),
      report: { files: [] },
    } as unknown as Portfolio;
    const views = meteredViewsByBill(portfolio, new Map());
    expect(reads.sort()).toEqual(["A", "B"]);
    // Hours 1–24 sum to 300, 25–48 to 876, 49–72 to 1,452 (meter B: ×1,000).
    expect([...views]).toEqual([
      ["A1", { raw: 300, cleaned: 300, flaggedIntervals: 0, intervals: 24 }],
      ["D", { raw: 1_452_000, cleaned: 1_452_000, flaggedIntervals: 0, intervals: 24 }],
      ["B1", { raw: 300_000, cleaned: 300_000, flaggedIntervals: 0, intervals: 24 }],
      ["A2", { raw: 1452, cleaned: 1452, flaggedIntervals: 0, intervals: 24 }],
    ]);
  });
});
