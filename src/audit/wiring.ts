/**
 * Helpers for the caller that wires the tariff engine into the audit. The engine's price
 * function is PASSED IN (never imported here), so the audit stays independent of pricing.
 *
 *   const { reprice, rateAlternatives } = makeRepricer({ portfolio, priced, price: priceBill });
 *   runAudit({ portfolio, priced, metered, reprice, rateAlternatives });
 */
import type { Bill, IntervalSeries, Meter, Portfolio } from "../domain/types.ts";
import type { Tariff } from "../tariff/index.ts";
import type { ComputedBill, PriceRequest } from "../tariff/index.ts";
import { intervalUsageForBill } from "../tariff/index.ts";
import { sortBills } from "./context.ts";
import type { RepriceAlternative, RepriceFn } from "./types.ts";
import { expectedProblem } from "../core/errors.ts";

type RateAlternative = Extract<RepriceAlternative, { kind: "rate" }>;

/** The tariff with only `versionFrom`'s version, in force for any date (for "priced on the wrong version"). */
export function pinVersion(tariff: Tariff, versionFrom: string): Tariff | null {
  const v = tariff.versions.find((x) => x.from === versionFrom);
  return v ? { ...tariff, versions: [{ ...v, from: "0001-01-01", until: null }] } : null;
}

/**
 * Builds the audit's `reprice` and `rateAlternatives` hooks from the engine's price function.
 * - quantities: the bill re-priced with other usage/demand (demand null = the meter's peak), the
 *   interval data only splitting them over time-of-use periods, same ratchet history (billing
 *   demands of the meter's earlier bills, from `priced`);
 * - rate: another tariff of the same commodity, or one version of the meter's own tariff
 *   applied to the whole period, on the billed quantities. Alternatives: every version of the own tariff, then every other
 *   tariff of the meter's commodity.
 * Any pricing error yields null (the audit then just has no amount / no alternative).
 * `meteredIntervals` (per meter; default the portfolio's own) is the series the quantities
 * alternative reads: the cleaned view, so a corrected bill never rests on a flagged reading.
 * Rate alternatives keep the portfolio's series (they re-price the billed quantities).
 */
export function makeRepricer(opts: {
  portfolio: Portfolio<Tariff>;
  priced: Map<string, ComputedBill | null>;
  price: (tariff: Tariff, request: PriceRequest) => ComputedBill;
  minCoverage?: number;
  meteredIntervals?: ReadonlyMap<string, IntervalSeries>;
}): { reprice: RepriceFn; rateAlternatives: (bill: Bill, meter: Meter) => RateAlternative[] } {
  const { portfolio, priced, price } = opts;
  const meters = new Map(portfolio.meters.map((m) => [m.meterId, m]));
  const zones = new Map(portfolio.buildings.map((b) => [b.buildingId, b.timezone]));
  const earlierDemands = new Map<string, number[]>();
  const byMeter = new Map<string, Bill[]>();
  for (const b of portfolio.bills) {
    const list = byMeter.get(b.meterId);
    if (list) list.push(b);
    else byMeter.set(b.meterId, [b]);
  }
  for (const bills of byMeter.values()) {
    const demands: number[] = [];
    for (const b of sortBills(bills)) {
      earlierDemands.set(b.billId, [...demands]);
      const kw = priced.get(b.billId)?.billingDemandKw;
      if (kw !== null && kw !== undefined) demands.push(kw);
    }
  }

  const reprice: RepriceFn = (bill, alt) => {
    const meter = meters.get(bill.meterId);
    const zone = meter ? zones.get(meter.buildingId) : undefined;
    if (!meter || !zone) return null;
    let tariff: Tariff | null | undefined = portfolio.tariffs.get(alt.kind === "rate" ? alt.tariffId : meter.tariffId);
    if (tariff && alt.kind === "rate" && alt.versionFrom !== null) tariff = pinVersion(tariff, alt.versionFrom);
    if (!tariff) return null;
    try {
      return price(tariff, {
        periodStart: bill.periodStart,
        periodEnd: bill.periodEnd,
        timezone: zone,
        usage: alt.kind === "quantities" ? alt.usage : bill.usage,
        usageUnit: meter.unit,
        demandKw: alt.kind === "quantities" ? alt.demandKw : bill.demandKw,
        powerFactor: bill.powerFactor,
        intervals: intervalUsageForBill(
          (alt.kind === "quantities" ? opts.meteredIntervals?.get(bill.meterId) : undefined) ?? portfolio.intervals.get(bill.meterId),
          meter.multiplier, bill, zone, opts.minCoverage),
        // The stated quantities are the bill's (or the corrected ones); interval data only splits them.
        intervalsGive: "shape",
        previousBillingDemandsKw: earlierDemands.get(bill.billId) ?? [],
      });
    } catch (error) {
      expectedProblem(error);
      return null;
    }
  };

  const rateAlternatives = (_bill: Bill, meter: Meter): RateAlternative[] => {
    const own = portfolio.tariffs.get(meter.tariffId);
    const out: RateAlternative[] = [];
    for (const v of own?.versions ?? []) {
      out.push({ kind: "rate", tariffId: meter.tariffId, versionFrom: v.from, label: `the ${v.from} version of tariff ${meter.tariffId}` });
    }
    for (const [id, t] of portfolio.tariffs) {
      if (id !== meter.tariffId && t.commodity === meter.commodity) out.push({ kind: "rate", tariffId: id, versionFrom: null, label: `tariff ${id}` });
    }
    return out;
  };

  return { reprice, rateAlternatives };
}
