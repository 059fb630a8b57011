import { OhmbookError } from "../core/errors.ts";

/**
 * A request the engine cannot price: no tariff version in force for the bill's days, a usage
 * unit that cannot be converted to the tariff's unit, interval data that does not fit a demand
 * window. A valid tariff file never causes it by itself.
 */
export class PricingError extends OhmbookError {}
