/**
 * Time-of-use periods across U.S. DST changes (15 U.S.C. 260a: 2:00 local on the second Sunday
 * of March and the first Sunday of November). 2024-03-10 has 23 hours (92 fifteen-minute
 * intervals) and 2024-11-03 has 25 (100 intervals) in America/New_York. Amounts hand-computed.
 */
import { describe, expect, it } from "vitest";
import { priceBill } from "../../src/tariff/price.ts";
import { intervalsFrom, lineOf, tariffOf } from "./helpers.ts";

const T = tariffOf(`
id: lvp-dst
commodity: electricity
usage_unit: kWh
versions:
  - from: 2024-01-01
    periods:
      early: { hours: "00:00-03:00" }
      rest: {}
    charges:
      - { label: Energy, energy: { early: 0.30, rest: 0.10 } }
      - { label: Demand, demand: 2.00 }
`);

const req = (start: string, end: string, startUtc: string, n: number) => ({
  periodStart: start,
  periodEnd: end,
  timezone: "America/New_York",
  usage: n,
  usageUnit: "kWh",
  intervals: intervalsFrom(startUtc, 15, new Array(n).fill(1)),
});

describe("DST days", () => {
  it("spring forward: 92 intervals, the 02:00 hour does not exist", () => {
    // Local midnight 2024-03-10 EST = 05:00Z. 1 kWh per interval.
    // early 00:00–03:00 holds only 00:00–02:00 local = 8 intervals: 8 × 0.30 = 2.40
    // rest 03:00–24:00 = 21 h = 84 intervals: 84 × 0.10 = 8.40
    // Demand: 1 kWh / 15 min = 4 kW × 2.00 = 8.00. Total 2.40 + 8.40 + 8.00 = 18.80
    const bill = priceBill(T, req("2024-03-10", "2024-03-11", "2024-03-10T05:00:00Z", 92));
    const energy = lineOf(bill.lines, "Energy");
    expect(energy.parts?.map((p) => p.quantity)).toEqual([8, 84]);
    expect(energy.amount).toBe(10.8);
    expect(energy.status).toBe("exact");
    expect(bill.total).toBe(18.8);
  });

  it("fall back: 100 intervals, the 01:00 hour happens twice", () => {
    // Local midnight 2024-11-03 EDT = 04:00Z.
    // early: 00:00–01:00, 01:00–02:00 (EDT), 01:00–02:00 (EST), 02:00–03:00 = 16 intervals × 0.30 = 4.80
    // rest: 03:00–24:00 = 84 intervals × 0.10 = 8.40; demand 8.00. Total 21.20
    const bill = priceBill(T, req("2024-11-03", "2024-11-04", "2024-11-03T04:00:00Z", 100));
    expect(lineOf(bill.lines, "Energy").parts?.map((p) => p.quantity)).toEqual([16, 84]);
    expect(bill.total).toBe(21.2);
    expect(bill.exact).toBe(true);
  });

  it("an interval after the local day ends belongs to the next bill", () => {
    // 101 intervals from 04:00Z: the 101st starts at local midnight of Nov 4 and is not in the bill.
    const r = req("2024-11-03", "2024-11-04", "2024-11-03T04:00:00Z", 101);
    expect(lineOf(priceBill(T, r).lines, "Energy").quantity).toBe(100);
  });
});
