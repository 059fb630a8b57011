/**
 * The forecast's ratchet history read from the analysis's pricing (analysedBillingDemands) must be
 * the very numbers pricing the known bills again gives (recentBillingDemands), bit for bit, at
 * every origin, with the audit's corrections, removals and added gap bills; where it cannot be
 * sure it answers null and the forecast prices again. Exact equality (toEqual on numbers): the
 * same arithmetic on the same inputs, so no tolerance.
 */
import { beforeAll, describe, expect, it } from "vitest";
import fc from "fast-check";
import { loadPortfolio } from "../../src/ingest/index.ts";
import type { Bill, Portfolio } from "../../src/domain/types.ts";
import { priceBill, priceMeterBills, samePricingFields, type PricedBill, type Tariff } from "../../src/tariff/index.ts";
import { analysedBillingDemands, analysedPricing, billsKnownAt, ratchetHistory, recentBillingDemands } from "../../src/forecast/portfolioInputs.ts";
import { correctBills } from "../../src/forecast/correctedBills.ts";
import { addDays, localMidnightMs } from "../../src/core/time/index.ts";
import { lowerBound } from "../../src/core/sorted.ts";
import { forecastWithTrackRecord } from "../../src/forecast/index.ts";
import { addMonthsIso } from "../../src/core/time/index.ts";
import { bill, meter, tariffFrom } from "./helpers.ts";

/** Billed-basis pricing of every bill as the analysis does it (analyseBuilding.ts): each meter's bills, full series. */
function pricedAsAnalysis(portfolio: Portfolio<Tariff>): Map<string, PricedBill> {
  const priced = new Map<string, PricedBill>();
  for (const m of portfolio.meters) {
    const tariff = portfolio.tariffs.get(m.tariffId);
    const building = portfolio.buildings.find((b) => b.buildingId === m.buildingId)!;
    const bills = portfolio.bills.filter((b) => b.meterId === m.meterId);
    const out = priceMeterBills({ meter: m, bills, timezone: building.timezone, series: portfolio.intervals.get(m.meterId), price: tariff ? (r) => priceBill(tariff, r) : null });
    for (const [id, p] of out) priced.set(id, p);
  }
  return priced;
}

function demandMeters(portfolio: Portfolio<Tariff>) {
  return portfolio.meters.filter((m) => portfolio.tariffs.get(m.tariffId)?.versions.some((v) => v.charges.some((c) => c.kind === "demand")));
}

/** The audit's corrections of each demand meter's bills, one of each kind: a total alone, a demand, a usage, a removal, an added gap bill. */
function demoCorrections(portfolio: Portfolio<Tariff>) {
  return demandMeters(portfolio).flatMap((m, k) => {
    const mine = portfolio.bills.filter((b) => b.meterId === m.meterId);
    const b = mine[10 + k]!;
    const correction = { billId: b.billId as string | null, periodStart: b.periodStart, periodEnd: b.periodEnd, billedTotal: b.total, correctedTotal: b.total - 50, corrected: null, usage: null as number | null, demandKw: null as number | null, correctedOn: "billed" };
    const variants = [
      correction,
      { ...correction, demandKw: (b.demandKw ?? 100) * 0.9 },
      { ...correction, usage: b.usage * 0.95 },
      { ...correction, correctedTotal: 0 },
      { ...correction, billId: null, periodStart: "2025-12-20", periodEnd: "2025-12-31", billedTotal: 0, correctedTotal: 100, demandKw: 80 },
    ];
    return [{ severity: "warning", amountAtStake: 50, meterId: m.meterId, corrections: [variants[k % variants.length]!] }];
  });
}

const RATCHET_YAML = `
id: t-ratchet
name: Test ratchet
commodity: electricity
usage_unit: kWh
currency: USD
versions:
  - from: 2020-01-01
    charges:
      - label: Energy
        energy: 0.1
      - label: Demand
        demand: 5
        ratchet: { percent: 80, months: 11 }
`;

