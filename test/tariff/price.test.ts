/**
 * Worked examples, one per charge kind. Every expected amount below is hand-computed and the
 * arithmetic is written next to it; rules come from docs/tariffs.md (the format).
 * All utilities and rates are fictional.
 */
import { describe, expect, it } from "vitest";
import { priceBill } from "../../src/tariff/price.ts";
import { PricingError } from "../../src/tariff/errors.ts";
import type { PriceRequest } from "../../src/tariff/types.ts";
import { intervalsFrom, lineOf, tariffOf } from "./helpers.ts";

const base = (over: Partial<PriceRequest>): PriceRequest => ({
  periodStart: "2025-01-01",
  periodEnd: "2025-02-01",
  timezone: "UTC",
  usage: 0,
  usageUnit: "kWh",
  ...over,
});

const SMALL = tariffOf(`
id: lvp-small
name: Larkspur Valley Power small general service
commodity: electricity
usage_unit: kWh
versions:
  - from: 2025-01-01
    charges:
      - label: Customer charge
        fixed: 12.75
      - label: Distribution
        blocks:
          - { up_to: 400, rate: 0.05 }
          - { up_to: 1000, rate: 0.04 }
          - { rate: 0.03 }
      - label: Energy
        energy: 0.1125
`);

describe("fixed, blocks and flat energy (hand-computed)", () => {
  it("1,250 kWh in January", () => {
    const bill = priceBill(SMALL, base({ usage: 1250 }));
    // Customer charge: 12.75
    expect(lineOf(bill.lines, "Customer charge").amount).toBe(12.75);
    // Distribution: 400 × 0.05 = 20.00; 600 × 0.04 = 24.00; 250 × 0.03 = 7.50; sum 51.50
    const dist = lineOf(bill.lines, "Distribution");
    expect(dist.amount).toBe(51.5);
    expect(dist.parts?.map((p) => p.quantity)).toEqual([400, 600, 250]);
    // Energy: 1,250 × 0.1125 = 140.625 -> half-up 140.63
    expect(lineOf(bill.lines, "Energy").amount).toBe(140.63);
    // Total: 12.75 + 51.50 + 140.63 = 204.88
    expect(bill.total).toBe(204.88);
    expect(bill.exact).toBe(true);
  });

  it("usage inside the first block prints the later blocks' absence, and zero usage still prints every line", () => {
    const bill = priceBill(SMALL, base({ usage: 0 }));
    expect(bill.lines.map((l) => [l.label, l.amount])).toEqual([
      ["Customer charge", 12.75],
      ["Distribution", 0],
      ["Energy", 0],
    ]);
  });

  it("usage in MWh is converted to the tariff's kWh", () => {
    // 1.25 MWh = 1,250 kWh -> same bill as above, 204.88
    expect(priceBill(SMALL, base({ usage: 1.25, usageUnit: "MWh" })).total).toBe(204.88);
  });

  it("scale_blocks_by_days multiplies block sizes by days / 30", () => {
    const t = tariffOf(`
id: lvp-scaled
commodity: electricity
usage_unit: kWh
versions:
  - from: 2025-01-01
    charges:
      - label: Distribution
        scale_blocks_by_days: true
        blocks:
          - { up_to: 400, rate: 0.05 }
          - { up_to: 1000, rate: 0.04 }
          - { rate: 0.03 }
`);
    // January: 31 days -> limits 400 × 31/30 = 413.333… and 1000 × 31/30 = 1033.333…
    // 413.333… × 0.05 = 20.666…; (1033.333… − 413.333…) = 620 × 0.04 = 24.80;
    // (1250 − 1033.333…) = 216.666… × 0.03 = 6.50; sum 51.9666… -> 51.97
    expect(priceBill(t, base({ usage: 1250 })).total).toBe(51.97);
  });
});

