/**
 * A pricing plan gives exactly priceBill's total, billing demand and exactness (fast-check over
 * invented bills on a fictional tariff with blocks, time-of-use energy and demand, a ratchet, a
 * power-factor adjustment, a percent tax, a minimum bill and a mid-year version change).
 */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { priceBill } from "../../src/tariff/price.ts";
import { pricingPlan } from "../../src/tariff/plan.ts";
import type { PriceRequest } from "../../src/tariff/types.ts";
import { richTariff } from "./helpers.ts";

const RICH = richTariff({ id: "plan-rich", changeFrom: "2024-07-15" });

const day = (d: number) => new Date(Date.UTC(2024, 0, 1) + d * 86_400_000).toISOString().slice(0, 10);
const ZONE = "America/Chicago";

/** 15-minute readings over the period with a repeating daily shape (kWh). */
function intervalsOver(start: string, end: string, scale: number) {
  const t0 = Date.parse(`${start}T06:00:00Z`);
  const n = Math.round((Date.parse(`${end}T06:00:00Z`) - t0) / 900_000);
  const startMs = Float64Array.from({ length: n }, (_, i) => t0 + i * 900_000);
  const values = Float64Array.from({ length: n }, (_, i) => scale * (1 + Math.sin((i % 96) / 15) ** 2));
  return { startMs, values, intervalMinutes: 15 };
}

const SHAPE = Array.from({ length: 168 }, (_, h) => 1 + ((h % 24) >= 9 && (h % 24) < 18 ? 2 : 0));

describe("pricingPlan", () => {
  it("prices like priceBill: same total, billing demand and exactness, whatever the quantities", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 330 }),
        fc.integer({ min: 20, max: 40 }),
        fc.array(fc.double({ min: 0, max: 1e5, noNaN: true }), { minLength: 1, maxLength: 5 }),
        fc.option(fc.double({ min: 0, max: 5000, noNaN: true })),
        fc.option(fc.double({ min: 0.3, max: 1, noNaN: true })),
        fc.array(fc.double({ min: 0, max: 5000, noNaN: true }), { maxLength: 14 }),
        fc.constantFrom("none", "shape", "intervals"),
        (start, days, usages, demandKw, powerFactor, previousBillingDemandsKw, source) => {
          const fixed = {
            periodStart: day(start),
            periodEnd: day(start + days),
            timezone: ZONE,
            usageUnit: "kWh",
            powerFactor,
            loadShapeByHourOfWeek: source === "shape" ? SHAPE : null,
          };
          const plan = pricingPlan(RICH, fixed);
          for (const usage of usages) {
            const intervals = source === "intervals" ? intervalsOver(fixed.periodStart, fixed.periodEnd, usage / 5000) : null;
            const req: PriceRequest = { ...fixed, usage, demandKw, intervals, previousBillingDemandsKw };
            const bill = priceBill(RICH, req);
            const planned = plan.price({ usage, demandKw, intervals, previousBillingDemandsKw });
            expect(planned).toEqual({ total: bill.total, billingDemandKw: bill.billingDemandKw, exact: bill.exact });
          }
        },
      ),
      { numRuns: 150 },
    );
  });

  it("throws what priceBill throws, for the fixed part when made and for the quantities when priced", () => {
    expect(() => pricingPlan(RICH, { periodStart: "2024-02-30", periodEnd: "2024-03-01", timezone: ZONE, usageUnit: "kWh" })).toThrow(/dates must be YYYY-MM-DD/);
    expect(() => pricingPlan(RICH, { periodStart: "2023-12-01", periodEnd: "2024-01-01", timezone: ZONE, usageUnit: "kWh" })).toThrow(/no version/);
    const plan = pricingPlan(RICH, { periodStart: "2024-03-01", periodEnd: "2024-04-01", timezone: ZONE, usageUnit: "kWh" });
    expect(() => plan.price({ usage: NaN })).toThrow(/not a number/);
    expect(() => plan.price({ usage: 10, demandKw: -1 })).toThrow(/non-negative/);
  });
});
