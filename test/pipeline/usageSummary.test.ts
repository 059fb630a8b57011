/** Last-12-month usage: proration at the window edges and unit conversion (hand-computed). */
import { describe, expect, it } from "vitest";
import type { Bill, Building, Meter } from "../../src/domain/types.ts";
import { billUsageInWindow, buildingUsageLast12m, last12MonthsWindow } from "../../src/pipeline/usageSummary.ts";

const src = { file: "t.csv", line: 1 };
const building: Building = {
  buildingId: "B", name: "B", floorArea: 1000, areaUnit: "m2", floorAreaM2: 1000, timezone: "UTC",
  weatherStation: "W", useType: null, tenantPage: false, source: src,
};
const meter = (meterId: string, commodity: Meter["commodity"], unit: string): Meter => ({
  meterId, buildingId: "B", commodity, unit, tariffId: "T", multiplier: 1, account: null, source: src,
});
const bill = (meterId: string, periodStart: string, periodEnd: string, usage: number): Bill => ({
  billId: `${meterId}:${periodStart}`, meterId, periodStart, periodEnd, usage, readType: "actual",
  demandKw: null, powerFactor: null, total: 0, statementDate: null, source: src,
});

describe("last-12-months usage", () => {
  it("the window is the 365 days ending on the as-of day", () => {
    expect(last12MonthsWindow("2025-12-31")).toEqual({ start: "2025-01-01", end: "2026-01-01" });
  });

  it("prorates a bill crossing the window edge by days (hand-computed: 10 of 31 days of 310 = 100)", () => {
    expect(billUsageInWindow(bill("E", "2024-12-22", "2025-01-22", 310), "2025-01-01", "2026-01-01")).toBeCloseTo(210, 10);
    expect(billUsageInWindow(bill("E", "2024-12-22", "2025-01-22", 310), "2024-12-01", "2025-01-01")).toBeCloseTo(100, 10);
    expect(billUsageInWindow(bill("E", "2023-01-01", "2023-02-01", 310), "2025-01-01", "2026-01-01")).toBe(0);
  });

  it("ends each meter's window at its last read and converts ccf to therms by the heat content", () => {
    // Gas billed in ccf: 12 bills of 30 days and 100 ccf from 2024-12-15 to 2025-12-10; as_of 2025-12-31.
    const bills: Bill[] = [];
    let start = "2024-12-15";
    for (let i = 0; i < 12; i++) {
      const d = new Date(Date.UTC(2024, 11, 15 + 30 * (i + 1))).toISOString().slice(0, 10);
      bills.push(bill("G", start, d, 100));
      start = d;
    }
    const last = bills[bills.length - 1]!.periodEnd; // 2025-12-10
    expect(last).toBe("2025-12-10");
    const [gas] = buildingUsageLast12m(building, [meter("G", "gas", "ccf")], bills, "2025-12-31", () => 1.037);
    // Window = the 365 days 2024-12-10 … 2025-12-09; the bills cover 360 of them, all 1,200 ccf,
    // × 1.037 therm/ccf = 1,244.4 therm (hand-computed). A calendar window ending on as_of would
    // have lost the 21 unbilled December days.
    expect(gas!.unit).toBe("therm");
    expect(gas!.actualLast12m).toBeCloseTo(1244.4, 6);
    expect(gas!.coverage).toBeCloseTo(360 / 365, 10);
  });
});