describe("units (hand-computed)", () => {
  it("water billed in ccf, priced per gallon", () => {
    const t = tariffOf(`
id: lvp-water
commodity: water
usage_unit: gal
versions:
  - from: 2025-01-01
    charges:
      - { label: Water, energy: 0.005 }
`);
    // 10 ccf × 748.052 gal/ccf = 7,480.52 gal × 0.005 = 37.4026 -> 37.40
    expect(priceBill(t, base({ usage: 10, usageUnit: "ccf" })).total).toBe(37.4);
  });

  it("gas billed in kWh and in m3, priced per therm", () => {
    const t = tariffOf(`
id: lvp-gas-units
commodity: gas
usage_unit: therm
versions:
  - from: 2025-01-01
    charges:
      - { label: Commodity, energy: 1.00 }
`);
    // 293.071 kWh / 29.3071 kWh per therm = 10 therm × 1.00 = 10.00
    expect(priceBill(t, base({ usage: 293.071, usageUnit: "kWh" })).total).toBe(10);
    // 100 m3 = 3,531.4667 ft3 = 35.314667 ccf × 1.037 (default heat content) = 36.6213 therm -> 36.62
    const bill = priceBill(t, base({ usage: 100, usageUnit: "m3" }));
    expect(bill.total).toBe(36.62);
    expect(bill.notes.join(" ")).toMatch(/heat content 1.037 therm\/ccf, the default/);
  });

  it("an impossible conversion is a PricingError, not a crash", () => {
    expect(() => priceBill(SMALL, base({ usage: 10, usageUnit: "therm" }))).toThrow(PricingError);
    expect(() => priceBill(SMALL, base({ usage: 10, usageUnit: "therm" }))).toThrow(/cannot convert therm to kWh/);
  });

  it("malformed request data is a PricingError with a reason", () => {
    expect(() => priceBill(SMALL, base({ usage: 1, timezone: "Mars/Olympus" }))).toThrow(/unknown time zone 'Mars\/Olympus'/);
    expect(() => priceBill(SMALL, base({ usage: 1, periodEnd: "2025-01-01" }))).toThrow(/ends \(2025-01-01\) on or before it starts/);
    expect(() => priceBill(SMALL, base({ usage: 1, loadShapeByHourOfWeek: [1, 2] }))).toThrow(/168 non-negative/);
    expect(() => priceBill(SMALL, base({ usage: 1, previousBillingDemandsKw: [Number.NaN] }))).toThrow(PricingError);
    expect(() => priceBill(SMALL, base({ usage: 1, powerFactor: 1.2 }))).toThrow(/outside 0 < pf <= 1/);
  });

  it("a bill before the first version is a PricingError", () => {
    expect(() => priceBill(SMALL, base({ periodStart: "2024-12-20", usage: 1 }))).toThrow(/no version of tariff 'lvp-small' is in force on 2024-12-20/);
  });
});

describe("percent lines and minimum bill on a gas tariff (hand-computed)", () => {
  const GAS = tariffOf(`
id: lvp-gas
commodity: gas
usage_unit: therm
heat_content: 1.02
versions:
  - from: 2025-01-01
    charges:
      - { label: Customer charge, fixed: 8.00 }
      - { label: Distribution, energy: 0.30 }
      - { label: Franchise fee, percent: 2, of: Distribution }
      - { label: Tax, percent: 5 }
    minimum_bill: 20.00
`);

  it("a small bill is raised to the minimum, then percent lines apply", () => {
    const bill = priceBill(GAS, base({ usage: 20, usageUnit: "ccf" }));
    // 20 ccf × 1.02 therm/ccf = 20.4 therm; Distribution 20.4 × 0.30 = 6.12
    // charges before percent lines 8.00 + 6.12 = 14.12 < 20.00 -> adjustment 5.88
    // Franchise fee 2 % of Distribution 6.12 = 0.1224 -> 0.12
    // Tax 5 % of all lines above: 8.00 + 6.12 + 5.88 + 0.12 = 20.12 -> 1.006 -> 1.01
    // Total 8.00 + 6.12 + 5.88 + 0.12 + 1.01 = 21.13
    expect(bill.lines.map((l) => [l.label, l.amount])).toEqual([
      ["Customer charge", 8],
      ["Distribution", 6.12],
      ["Minimum bill adjustment", 5.88],
      ["Franchise fee", 0.12],
      ["Tax", 1.01],
    ]);
    expect(bill.total).toBe(21.13);
  });

  it("a larger bill has no adjustment", () => {
    const bill = priceBill(GAS, base({ usage: 100, usageUnit: "ccf" }));
    // 102 therm × 0.30 = 30.60; 8.00 + 30.60 = 38.60 >= 20
    // Franchise 2 % × 30.60 = 0.612 -> 0.61; Tax 5 % × (8.00 + 30.60 + 0.61 = 39.21) = 1.9605 -> 1.96
    // Total 8.00 + 30.60 + 0.61 + 1.96 = 41.17
    expect(bill.lines.map((l) => l.label)).not.toContain("Minimum bill adjustment");
    expect(bill.total).toBe(41.17);
    expect(bill.notes.join(" ")).toMatch(/100 ccf converted to 102 therm \(heat content 1.02 therm\/ccf\)/);
  });
});

