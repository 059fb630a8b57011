/** Last-12-month usage: proration at the window edges and unit conversion (hand-computed). */
import { describe, expect, it } from "vitest";
import type { Bill, Building, Meter } from "../../src/domain/types.ts";
import { billUsageInWindow, buildingUsageLast12m, last12MonthsWindow, meterYearWindow, metersCostLast12m, prorateToWindow, siteKwhLast12m } from "../../src/report/usageSummary.ts";

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

  it("coverage counts each day of the window once, however many bills cover it (hand-computed)", () => {
    // Window 2024-12-10 … 2025-12-09 (last read 2025-12-10). Bills: 2025-01-01..2025-03-01 (59 days),
    // an overlapping 2025-02-01..2025-04-01 (31 new days: March), a duplicate of the first, and
    // one starting before the window, 2024-12-01..2024-12-20 (10 days inside): 59 + 31 + 10 = 100.
    const bills = [
      bill("E", "2025-01-01", "2025-03-01", 1), bill("E", "2025-02-01", "2025-04-01", 1), { ...bill("E", "2025-01-01", "2025-03-01", 1), billId: "dup" },
      bill("E", "2024-12-01", "2024-12-20", 1), bill("E", "2025-12-01", "2025-12-10", 1),
    ];
    const [el] = buildingUsageLast12m(building, [meter("E", "electricity", "kWh")], bills, "2025-12-31");
    // + the 9 days 2025-12-01 … 2025-12-09 of the last bill: 109 of 365.
    expect(el!.coverage).toBeCloseTo(109 / 365, 12);
  });

  it("a meter's window ends at the earlier of as_of and its last read (hand-computed)", () => {
    const bills = [bill("E", "2025-10-10", "2025-11-10", 1), bill("E", "2025-11-10", "2025-12-10", 1)];
    // Last read 2025-12-10 (exclusive end) is before as_of 2025-12-31: the 365 days up to it.
    expect(meterYearWindow(bills, "2025-12-31")).toEqual({ start: "2024-12-10", end: "2025-12-10" });
    // as_of 2025-11-30 is earlier: the 365 days up to and including as_of.
    expect(meterYearWindow(bills, "2025-11-30")).toEqual({ start: "2024-12-01", end: "2025-12-01" });
    // Last read exactly the day after as_of: both rules give the same window.
    expect(meterYearWindow(bills, "2025-12-09")).toEqual({ start: "2024-12-10", end: "2025-12-10" });
    expect(meterYearWindow([], "2025-12-31")).toBeNull();
  });

  it("prorates cost by days inside each meter's own window (hand-computed)", () => {
    const withTotal = (b: Bill, total: number): Bill => ({ ...b, total });
    // E: last read 2025-12-10 → window 2024-12-10 … 2025-12-09. Bill 2024-11-25 … 2024-12-25
    // ($300 over 30 days) counts 15 days = $150; bill 2024-12-25 … 2025-12-10 ($1,000) whole.
    // W: last read 2025-06-01 → window 2024-06-01 … 2025-05-31; its one bill ($50) is inside.
    const byMeter = new Map<string, Bill[]>([
      ["E", [withTotal(bill("E", "2024-11-25", "2024-12-25", 0), 300), withTotal(bill("E", "2024-12-25", "2025-12-10", 0), 1000)]],
      ["W", [withTotal(bill("W", "2025-05-01", "2025-06-01", 0), 50)]],
    ]);
    expect(metersCostLast12m([{ meterId: "E" }, { meterId: "W" }], byMeter, "2025-12-31")).toBeCloseTo(1200, 10);
    expect(metersCostLast12m([{ meterId: "X" }], byMeter, "2025-12-31")).toBeNull();
    expect(prorateToWindow(310, "2025-12-15", "2026-01-15", { start: "2025-01-01", end: "2026-01-01" })).toBeCloseTo(170, 10);
  });

  it("site energy = kWh + therm × 29.3071… (1 therm = 100,000 Btu, U.S. EIA; 1 Btu = 1,055.05585262 J, NIST SP 811); water excluded", () => {
    const kwhPerTherm = (100_000 * 1055.05585262) / 3_600_000; // 29.30710701…
    expect(siteKwhLast12m([{ commodity: "electricity", actualLast12m: 1000 }, { commodity: "gas", actualLast12m: 10 }, { commodity: "water", actualLast12m: 5 }])).toBeCloseTo(1000 + 10 * kwhPerTherm, 9);
    expect(siteKwhLast12m([{ commodity: "electricity", actualLast12m: 1000 }, { commodity: "gas", actualLast12m: null }])).toBeNull();
    expect(siteKwhLast12m([{ commodity: "water", actualLast12m: 5 }])).toBeNull();
  });
});