describe("analysedBillingDemands", () => {
  let portfolio: Portfolio<Tariff>;
  let priced: Map<string, PricedBill>;
  beforeAll(async () => {
    portfolio = (await loadPortfolio("data/demo")).portfolio as Portfolio<Tariff>;
    priced = pricedAsAnalysis(portfolio);
  }, 120_000);

  it("gives the re-priced ratchet history of every demo demand meter at every origin, with and without the audit's corrections", () => {
    const analysed = analysedPricing(portfolio.bills, priced)!;
    expect(analysed).toBeDefined();
    let fromAnalysis = 0;
    for (const corrections of [[], demoCorrections(portfolio)]) {
      // The forecast's portfolio: bills as they should have been (correctedBills.ts).
      const base: Portfolio<Tariff> = { ...portfolio, bills: correctBills(portfolio.bills, corrections).bills };
      for (const m of demandMeters(portfolio)) {
        const tariff = portfolio.tariffs.get(m.tariffId)!;
        const building = portfolio.buildings.find((b) => b.buildingId === m.buildingId)!;
        const mine = base.bills.filter((b) => b.meterId === m.meterId);
        for (const k of [0, 1, 2, 3]) {
          const cut = addMonthsIso("2025-12-31", -12 * k);
          const known = billsKnownAt(mine, cut);
          const untilMs = localMidnightMs(addDays(cut, 1), building.timezone);
          const full = portfolio.intervals.get(m.meterId);
          const n = full ? lowerBound(full.startMs, untilMs) : 0;
          const series = full && n > 0 ? { ...full, startMs: full.startMs.subarray(0, n), values: full.values.subarray(0, n) } : undefined;
          const again = recentBillingDemands(m, known, tariff, building.timezone, series);
          expect(ratchetHistory(base, m, known, tariff, building.timezone, series, analysed)).toEqual(again);
          expect(ratchetHistory(base, m, known, tariff, building.timezone, series)).toEqual(again);
          if (analysedBillingDemands(known, portfolio.bills.filter((b) => b.meterId === m.meterId), analysed.billingDemandKw) !== null) fromAnalysis++;
        }
      }
    }
    expect(fromAnalysis).toBeGreaterThan(8);
  });

  it("leaves the demo's forecast, backtests and track record the same with the analysis's pricing as without (with corrections too)", () => {
    const findings = demoCorrections(portfolio);
    expect(findings.length).toBeGreaterThan(4);
    for (const f of [[], findings]) {
      const without = forecastWithTrackRecord(portfolio, { asOf: "2025-12-31", months: 12, scenarios: 40, findings: f });
        const withAnalysed = forecastWithTrackRecord(portfolio, { asOf: "2025-12-31", months: 12, scenarios: 40, findings: f, analysed: analysedPricing(portfolio.bills, priced) });
      expect(withAnalysed).toEqual(without);
    }
  }, 180_000);

  it("answers null where a bill is not the analysed one, an analysed bill is left out before a known one, or ids repeat", () => {
    const bills = [bill("2024-01-01", "2024-02-01", 100, 10, { demandKw: 50 }), bill("2024-02-01", "2024-03-01", 100, 10, { demandKw: 40 })];
    const demands = new Map<string, number | null>([[bills[0]!.billId, 50], [bills[1]!.billId, 40]]);
    expect(analysedBillingDemands(bills, bills, demands)).toEqual([50, 40]);
    expect(analysedBillingDemands([bills[0]!], bills, demands)).toEqual([50]);
    expect(analysedBillingDemands([{ ...bills[0]!, demandKw: 45 }], bills, demands)).toBeNull(); // a corrected demand
    expect(analysedBillingDemands([{ ...bills[0]!, usage: 90 }], bills, demands)).toBeNull(); // a corrected usage
    expect(analysedBillingDemands([{ ...bills[0]!, total: 9 }], bills, demands)).toEqual([50]); // a corrected total alone: priced the same
    expect(analysedBillingDemands([bills[1]!], bills, demands)).toBeNull(); // the first analysed bill left out
    expect(analysedBillingDemands(bills, bills, new Map([[bills[0]!.billId, 50]]))).toBeNull(); // not priced
    expect(analysedBillingDemands(bills, undefined, demands)).toBeNull();
    expect(analysedPricing([bills[0]!, { ...bills[1]!, billId: bills[0]!.billId }], new Map())).toBeUndefined();
  });

  it("is null or the re-priced history for any bills, corrections and cut (property)", () => {
    const tariff = tariffFrom(RATCHET_YAML);
    const m = meter({ tariffId: "t-ratchet" });
    const day = (d: number) => new Date(Date.UTC(2023, 0, 1) + d * 86_400_000).toISOString().slice(0, 10);
    let hits = 0;
    let onceHits = 0;
    const billArb = fc.record({ start: fc.integer({ min: 0, max: 700 }), days: fc.integer({ min: 20, max: 70 }), usage: fc.integer({ min: 0, max: 5000 }), kw: fc.integer({ min: 1, max: 400 }) });
    fc.assert(
      fc.property(
        fc.array(billArb, { minLength: 1, maxLength: 24 }),
        fc.array(fc.record({ index: fc.nat(), kind: fc.constantFrom("demand", "total", "remove", "add") }), { maxLength: 3 }),
        fc.integer({ min: 0, max: 800 }),
        (specs, corrections, cutDay) => {
          const analysedBills: Bill[] = specs.map((s, i) => bill(day(s.start), day(s.start + s.days), s.usage, 0, { billId: `B${i}`, demandKw: s.kw }));
          const pricedAll = priceMeterBills({ meter: m, bills: analysedBills, timezone: "UTC", series: undefined, price: (r) => priceBill(tariff, r), meteredBasis: false });
          const pricing = analysedPricing(analysedBills, pricedAll)!;
          // The audit's corrections as correctedBills.ts applies them: a changed copy, a removal, an added gap bill.
          let corrected = [...analysedBills];
          for (const c of corrections) {
            const i = c.index % corrected.length;
            if (c.kind === "demand") corrected[i] = { ...corrected[i]!, demandKw: (corrected[i]!.demandKw ?? 0) + 7 };
            else if (c.kind === "total") corrected[i] = { ...corrected[i]!, total: corrected[i]!.total + 3 };
            else if (c.kind === "remove" && corrected.length > 1) corrected = corrected.filter((_, j) => j !== i);
            else if (c.kind === "add") corrected.push(bill(day(c.index % 700), day((c.index % 700) + 30), 10, 0, { billId: `gap:${c.index}`, demandKw: 99 }));
          }
          const known = billsKnownAt(corrected, day(cutDay));
          const fromAnalysis = analysedBillingDemands(known, analysedBills, pricing.billingDemandKw);
          const again = recentBillingDemands(m, known, tariff, "UTC", undefined);
          if (fromAnalysis !== null) {
            hits++;
            expect(fromAnalysis).toEqual(again);
          }
          // The corrected bills priced once (portfolioInputs.ts pricedOnce): the known ones are mostly their first.
          const pricedCorrected = priceMeterBills({ meter: m, bills: corrected, timezone: "UTC", series: undefined, price: (r) => priceBill(tariff, r), meteredBasis: false });
          const once = analysedBillingDemands(known, corrected, analysedPricing(corrected, pricedCorrected)?.billingDemandKw);
          if (once !== null) {
            onceHits++;
            expect(once).toEqual(again);
          }
        },
      ),
      { numRuns: 300, seed: 17 },
    );
    expect(hits).toBeGreaterThan(100);
    expect(onceHits).toBeGreaterThan(hits);
  });

  it("pricing reads no bill field outside PRICING_FIELDS (so equal pricing fields price the same)", () => {
    const tariff = tariffFrom(RATCHET_YAML);
    const m = meter({ tariffId: "t-ratchet" });
    fc.assert(
      fc.property(
        fc.array(fc.record({ start: fc.integer({ min: 0, max: 700 }), days: fc.integer({ min: 20, max: 70 }), usage: fc.integer({ min: 0, max: 5000 }), kw: fc.option(fc.integer({ min: 1, max: 400 })) }), { minLength: 1, maxLength: 12 }),
        fc.record({ total: fc.double({ noNaN: true }), readType: fc.constantFrom("actual", "estimated"), statementDate: fc.option(fc.constant("2030-01-01")), line: fc.nat() }),
        (specs, other) => {
          const day = (d: number) => new Date(Date.UTC(2023, 0, 1) + d * 86_400_000).toISOString().slice(0, 10);
          const bills = specs.map((s, i) => bill(day(s.start), day(s.start + s.days), s.usage, 100, { billId: `B${i}`, demandKw: s.kw }));
          const changed = bills.map((b) => ({ ...b, total: other.total, readType: other.readType as Bill["readType"], statementDate: other.statementDate, source: { file: "elsewhere.csv", line: other.line } }));
          expect(changed.every((b, i) => samePricingFields(b, bills[i]!))).toBe(true);
          const price = (list: Bill[]) => priceMeterBills({ meter: m, bills: list, timezone: "UTC", series: undefined, price: (r) => priceBill(tariff, r) });
          expect(price(changed)).toEqual(price(bills));
        },
      ),
      { numRuns: 100, seed: 3 },
    );
  });
});