const DEMAND = (extra: string) =>
  tariffOf(`
id: lvp-demand
commodity: electricity
usage_unit: kWh
versions:
  - from: 2025-01-01
    charges:
      - label: Facility demand
        demand: 13.80
${extra}
      - label: Power factor adjustment
        power_factor: { target: 0.90 }
`);

describe("demand, ratchet, minimum kW and power factor (hand-computed)", () => {
  it("billed demand without interval data", () => {
    // 250 kW × 13.80 = 3,450.00; no power factor given -> adjustment 0
    const bill = priceBill(DEMAND(""), base({ usage: 50000, demandKw: 250 }));
    expect(lineOf(bill.lines, "Facility demand").amount).toBe(3450);
    expect(lineOf(bill.lines, "Power factor adjustment").amount).toBe(0);
    expect(bill.billingDemandKw).toBe(250);
  });

  it("ratchet: 80 % of the highest of the previous 11 billing demands", () => {
    const t = DEMAND("        ratchet: { percent: 80, months: 11 }");
    // Previous 12 bills, oldest first; only the last 11 count, so 700 (12 bills ago) is out.
    const previous = [700, 400, 420, 450, 380, 360, 390, 410, 500, 470, 440, 430];
    // highest of the last 11 = 500; 80 % × 500 = 400 kW > measured 300 kW
    // 400 kW × 13.80 = 5,520.00
    const bill = priceBill(t, base({ usage: 50000, demandKw: 300, previousBillingDemandsKw: previous }));
    expect(bill.billingDemandKw).toBe(400);
    expect(lineOf(bill.lines, "Facility demand").amount).toBe(5520);
    expect(lineOf(bill.lines, "Facility demand").note).toMatch(/ratchet/);
    // Measured above the ratchet: 450 kW × 13.80 = 6,210.00
    expect(priceBill(t, base({ usage: 1, demandKw: 450, previousBillingDemandsKw: previous })).total).toBe(6210);
  });

  it("minimum_kw", () => {
    // measured 6 kW < minimum 10 kW -> 10 × 13.80 = 138.00
    const bill = priceBill(DEMAND("        minimum_kw: 10"), base({ usage: 900, demandKw: 6 }));
    expect(bill.billingDemandKw).toBe(10);
    expect(bill.total).toBe(138);
  });

  it("power factor below target adds demand charges × (target / pf − 1)", () => {
    // 500 kW × 13.80 = 6,900.00; pf 0.80 < 0.90 -> 6,900.00 × (0.90/0.80 − 1) = 6,900 × 0.125 = 862.50
    // Cross-check with the kW form of the same rule (references: 500 kW at 0.80 -> 562.5 kW):
    // 62.5 extra kW × 13.80 = 862.50
    const bill = priceBill(DEMAND(""), base({ usage: 1, demandKw: 500, powerFactor: 0.8 }));
    expect(lineOf(bill.lines, "Power factor adjustment").amount).toBe(862.5);
    expect(bill.total).toBe(7762.5);
    // at or above target: no adjustment
    expect(lineOf(priceBill(DEMAND(""), base({ usage: 1, demandKw: 500, powerFactor: 0.95 })).lines, "Power factor adjustment").amount).toBe(0);
  });

  it("no demand and no intervals: marked, never silently exact", () => {
    const bill = priceBill(DEMAND(""), base({ usage: 1 }));
    expect(lineOf(bill.lines, "Facility demand").status).toBe("needs-interval-data");
    expect(bill.exact).toBe(false);
  });
});

