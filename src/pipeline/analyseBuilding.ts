/**
 * One building's analysis — price every bill, reconcile with interval data, audit, fit the
 * weather and hourly baselines — as a pure function of the portfolio, so it runs in a worker
 * thread (analysisPool.ts) as well as in the main one.
 */
import { expectedProblem } from "../core/errors.ts";
import type { Building, IntervalSeries, Meter, Portfolio } from "../domain/types.ts";
import { withFlaggedAsMissing } from "../clean/index.ts";
import type { Tariff } from "../tariff/index.ts";
import { priceBill, priceMeterBills, type PricedBill } from "../tariff/index.ts";
import { runAudit, meteredForBills, makeRepricer, type Finding } from "../audit/index.ts";
import { buildingDegreeDayBands, expectedUsageForStretch, fitBuildingBaselines, fitBuildingIntervalBaselines, type MeterBaseline } from "../model/index.ts";
import type { BuildingResults } from "../report/index.ts";

/**
 * A bug at a per-building boundary: rethrown (`fail`), or reported as one line and turned into
 * the failure text the pages show (`report`).
 */
export type BugHandler = (error: unknown) => string;
export const rethrow: BugHandler = (error) => {
  throw error;
};

/** An expected problem's message, or what the bug policy makes of anything else. */
export function problemOrBug(error: unknown, onBug: BugHandler): string {
  try {
    return expectedProblem(error);
  } catch (bug) {
    return onBug(bug);
  }
}

/**
 * Prices, reconciles, audits and models one building. An expected problem (an OhmbookError) is
 * caught and becomes the building's failure; a bug goes to `onBug` (by default rethrown).
 */
export function analyseBuilding(portfolio: Portfolio<Tariff>, building: Building, masks: ReadonlyMap<string, Uint8Array> = new Map(), onBug: BugHandler = rethrow): BuildingResults {
  const empty: BuildingResults = { building, priced: new Map(), findings: [], baselines: [], intervalBaselines: [], failure: null };
  try {
    const meters = portfolio.meters.filter((m) => m.buildingId === building.buildingId);
    // Money never rests on a flagged reading: metered quantities read the cleaned view.
    const cleaned = cleanedIntervals(portfolio, meters, masks);
    const priced = new Map<string, PricedBill>();
    for (const meter of meters) {
      const tariff = portfolio.tariffs.get(meter.tariffId);
      const bills = portfolio.bills.filter((b) => b.meterId === meter.meterId);
      const meterPriced = priceMeterBills({
        meter,
        bills,
        timezone: building.timezone,
        series: portfolio.intervals.get(meter.meterId),
        meteredSeries: cleaned.get(meter.meterId),
        price: tariff ? (request) => priceBill(tariff, request) : null,
        pricerError: `tariff '${meter.tariffId}' could not be loaded (see the tariff file's errors)`,
      });
      for (const [id, p] of meterPriced) priced.set(id, p);
    }
    const scoped = scopeToBuilding(portfolio, building);
    const metered = meteredForBills(scoped, (meter) => demandWindowMinutes(portfolio.tariffs.get(meter.tariffId)), masks);
    const bands = buildingDegreeDayBands(portfolio, building);
    for (const [id, m] of metered) {
      const p = priced.get(id);
      if (p && m && m.peakKw !== null && p.metered) p.meteredDemandKw = m.peakKw;
    }
    const computed = new Map([...priced].map(([id, p]) => [id, p.computed]));
    const findings = runAudit({
      portfolio: { ...scoped, intervals: new Map([...scoped.intervals].map(([id, s]) => [id, cleaned.get(id) ?? s])) },
      priced: computed,
      metered,
      ...makeRepricer({ portfolio: scoped, priced: computed, price: priceBill, meteredIntervals: cleaned }),
      expectedUsage: expectedUsageFromBands(bands),
      expectedUsageForPeriod: expectedUsageForStretch(scoped, building),
    });
    const baselines = fitBuildingBaselines(portfolio, building, billsToLeaveOut(findings), bands);
    const intervalBaselines = fitBuildingIntervalBaselines(portfolio, building, masks);
    return { building, priced, findings, baselines, intervalBaselines, failure: null };
  } catch (error) {
    return { ...empty, failure: problemOrBug(error, onBug) };
  }
}

/** The building's interval series with flagged readings as NaN (`withFlaggedAsMissing`). */
function cleanedIntervals(portfolio: Portfolio<Tariff>, meters: readonly Meter[], masks: ReadonlyMap<string, Uint8Array>): Map<string, IntervalSeries> {
  const out = new Map<string, IntervalSeries>();
  for (const m of meters) {
    const series = portfolio.intervals.get(m.meterId);
    if (series) out.set(m.meterId, withFlaggedAsMissing(series, masks.get(m.meterId)));
  }
  return out;
}

function scopeToBuilding(portfolio: Portfolio<Tariff>, building: Building): Portfolio<Tariff> {
  const meters = portfolio.meters.filter((m) => m.buildingId === building.buildingId);
  const ids = new Set(meters.map((m) => m.meterId));
  const bills = portfolio.bills.filter((b) => ids.has(b.meterId));
  const billIds = new Set(bills.map((b) => b.billId));
  return {
    ...portfolio,
    buildings: [building],
    meters,
    bills,
    billLines: portfolio.billLines.filter((l) => billIds.has(l.billId)),
  };
}

/** The degree-day models' leave-one-out bands, by bill id (meters without a model fall back to the audit's interim rule). */
function expectedUsageFromBands(bands: ReadonlyMap<string, Pick<MeterBaseline, "expectedByBill">>): Map<string, { p50: number; low: number; high: number }> {
  const map = new Map<string, { p50: number; low: number; high: number }>();
  for (const b of bands.values()) for (const [billId, e] of b.expectedByBill) map.set(billId, e);
  return map;
}

/** Findings whose bill's usage is wrong or not the building's own, so it must not train a weather model. */
const USAGE_FINDINGS = new Set(["multiplier-suspect", "usage-vs-meter", "usage-outlier", "duplicate-bill", "period-overlap"]);

/** Bills the audit found wrong in their usage, with the reason, to leave out of the change-point fits. */
function billsToLeaveOut(findings: Finding[]): Map<string, string> {
  const out = new Map<string, string>();
  for (const f of findings) {
    if (f.severity === "info" || !USAGE_FINDINGS.has(f.check)) continue;
    for (const id of [f.billId, ...(f.relatedBillIds ?? [])]) if (id) out.set(id, `audit finding: ${f.check}`);
  }
  return out;
}

/** The demand window of a tariff's first demand charge (15 minutes when it has none). */
function demandWindowMinutes(tariff: Tariff | undefined): number {
  for (const version of tariff?.versions ?? []) {
    for (const charge of version.charges) if (charge.kind === "demand") return charge.windowMinutes;
  }
  return 15;
}

