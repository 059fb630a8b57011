/**
 * Prices one forecast month of one meter as a bill whose period is the calendar month, through
 * the tariff version(s) in force (the engine prorates a month that straddles a version change),
 * then applies the escalation factor for months after the last version (escalation.ts).
 *
 * What the engine gets besides usage:
 *   - interval meters with a month shape: the shape scaled to the usage (exact TOU and demand);
 *   - otherwise measured demand = usage per day × the meter's kW per (unit per day), averaged
 *     over its bills of the same calendar month (all bills when that month has none), and the
 *     building's hour-of-week load shape for time-of-use splits (lines marked estimated);
 *   - power factor: mean of the meter's last 12 bills that print one;
 *   - ratchets: the billing demands of the meter's recent bills, then of the scenario's own
 *     earlier forecast months.
 */
import type { Tariff } from "../tariff/index.ts";
import { pricingPlan, type PricingPlan } from "../tariff/index.ts";
import { scaleShape, type MonthShape } from "./profile.ts";
import { type CalendarMonth } from "../core/time/index.ts";

export interface MonthPricingContext {
  tariff: Tariff;
  timezone: string;
  /** Meter's usage unit (bills). */
  usageUnit: string;
  month: CalendarMonth;
  shape: MonthShape | null;
  loadShapeByHourOfWeek: number[] | null;
  /** kW of measured demand per (usage unit per day); null when bills print no demand. */
  kwPerUsePerDay: number | null;
  powerFactor: number | null;
  escalationFactor: number;
}

export interface PricedMonth {
  /** Priced total × escalation factor, currency. */
  cost: number;
  billingDemandKw: number | null;
  /** True when every line was exact (interval-priced or no time-of-use split needed). */
  exact: boolean;
}

/*
 * One pricing plan per context (tariff × month × meter), made on the first price and reused by
 * every scenario; weakly held, so it goes when the context does.
 */
const plans = new WeakMap<MonthPricingContext, { plan: PricingPlan; readings: Float64Array | null }>();

/** The context's plan, and a buffer for its scaled shape (the engine keeps nothing of the readings priced). */
function planOf(ctx: MonthPricingContext): { plan: PricingPlan; readings: Float64Array | null } {
  let entry = plans.get(ctx);
  if (entry === undefined) {
    const plan = pricingPlan(ctx.tariff, {
      periodStart: ctx.month.start,
      periodEnd: ctx.month.end,
      timezone: ctx.timezone,
      usageUnit: ctx.usageUnit,
      powerFactor: ctx.powerFactor,
      loadShapeByHourOfWeek: ctx.shape ? null : ctx.loadShapeByHourOfWeek,
    });
    entry = { plan, readings: ctx.shape ? new Float64Array(ctx.shape.values.length) : null };
    plans.set(ctx, entry);
  }
  return entry;
}

/**
 * Prices `usage` (meter unit) for the context's month: the total priceBill gives, through the
 * context's pricing plan (tariff/plan.ts). @throws PricingError from the engine.
 */
export function priceForecastMonth(ctx: MonthPricingContext, usage: number, previousBillingDemandsKw: number[]): PricedMonth {
  const { month } = ctx;
  const { plan, readings } = planOf(ctx);
  const bill = plan.price({
    usage,
    demandKw: ctx.shape || ctx.kwPerUsePerDay === null ? null : (ctx.kwPerUsePerDay * usage) / month.days,
    intervals: ctx.shape ? scaleShape(ctx.shape, usage, readings ?? undefined) : null,
    previousBillingDemandsKw,
  });
  return { cost: bill.total * ctx.escalationFactor, billingDemandKw: bill.billingDemandKw, exact: bill.exact };
}