describe("demand from 15-minute interval data (common practice: kW = kWh × 60 / minutes)", () => {
  // 2025-01-15 is a Wednesday. 96 intervals of 5 kWh (20 kW) except:
  // 11:45 and 12:00 = 30 kWh (120 kW each), 13:00 and 13:15 = 15 kWh (60 kW each).
  const values = new Array(96).fill(5);
  values[47] = 30; // 11:45
  values[48] = 30; // 12:00
  values[52] = 15; // 13:00
  values[53] = 15; // 13:15
  const intervals = intervalsFrom("2025-01-15T00:00:00Z", 15, values);
  const t = tariffOf(`
id: lvp-tou-demand
commodity: electricity
usage_unit: kWh
versions:
  - from: 2025-01-01
    periods:
      peak: { days: weekdays, hours: "12:00-14:00" }
      off-peak: {}
    charges:
      - { label: Facility demand, demand: 10.00, window_minutes: 30 }
      - { label: Peak demand, demand: { peak: 5.00 }, window_minutes: 30 }
`);
  const req = base({ periodStart: "2025-01-15", periodEnd: "2025-01-16", usage: 0, intervals });

  it("whole-period demand = highest 30-minute average; period demand only from windows inside the period", () => {
    const bill = priceBill(t, req);
    // Whole period: 11:45 + 12:00 = 60 kWh in 0.5 h = 120 kW × 10.00 = 1,200.00
    expect(lineOf(bill.lines, "Facility demand").quantity).toBe(120);
    expect(lineOf(bill.lines, "Facility demand").amount).toBe(1200);
    // Peak (12:00–14:00): the 11:45 window straddles the boundary and does not count.
    // Windows inside: 12:00+12:15 = (30 + 5) / 0.5 = 70 kW (highest); 13:00+13:15 = 60 kW.
    // 70 kW × 5.00 = 350.00
    expect(lineOf(bill.lines, "Peak demand").quantity).toBe(70);
    expect(lineOf(bill.lines, "Peak demand").amount).toBe(350);
    expect(bill.total).toBe(1550);
    expect(bill.exact).toBe(true);
  });

  it("without interval data the period demand is marked and uses the billed demand", () => {
    const bill = priceBill(t, base({ periodStart: "2025-01-15", periodEnd: "2025-01-16", usage: 0, demandKw: 120 }));
    const peak = lineOf(bill.lines, "Peak demand");
    expect(peak.status).toBe("needs-interval-data");
    expect(peak.amount).toBe(600); // 120 kW × 5.00, an upper bound
    expect(lineOf(bill.lines, "Facility demand").status).toBe("exact");
  });
});

