/**
 * `intervalsGive: "shape"`: a bill re-priced on its stated quantities, the interval data only
 * splitting them over time-of-use periods — one basis per recomputation (issue 11). Every
 * expected figure below is computed by hand in the comment beside it.
 */
import { describe, expect, it } from "vitest";
import { priceBill } from "../../src/tariff/price.ts";
import type { PriceRequest } from "../../src/tariff/types.ts";
import { intervalsFrom, lineOf, tariffOf } from "./helpers.ts";

// 2025-01-15 is a Wednesday. 96 intervals of 5 kWh (20 kW), except 11:45 and 12:00 = 30 kWh
// (120 kW each) and 13:00, 13:15 = 15 kWh (60 kW). Total = 92 × 5 + 2 × 30 + 2 × 15 = 550 kWh.
// Peak hours 12:00–14:00 hold 12:00 (30) + 12:15..12:45 (3 × 5) + 13:00, 13:15 (2 × 15) + 13:30, 13:45 (2 × 5) = 85 kWh.
const values = new Array(96).fill(5);
values[47] = 30;
values[48] = 30;
values[52] = 15;
values[53] = 15;
const intervals = intervalsFrom("2025-01-15T00:00:00Z", 15, values);

const TARIFF = tariffOf(`
id: shape-test
commodity: electricity
usage_unit: kWh
versions:
  - from: 2025-01-01
    periods:
      peak: { days: weekdays, hours: "12:00-14:00" }
      off-peak: {}
    charges:
      - { label: Customer charge, fixed: 10.00 }
      - { label: Energy, energy: { peak: 0.30, off-peak: 0.10 } }
      - { label: Delivery, energy: 0.02 }
      - { label: Facility demand, demand: 10.00, window_minutes: 15 }
      - { label: Peak demand, demand: { peak: 5.00 }, window_minutes: 15 }
`);

const req = (over: Partial<PriceRequest>): PriceRequest => ({
  periodStart: "2025-01-15",
  periodEnd: "2025-01-16",
  timezone: "UTC",
  usage: 550,
  usageUnit: "kWh",
  intervals,
  intervalsGive: "shape",
  ...over,
});

describe("interval data as shape only", () => {
  it("billed = metered: identical to pricing from the intervals, and exact", () => {
    const shaped = priceBill(TARIFF, req({ demandKw: 120 }));
    const fromIntervals = priceBill(TARIFF, req({ intervalsGive: "quantities" }));
    // Energy 85 × 0.30 + 465 × 0.10 = 25.50 + 46.50 = 72.00; delivery 550 × 0.02 = 11.00;
    // facility 120 kW × 10 = 1,200.00; peak demand: highest 15-minute in 12:00–14:00 = 12:00 → 120 kW × 5 = 600.00.
    expect(lineOf(shaped.lines, "Energy").amount).toBe(72);
    expect(shaped.total).toBe(10 + 72 + 11 + 1200 + 600);
    expect(shaped.total).toBe(fromIntervals.total);
    expect(shaped.exact).toBe(true);
  });

  it("billed usage 10 % above the meter: every energy line on the billed 605 kWh, split by the metered shares, marked estimated", () => {
    const bill = priceBill(TARIFF, req({ usage: 605, demandKw: 120 }));
    // peak 605 × 85/550 = 93.5 kWh × 0.30 = 28.05; off-peak 511.5 × 0.10 = 51.15 → 79.20
    expect(lineOf(bill.lines, "Energy").amount).toBe(79.2);
    expect(lineOf(bill.lines, "Energy").quantity).toBeCloseTo(605, 9);
    expect(lineOf(bill.lines, "Energy").status).toBe("estimated");
    // the flat line uses the same 605 kWh: never metered kWh on one line and billed on another
    expect(lineOf(bill.lines, "Delivery").amount).toBe(12.1);
    expect(bill.exact).toBe(false);
  });

  it("billed demand above the meter's peak: the bill's demand governs, period demand scaled to it", () => {
    const bill = priceBill(TARIFF, req({ demandKw: 150 }));
    // facility 150 kW × 10 = 1,500.00; peak period: 120 kW × 150/120 = 150 kW × 5 = 750.00 (estimated)
    expect(lineOf(bill.lines, "Facility demand").amount).toBe(1500);
    expect(lineOf(bill.lines, "Peak demand").amount).toBe(750);
    expect(lineOf(bill.lines, "Peak demand").status).toBe("estimated");
    expect(lineOf(bill.lines, "Facility demand").status).toBe("exact");
  });

  it("a printed demand that is the meter's reading rounded (120.04 vs 120) prices on the meter's figure", () => {
    // 0.04 / 120 = 0.033 % < 0.05 %: the same reading, so the precise metered 120 kW is used.
    const bill = priceBill(TARIFF, req({ demandKw: 120.04 }));
    expect(lineOf(bill.lines, "Facility demand").quantity).toBe(120);
    expect(bill.exact).toBe(true);
  });

  it("no billed demand: the meter's peak", () => {
    const bill = priceBill(TARIFF, req({ demandKw: null }));
    expect(lineOf(bill.lines, "Facility demand").quantity).toBe(120);
  });
});
