/**
 * The audit's re-pricing hook: prices a bill with corrected quantities (metered usage/demand)
 * or under another tariff or tariff version, through the same engine that priced it first.
 */
import type { Bill, Portfolio } from "../domain/types.ts";
import type { RepriceFn } from "../audit/types.ts";
import { priceBill, type Tariff } from "../tariff/index.ts";
import { intervalsForPeriod } from "./priceBills.ts";

/** Ratchets look back over this many earlier bills at most (the longest ratchet in common use). */
const RATCHET_LOOKBACK = 12;

/**
 * Builds a RepriceFn over `portfolio`. Earlier billing demands for ratchets are approximated
 * by the measured demands printed on the meter's earlier bills (the audit compares totals
 * under alternatives, so the same approximation applies to every alternative alike).
 */
export function makeRepricer(portfolio: Portfolio<Tariff>): RepriceFn {
  const meters = new Map(portfolio.meters.map((m) => [m.meterId, m]));
  const buildings = new Map(portfolio.buildings.map((b) => [b.buildingId, b]));
  return (bill: Bill, alternative) => {
    const meter = meters.get(bill.meterId);
    const building = meter ? buildings.get(meter.buildingId) : undefined;
    if (!meter || !building) return null;
    let tariff = portfolio.tariffs.get(meter.tariffId);
    let usage = bill.usage;
    let demandKw = bill.demandKw;
    if (alternative.kind === "quantities") {
      usage = alternative.usage;
      demandKw = alternative.demandKw;
    } else {
      tariff = portfolio.tariffs.get(alternative.tariffId);
      if (tariff && alternative.versionFrom !== null) tariff = pinVersion(tariff, alternative.versionFrom) ?? undefined;
    }
    if (!tariff) return null;
    const previous = portfolio.bills
      .filter((b) => b.meterId === bill.meterId && b.periodEnd <= bill.periodStart && b.demandKw !== null)
      .sort((a, b) => a.periodStart.localeCompare(b.periodStart))
      .slice(-RATCHET_LOOKBACK)
      .map((b) => b.demandKw!);
    try {
      return priceBill(tariff, {
        periodStart: bill.periodStart,
        periodEnd: bill.periodEnd,
        timezone: building.timezone,
        usage,
        usageUnit: meter.unit,
        demandKw,
        powerFactor: bill.powerFactor,
        intervals: intervalsForPeriod(portfolio.intervals.get(meter.meterId), meter.multiplier, bill.periodStart, bill.periodEnd, building.timezone),
        previousBillingDemandsKw: previous,
      });
    } catch {
      return null; // the alternative cannot price this bill (unit, commodity, no version): not a candidate
    }
  };
}

/** The tariff with only the version starting `from`, in force for all time. */
function pinVersion(tariff: Tariff, from: string): Tariff | null {
  const version = tariff.versions.find((v) => v.from === from);
  if (!version) return null;
  return { ...tariff, versions: [{ ...version, from: "0001-01-01", until: null }] };
}