describe("time-of-use energy, holidays and load-shape estimates (hand-computed)", () => {
  const TOU = tariffOf(`
id: lvp-tou
commodity: electricity
usage_unit: kWh
versions:
  - from: 2020-01-01
    holidays: us-federal
    periods:
      peak: { days: weekdays, hours: "12:00-18:00" }
      off-peak: {}
    charges:
      - { label: Energy, energy: { peak: 0.20, off-peak: 0.08 } }
`);
  const hourly48 = (startUtc: string) => intervalsFrom(startUtc, 60, new Array(48).fill(1));

  it("Friday 2026-07-03 is the observed Independence Day (Jul 4 is a Saturday): no peak hours", () => {
    // Thu Jul 2: 6 peak hours; Fri Jul 3 holiday: 0. Peak 6 kWh × 0.20 = 1.20; off-peak 42 × 0.08 = 3.36
    // Total 4.56 (it would be 12 × 0.20 + 36 × 0.08 = 5.28 without the holiday)
    const bill = priceBill(TOU, base({ periodStart: "2026-07-02", periodEnd: "2026-07-04", usage: 48, intervals: hourly48("2026-07-02T00:00:00Z") }));
    expect(bill.total).toBe(4.56);
  });

  it("Monday 2023-01-02 is the observed New Year's Day (Jan 1 is a Sunday)", () => {
    // Mon Jan 2 holiday: 0 peak; Tue Jan 3: 6 peak hours -> same arithmetic, 4.56
    const bill = priceBill(TOU, base({ periodStart: "2023-01-02", periodEnd: "2023-01-04", usage: 48, intervals: hourly48("2023-01-02T00:00:00Z") }));
    expect(bill.total).toBe(4.56);
  });

  it("a list of holiday dates works the same way", () => {
    const t = tariffOf(`
id: lvp-tou-list
commodity: electricity
usage_unit: kWh
versions:
  - from: 2020-01-01
    holidays: [2025-03-04]
    periods:
      peak: { days: weekdays, hours: "12:00-18:00" }
      off-peak: {}
    charges:
      - { label: Energy, energy: { peak: 0.20, off-peak: 0.08 } }
`);
    // Mon 2025-03-03 normal (6 peak hours), Tue 2025-03-04 listed holiday -> 4.56 as above
    expect(priceBill(t, base({ periodStart: "2025-03-03", periodEnd: "2025-03-05", usage: 48, intervals: hourly48("2025-03-03T00:00:00Z") })).total).toBe(4.56);
  });

  it("without interval data: split by hours and marked needs-interval-data", () => {
    // Week Mon 2025-01-06 .. Sun 2025-01-12 (no holiday): peak 5 days × 6 h = 30 h of 168.
    // 1,680 kWh -> peak 300 kWh × 0.20 = 60.00; off-peak 1,380 × 0.08 = 110.40; total 170.40
    const bill = priceBill(TOU, base({ periodStart: "2025-01-06", periodEnd: "2025-01-13", usage: 1680 }));
    const energy = lineOf(bill.lines, "Energy");
    expect(energy.status).toBe("needs-interval-data");
    expect(energy.note).toMatch(/needs interval data/);
    expect(energy.amount).toBe(170.4);
  });

  it("with a load shape: estimated, and said so", () => {
    // Shape weight 2 in the 30 weekday peak hours, 1 in the other 138 (then normalised):
    // peak share = 60 / 198; peak 1,680 × 60/198 = 509.0909 kWh × 0.20 = 101.8182
    // off-peak 1,680 × 138/198 = 1,170.9091 kWh × 0.08 = 93.6727; total 195.4909 -> 195.49
    const shape = new Array(168).fill(1);
    for (let d = 0; d < 5; d++) for (let h = 12; h < 18; h++) shape[d * 24 + h] = 2;
    const sum = shape.reduce((a, b) => a + b, 0);
    const bill = priceBill(TOU, base({ periodStart: "2025-01-06", periodEnd: "2025-01-13", usage: 1680, loadShapeByHourOfWeek: shape.map((x) => x / sum) }));
    const energy = lineOf(bill.lines, "Energy");
    expect(energy.status).toBe("estimated");
    expect(energy.note).toMatch(/estimated from the building's typical load shape/);
    expect(energy.amount).toBe(195.49);
  });

  it("seasons wrapping the year end select periods by month", () => {
    const t = tariffOf(`
id: lvp-seasonal
commodity: electricity
usage_unit: kWh
versions:
  - from: 2020-01-01
    seasons: { winter: Nov-Feb, rest: Mar-Oct }
    periods:
      winter-all: { season: winter }
      other: {}
    charges:
      - { label: Energy, energy: { winter-all: 0.15, other: 0.10 } }
`);
    // 2024-12-31 (winter) and 2025-01-01 (winter wraps into January): 48 h × 1 kWh × 0.15 = 7.20
    expect(priceBill(t, base({ periodStart: "2024-12-31", periodEnd: "2025-01-02", usage: 48, intervals: hourly48("2024-12-31T00:00:00Z") })).total).toBe(7.2);
    // 2025-02-28 (winter) + 2025-03-01 (rest): 24 × 0.15 + 24 × 0.10 = 3.60 + 2.40 = 6.00
    expect(priceBill(t, base({ periodStart: "2025-02-28", periodEnd: "2025-03-02", usage: 48, intervals: hourly48("2025-02-28T00:00:00Z") })).total).toBe(6);
  });
});

describe("proration across versions (hand-computed)", () => {
  const t = tariffOf(`
id: lvp-prorate
commodity: electricity
usage_unit: kWh
versions:
  - from: 2025-01-01
    charges:
      - { label: Customer charge, fixed: 10.00 }
      - { label: Energy, energy: 0.10 }
  - from: 2025-02-15
    inherit: true
    charges_override:
      - { label: Energy, energy: 0.13 }
      - { label: Storm recovery, fixed: 3.10 }
`);

  it("each version priced in full, weighted by its share of days", () => {
    // 2025-02-05 .. 2025-03-07 = 30 days: Feb 5–14 = 10 days old, Feb 15–Mar 6 = 20 days new.
    // Energy: 1,000 × 0.10 × 10/30 + 1,000 × 0.13 × 20/30 = 33.333… + 86.666… = 120.00
    // Customer charge: 10.00 in both versions -> 10.00
    // Storm recovery: only in the new version: 3.10 × 20/30 = 2.0666… -> 2.07
    // Total 10.00 + 120.00 + 2.07 = 132.07
    const bill = priceBill(t, base({ periodStart: "2025-02-05", periodEnd: "2025-03-07", usage: 1000 }));
    expect(bill.versions).toEqual([
      { from: "2025-01-01", days: 10, weight: 10 / 30 },
      { from: "2025-02-15", days: 20, weight: 20 / 30 },
    ]);
    expect(bill.lines.map((l) => [l.label, l.amount])).toEqual([
      ["Customer charge", 10],
      ["Energy", 120],
      ["Storm recovery", 2.07],
    ]);
    expect(bill.total).toBe(132.07);
    expect(lineOf(bill.lines, "Energy").note).toMatch(/prorated by days/);
  });

  it("a bill wholly inside one version is not prorated", () => {
    const bill = priceBill(t, base({ periodStart: "2025-03-01", periodEnd: "2025-04-01", usage: 1000 }));
    // 10.00 + 1,000 × 0.13 + 3.10 = 143.10
    expect(bill.total).toBe(143.1);
    expect(bill.versions).toHaveLength(1);
  });
});
