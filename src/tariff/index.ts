/** The tariff engine: load a tariff file, price a bill. Pure computation, no I/O. */
export type * from "./types.ts";
export type * from "./model.ts";
export { loadTariff, MINIMUM_BILL_LABEL } from "./load.ts";
export { priceBill, versionsInForce } from "./price.ts";
export { pricingPlan, type PricingPlan, type PlanQuantities, type PlannedPrice } from "./plan.ts";
export { PricingError } from "./errors.ts";
export { unitFactor, canonicalUnit, UNITS_BY_COMMODITY } from "./units.ts";
export { maxWindowDemandKw, billingDemandKw } from "./demand.ts";

// Used by other folders (see test/architecture/layers.test.ts).
export type { Tariff } from "./model.ts";
export { billCheckState, intervalUsageForBill, priceMeterBills, pricingOrder, PRICING_FIELDS, samePricingFields } from "./priceMeterBills.ts";
export type { BillCheckState, PricedBill } from "./priceMeterBills.ts";
export type { ComputedBill, ComputedLine, IntervalUsage, LineStatus, PriceRequest } from "./types.ts";
export { yamlLimitProblem } from "./yaml-check.ts";
