/**
 * A pricing plan: one tariff, one billing period, priced many times with different quantities
 * (a forecast prices each month once per scenario, 300 times). What does not depend on the
 * quantities is checked and prepared once — the dates, zone and unit, the versions in force and
 * their weights, the hours with their local times and load-shape weights, the time-of-use
 * shares of those hours — and no lines are made, only their amounts (plan-totals.ts). Each price is the
 * same total, billing demand and exactness as `priceBill` with the same request
 * (test/tariff/plan.test.ts).
 */
import type { PriceRequest } from "./types.ts";
import type { Tariff } from "./model.ts";
import { billContext, billFrame, checkLoadShape, type FrameRequest } from "./context.ts";
import { priceInContext, versionsInForce } from "./price.ts";
import { plannedTotals, prepareVersions } from "./plan-totals.ts";

/** The quantities that change from one price of a plan to the next. */
export type PlanQuantities = Pick<PriceRequest, "usage" | "demandKw" | "intervals" | "previousBillingDemandsKw">;

/** What a plan's price gives: priceBill's total, billing demand and exactness. */
export interface PlannedPrice {
  total: number;
  billingDemandKw: number | null;
  exact: boolean;
}

export interface PricingPlan {
  /** @throws PricingError as priceBill does for these quantities (a non-finite usage, a negative demand, malformed intervals). */
  price(quantities: PlanQuantities): PlannedPrice;
}

/**
 * Prepares the plan of `tariff` over the request's period.
 * @throws PricingError as priceBill does for the fixed part (dates, zone, unit, power factor,
 *   load shape, no version in force).
 * @example pricingPlan(tariff, { periodStart: "2026-01-01", periodEnd: "2026-02-01", timezone: "UTC", usageUnit: "kWh" }).price({ usage: 1200 }).total
 */
export function pricingPlan(tariff: Tariff, fixed: FrameRequest & Pick<PriceRequest, "intervalsGive">): PricingPlan {
  const frame = billFrame(tariff, fixed);
  checkLoadShape(fixed.loadShapeByHourOfWeek);
  const inForce = versionsInForce(tariff, fixed.periodStart, fixed.periodEnd);
  // Totals without lines (plan-totals.ts), except where interval data give only the shape.
  const prepared = fixed.intervalsGive === "shape" ? null : prepareVersions(inForce);
  return {
    price(quantities) {
      const req: PriceRequest = {
        periodStart: fixed.periodStart,
        periodEnd: fixed.periodEnd,
        timezone: fixed.timezone,
        usageUnit: fixed.usageUnit,
        powerFactor: fixed.powerFactor,
        loadShapeByHourOfWeek: fixed.loadShapeByHourOfWeek,
        intervalsGive: fixed.intervalsGive,
        usage: quantities.usage,
        demandKw: quantities.demandKw,
        intervals: quantities.intervals,
        previousBillingDemandsKw: quantities.previousBillingDemandsKw,
      };
      const ctx = billContext(tariff, req, frame, false);
      if (prepared !== null) return plannedTotals(ctx, prepared);
      const bill = priceInContext(ctx, inForce);
      return { total: bill.total, billingDemandKw: bill.billingDemandKw, exact: bill.exact };
    },
  };
}
