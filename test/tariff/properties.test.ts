/** Invariants of pricing, checked with fast-check over invented bills (fictional tariffs). */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { priceBill } from "../../src/tariff/price.ts";
import type { IntervalUsage } from "../../src/tariff/types.ts";
import { richTariff, tariffOf } from "./helpers.ts";
import { roundCents } from "../../src/core/money.ts";

const RICH = richTariff({ id: "lvp-rich", changeFrom: "2025-07-01", rider: true });

const day = (d: number) => new Date(Date.UTC(2024, 0, 1) + d * 86_400_000).toISOString().slice(0, 10);

describe("pricing invariants", () => {
  it("total = sum of the rounded lines, and every amount is whole cents", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 700 }),
        fc.integer({ min: 1, max: 60 }),
        fc.double({ min: 0, max: 1e6, noNaN: true }),
        fc.option(fc.double({ min: 0, max: 5000, noNaN: true })),
        fc.option(fc.double({ min: 0.3, max: 1, noNaN: true })),
        fc.array(fc.double({ min: 0, max: 5000, noNaN: true }), { maxLength: 14 }),
        (start, days, usage, demandKw, powerFactor, previousBillingDemandsKw) => {
          const bill = priceBill(RICH, {
            periodStart: day(start),
            periodEnd: day(start + days),
            timezone: "America/Chicago",
            usage,
            usageUnit: "kWh",
            demandKw,
            powerFactor,
            previousBillingDemandsKw,
          });
          const cents = bill.lines.reduce((s, l) => s + Math.round(l.amount * 100), 0);
          expect(Math.round(bill.total * 100)).toBe(cents);
          for (const l of bill.lines) expect(roundCents(l.amount)).toBe(l.amount);
          expect(bill.versions.reduce((s, v) => s + v.days, 0)).toBe(days);
          expect(bill.versions.reduce((s, v) => s + v.weight, 0)).toBeCloseTo(1, 12);
        },
      ),
      { numRuns: 200 },
    );
  });

  it("adding usage never lowers a block-priced bill (non-negative block rates)", () => {
    const blocks = tariffOf(`
id: lvp-blocks
commodity: gas
usage_unit: therm
versions:
  - from: 2024-01-01
    charges:
      - { label: Customer charge, fixed: 9.00 }
      - label: Distribution
        scale_blocks_by_days: true
        blocks: [{ up_to: 50, rate: 0.90 }, { up_to: 200, rate: 0.55 }, { rate: 0.30 }]
      - { label: Tax, percent: 6 }
    minimum_bill: 15
`);
    fc.assert(
      fc.property(fc.double({ min: 0, max: 1e5, noNaN: true }), fc.double({ min: 0, max: 1e4, noNaN: true }), fc.integer({ min: 25, max: 35 }), (u, extra, days) => {
        const req = { periodStart: "2024-03-01", periodEnd: day(60 + days), timezone: "UTC", usageUnit: "ccf" };
        const a = priceBill(blocks, { ...req, usage: u }).total;
        const b = priceBill(blocks, { ...req, usage: u + extra }).total;
        expect(b).toBeGreaterThanOrEqual(a);
      }),
      { numRuns: 300 },
    );
  });

  it("splitting a period into two bills under one version never changes energy charges (within one cent per bill of rounding)", () => {
    const FLAT = tariffOf(`
id: lvp-split
commodity: electricity
usage_unit: kWh
versions:
  - from: 2024-01-01
    periods:
      peak: { days: weekdays, hours: "14:00-19:00" }
      off-peak: {}
    charges:
      - { label: Flat energy, energy: 0.1234 }
      - { label: TOU energy, energy: { peak: 0.3, off-peak: 0.07 } }
`);
    const zone = "America/New_York";
    // Two weeks of hourly data from local midnight 2024-03-04 (EST, -05:00), across the DST change.
    const t0 = Date.parse("2024-03-04T05:00:00Z");
    fc.assert(
      fc.property(fc.array(fc.double({ min: 0, max: 50, noNaN: true }), { minLength: 335, maxLength: 335 }), fc.integer({ min: 1, max: 13 }), (values, cut) => {
        const intervals: IntervalUsage = {
          startMs: Float64Array.from(values, (_, i) => t0 + i * 3_600_000),
          values: Float64Array.from(values),
          intervalMinutes: 60,
        };
        const cutDate = new Date(Date.UTC(2024, 2, 4 + cut)).toISOString().slice(0, 10);
        const cutMs = Date.parse(`${cutDate}T00:00:00Z`) + (cut >= 7 ? 4 : 5) * 3_600_000; // local midnight is EDT from Mar 11 (the change is at 02:00 on Mar 10)
        const sumBetween = (a: number, b: number) => values.reduce((s, v, i) => (t0 + i * 3_600_000 >= a && t0 + i * 3_600_000 < b ? s + v : s), 0);
        const price = (from: string, to: string, a: number, b: number) =>
          priceBill(FLAT, { periodStart: from, periodEnd: to, timezone: zone, usage: sumBetween(a, b), usageUnit: "kWh", intervals });
        const endMs = t0 + 335 * 3_600_000;
        const whole = price("2024-03-04", "2024-03-18", t0, endMs);
        const first = price("2024-03-04", cutDate, t0, cutMs);
        const second = price(cutDate, "2024-03-18", cutMs, endMs);
        for (const label of ["Flat energy", "TOU energy"]) {
          const amt = (b: typeof whole) => b.lines.find((l) => l.label === label)!.amount;
          expect(Math.abs(amt(first) + amt(second) - amt(whole))).toBeLessThanOrEqual(0.01 + 1e-9);
        }
      }),
      { numRuns: 100 },
    );
  });

  it("a bill prices the same in any zone when the tariff has no time-of-use periods", () => {
    const flat = tariffOf(`
id: lvp-flat
commodity: electricity
usage_unit: kWh
versions:
  - from: 2024-01-01
    charges: [{ label: Energy, energy: 0.11 }, { label: Customer, fixed: 5 }]
`);
    fc.assert(
      fc.property(fc.double({ min: 0, max: 1e6, noNaN: true }), fc.constantFrom("UTC", "Pacific/Auckland", "America/St_Johns", "Asia/Kolkata"), (usage, zone) => {
        const r = { periodStart: "2024-05-01", periodEnd: "2024-06-01", usage, usageUnit: "kWh" };
        expect(priceBill(flat, { ...r, timezone: zone }).total).toBe(priceBill(flat, { ...r, timezone: "UTC" }).total);
      }),
    );
  });

  it("roundCents is within half a cent and rounds halves away from zero", () => {
    expect(roundCents(1.005)).toBe(1.01);
    expect(roundCents(140.625)).toBe(140.63);
    expect(roundCents(-2.345)).toBe(-2.35);
    expect(roundCents(0.004999)).toBe(0);
    // fast-check's counterexample to 12 significant digits of cleaning (large amounts lost a digit of cents)
    expect(roundCents(-421696373.68450004)).toBe(-421696373.68);
    fc.assert(fc.property(fc.double({ min: -1e9, max: 1e9, noNaN: true }), (x) => Math.abs(roundCents(x) - x) <= 0.005 + 1e-6));
  });
});
