/**
 * Shared by the meter checks' tests (usage-vs-meter, demand-vs-meter, multiplier-suspect):
 * a re-pricing stub of 0.15 per kWh + 10.00 per kW, its bill total, and an audit context with
 * a metered period per bill.
 */
import { buildContext } from "../../../src/audit/context.ts";
import type { Bill } from "../../../src/domain/types.ts";
import type { MeteredPeriod, RepriceFn } from "../../../src/audit/types.ts";
import { computed, input, portfolio } from "../fixtures.ts";

export const reprice: RepriceFn = (_b, alt) =>
  alt.kind === "quantities" ? computed([["Energy", alt.usage * 0.15], ["Demand", (alt.demandKw ?? 0) * 10]]) : null;

/** The stub's bill total, rounded to the cent. */
export const price = (usage: number, kw: number | null) => Math.round((usage * 0.15 + (kw ?? 0) * 10) * 100) / 100;

export function ctxFor(bills: Bill[], m: (b: Bill, i: number) => MeteredPeriod | null, withReprice = true) {
  return buildContext(input(portfolio({ bills }), {
    metered: new Map(bills.map((b, i) => [b.billId, m(b, i)])),
    reprice: withReprice ? reprice : undefined,
  }));
}
