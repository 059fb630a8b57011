/** The tariff engine: load a tariff file, price a bill. Pure computation, no I/O. */
export type * from "./types.ts";
export type * from "./model.ts";
export { loadTariff, MINIMUM_BILL_LABEL } from "./load.ts";
export { priceBill, versionsInForce } from "./price.ts";
export { PricingError } from "./errors.ts";
export { unitFactor, canonicalUnit, UNITS_BY_COMMODITY } from "./units.ts";
export { maxWindowDemandKw, billingDemandKw } from "./demand.ts";
