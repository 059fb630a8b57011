/**
 * One planted problem per money check on a small in-memory portfolio, run through the real
 * pipeline stage (analyseBuilding: pricing on both bases, reconciliation, audit) and the dispute
 * list. Pins what the finance reader relies on: each problem is ONE dispute, its claim equals
 * the finding's amount to the cent and equals billed − corrected, and the corrected total is the
 * tariff's price of the right quantities (hand-computed below from the rates).
 *
 * Invented data (fictional utility "Larkspur Valley Power"); the expected figures are hand
 * arithmetic on the tariff's rates, written beside each check.
 */
import { describe, expect, it } from "vitest";
import { loadTariff } from "../../src/tariff/load.ts";
import { priceBill } from "../../src/tariff/price.ts";
import type { Tariff } from "../../src/tariff/model.ts";
import { analyseBuilding } from "../../src/pipeline/build.ts";
import { buildDisputes } from "../../src/disputes/index.ts";
import type { Bill, BillLine, Portfolio } from "../../src/domain/types.ts";
import { bill as makeBill, portfolio as makePortfolio, meter, series, ZONE } from "../audit/fixtures.ts";
import { localMidnightMs } from "../../src/audit/reconcile.ts";

const TARIFF_E = loadTariff(`
id: T-E
commodity: electricity
usage_unit: kWh
versions:
  - from: 2023-01-01
    charges:
      - { label: Customer charge, fixed: 20.00 }
      - { label: Distribution, energy: 0.05 }
      - { label: Demand, demand: 8.00, window_minutes: 60 }
      - { label: Sales tax, percent: 5 }
  - from: 2024-07-01
    inherit: true
    charges_override:
      - { label: Distribution, energy: 0.04 }
`, "T-E.yaml").tariff!;
const TARIFF_G = loadTariff(`
id: T-G
commodity: gas
usage_unit: therm
versions:
  - from: 2023-01-01
    charges:
      - { label: Customer charge, fixed: 15.00 }
      - { label: Gas, energy: 1.10 }
`, "T-G.yaml").tariff!;

const months = ["2024-01-01", "2024-02-01", "2024-03-01", "2024-04-01", "2024-05-01", "2024-06-01", "2024-07-01", "2024-08-01", "2024-09-01", "2024-10-01", "2024-11-01", "2024-12-01", "2025-01-01"];
const hours = (a: string, b: string) => (localMidnightMs(b, ZONE) - localMidnightMs(a, ZONE)) / 3_600_000;
// The meter: a flat 10 kWh every hour (10 kW), all of 2024.
const KWH_PER_HOUR = 10;
const data = series("2024-01-01", "2025-01-01", () => KWH_PER_HOUR, 60, "E1");

const price = (t: Tariff, b: Pick<Bill, "periodStart" | "periodEnd" | "usage" | "demandKw">, unit = "kWh") =>
  priceBill(t, { periodStart: b.periodStart, periodEnd: b.periodEnd, timezone: ZONE, usage: b.usage, usageUnit: unit, demandKw: b.demandKw });

function electricBills(): { bills: Bill[]; lines: BillLine[] } {
  const bills: Bill[] = [];
  const lines: BillLine[] = [];
  for (let i = 0; i < 12; i++) {
    const [a, b] = [months[i], months[i + 1]];
    let usage = KWH_PER_HOUR * hours(a, b);
    let demandKw = 10;
    const id = `E1-${a.slice(0, 7)}`;
    if (i === 10) continue; // November: not billed although the meter ran (missing-bill)
    if (i === 1) usage *= 1.1; // February: 10 % more than the meter (usage-vs-meter)
    if (i === 2) demandKw = 13; // March: 13 kW billed, meter peak 10 kW (demand-vs-meter)
    if (i === 5 || i === 6) { usage *= 2; demandKw *= 2; } // June, July: multiplier 2
    const start = i === 9 ? "2024-09-26" : a; // October starts 5 days early (period-overlap)
    let total = price(TARIFF_E, { periodStart: start, periodEnd: b, usage, demandKw }).total;
    if (i === 9) usage = KWH_PER_HOUR * hours(start, b);
    if (i === 9) total = price(TARIFF_E, { periodStart: start, periodEnd: b, usage, demandKw }).total;
    if (i === 0) total += 50; // January: total 50.00 above the tariff (total-mismatch)
    if (i === 7) total = price({ ...TARIFF_E, versions: [{ ...TARIFF_E.versions[0], until: null }] }, { periodStart: a, periodEnd: b, usage, demandKw }).total; // August on the old version (rate-suspect)
    const bill = makeBill(start, b, { billId: id, meterId: "E1", usage, demandKw, total });
    bills.push(bill);
    if (i === 3 || i === 4) {
      // April: Distribution printed at 0.06 instead of 0.05, and the tax on it (line-mismatch + its tax);
      // May: an extra "Meter access fee" of 42.75 no charge explains (unexplained-line).
      const c = price(TARIFF_E, bill);
      const dist = i === 3 ? Math.round(usage * 0.06 * 100) / 100 : c.lines.find((l) => l.label === "Distribution")!.amount;
      const cust = 20, dem = c.lines.find((l) => l.label === "Demand")!.amount;
      const extra = i === 4 ? 42.75 : 0;
      const tax = Math.round((cust + dist + dem + extra) * 0.05 * 100) / 100;
      lines.push(
        { billId: id, label: "Customer charge", amount: cust, source: { file: "bill_lines.csv", line: lines.length + 2 } },
        { billId: id, label: "Distribution", amount: dist, source: { file: "bill_lines.csv", line: lines.length + 3 } },
        { billId: id, label: "Demand", amount: dem, source: { file: "bill_lines.csv", line: lines.length + 4 } },
      );
      if (extra) lines.push({ billId: id, label: "Meter access fee", amount: extra, source: { file: "bill_lines.csv", line: lines.length + 2 } });
      lines.push({ billId: id, label: "Sales tax", amount: tax, source: { file: "bill_lines.csv", line: lines.length + 2 } });
      bills[bills.length - 1] = { ...bill, total: Math.round((cust + dist + dem + extra + tax) * 100) / 100 };
    }
    if (i === 8) bills.push({ ...bills[bills.length - 1], billId: `${id}-R`, source: { file: "bills.csv", line: 99 } }); // September twice (duplicate-bill)
  }
  return { bills, lines };
}

function gasBills(): Bill[] {
  // 300 therm a month; March is missing (period-gap without interval data).
  return months.slice(0, 12).flatMap((a, i) => {
    if (i === 2) return [];
    const b = months[i + 1];
    const total = price(TARIFF_G, { periodStart: a, periodEnd: b, usage: 300, demandKw: null }, "therm").total;
    return [makeBill(a, b, { billId: `G1-${a.slice(0, 7)}`, meterId: "G1", usage: 300, total })];
  });
}

const { bills: eBills, lines } = electricBills();
const base = makePortfolio({ bills: [...eBills, ...gasBills()], billLines: lines, intervals: [data], meters: [meter({ tariffId: "T-E", account: "LVP-0001" }), meter({ meterId: "G1", commodity: "gas", unit: "therm", tariffId: "T-G" })] });
const portfolio = { ...base, tariffs: new Map([["T-E", TARIFF_E], ["T-G", TARIFF_G]]) } as Portfolio<Tariff>;
const result = analyseBuilding(portfolio, portfolio.buildings[0]);
const disputes = buildDisputes({ findings: result.findings, bills: portfolio.bills, meters: portfolio.meters, billLines: portfolio.billLines });
const onBill = (id: string) => disputes.filter((d) => d.billIds.includes(id));

describe("every money check becomes one dispute whose claim equals its finding", () => {
  it("the building is analysed", () => expect(result.failure).toBeNull());

  const cases: [string, string, string, () => number][] = [
    // billed = tariff + 50.00
    ["E1-2024-01", "total-mismatch", "tariff", () => 50],
    // billed on 1.1 × metered; corrected on the metered kWh: 10 % of Feb's kWh × 0.05 × 1.05
    ["E1-2024-02", "usage-vs-meter", "meter", () => Math.round(0.1 * KWH_PER_HOUR * hours("2024-02-01", "2024-03-01") * 0.05 * 1.05 * 100) / 100],
    // 3 kW × 8.00 × 1.05 = 25.20
    ["E1-2024-03", "demand-vs-meter", "meter", () => 25.2],
    // Distribution 0.01/kWh too high on April's kWh, plus 5 % tax on it: one claim
    ["E1-2024-04", "line-mismatch", "tariff", () => {
      const kwh = KWH_PER_HOUR * hours("2024-04-01", "2024-05-01");
      const dist = Math.round(kwh * 0.06 * 100) / 100 - Math.round(kwh * 0.05 * 100) / 100;
      return Math.round(dist * 1.05 * 100) / 100;
    }],
    // the unexplained 42.75 and the 5 % tax charged on it, 2.14: one cause, one claim of 44.89
    ["E1-2024-05", "unexplained-line", "tariff", () => 42.75 + 2.14],
    // August billed on the old version: 0.01/kWh × 1.05 on August's kWh
    ["E1-2024-08", "rate-suspect", "rate-version", () => Math.round(KWH_PER_HOUR * hours("2024-08-01", "2024-09-01") * 0.01 * 1.05 * 100) / 100],
    // the repeat is claimed in full
    ["E1-2024-09-R", "duplicate-bill", "duplicate", () => eBills.find((b) => b.billId === "E1-2024-09-R")!.total],
  ];
  for (const [billId, check, basis, expected] of cases) {
    it(`${check} on ${billId}: one ${basis} claim of the hand-computed amount`, () => {
      const mine = onBill(billId);
      expect(mine, JSON.stringify(disputes.map((d) => [d.billIds, d.checks, d.claimAmount]))).toHaveLength(1);
      const d = mine[0];
      expect(d.checks[0]).toBe(check);
      expect(d.basis).toBe(basis);
      expect(d.kind).toBe("claim");
      expect(d.account).toBe("LVP-0001");
      expect(d.claimAmount).toBeCloseTo(expected(), 2);
      const finding = result.findings.find((f) => f.check === check && f.billId === billId)!;
      expect(finding.amountAtStake).toBe(d.claimAmount);
      expect(d.claimAmount).toBe(Math.round((d.billedTotal - d.correctedTotal) * 100) / 100);
    });
  }

  it("multiplier: June and July are one claim, corrected on the billed quantities ÷ 2", () => {
    const mine = disputes.filter((d) => d.basis === "multiplier");
    expect(mine).toHaveLength(1);
    expect(mine[0].billIds).toEqual(["E1-2024-06", "E1-2024-07"]);
    const half = eBills.filter((b) => mine[0].billIds.includes(b.billId)).map((b) => price(TARIFF_E, { ...b, usage: b.usage / 2, demandKw: b.demandKw! / 2 }).total);
    expect(mine[0].correctedTotal).toBeCloseTo(half[0] + half[1], 2);
    expect(result.findings.find((f) => f.check === "multiplier-suspect")!.amountAtStake).toBe(mine[0].claimAmount);
  });

  it("overlap: October re-priced over its true period, the 5 overlapped days taken off at September's use per day", () => {
    const [d] = onBill("E1-2024-10");
    expect(d.basis).toBe("overlap");
    // the meter is flat, so September's use per day is exactly October's: the true period's usage is exact
    const truth = price(TARIFF_E, { periodStart: "2024-10-01", periodEnd: "2024-11-01", usage: KWH_PER_HOUR * hours("2024-10-01", "2024-11-01"), demandKw: 10 }).total;
    expect(d.correctedTotal).toBeCloseTo(truth, 2);
  });

  it("November metered but not billed: a back-billing risk priced on the metered use", () => {
    const d = disputes.find((x) => x.meterId === "E1" && x.basis === "gap")!;
    expect(d).toMatchObject({ kind: "back-bill-risk", periodStart: "2024-11-01", periodEnd: "2024-12-01", billedTotal: 0, checks: ["missing-bill", "period-gap"] });
    const truth = price(TARIFF_E, { periodStart: "2024-11-01", periodEnd: "2024-12-01", usage: KWH_PER_HOUR * hours("2024-11-01", "2024-12-01"), demandKw: 10 }).total;
    expect(d.correctedTotal).toBeCloseTo(truth, 2);
    expect(d.claimAmount).toBeCloseTo(-truth, 2);
  });

  it("gas March not billed, no interval data, no weather: priced from the neighbours' use per day", () => {
    const d = disputes.find((x) => x.meterId === "G1")!;
    expect(d).toMatchObject({ kind: "back-bill-risk", basis: "gap", periodStart: "2024-03-01", periodEnd: "2024-04-01" });
    // neighbours: 300 therm over 29 days (Feb 2024) and 300 over 30 days (April): per day 10.345 and 10.0
    const mid = ((300 / 29 + 300 / 30) / 2) * 31;
    expect(d.correctedTotal).toBeCloseTo(Math.round((15 + mid * 1.1) * 100) / 100, 2);
    expect(d.correctedRange!.low).toBeCloseTo(Math.round((15 + 10 * 31 * 1.1) * 100) / 100, 2);
    expect(d.correctedRange!.high).toBeCloseTo(Math.round((15 + (300 / 29) * 31 * 1.1) * 100) / 100, 2);
  });

  it("no bill is claimed twice, and nothing else is disputed", () => {
    const ids = disputes.flatMap((d) => d.billIds);
    expect(new Set(ids).size).toBe(ids.length);
    expect(disputes).toHaveLength(cases.length + 4);
  });

  it("clean bills re-price to the cent on both bases", () => {
    const clean = result.priced.get("E1-2024-12")!;
    const dec = eBills.find((b) => b.billId === "E1-2024-12")!;
    expect(clean.computed!.total).toBe(dec.total);
    expect(clean.metered!.total).toBe(dec.total);
    expect(clean.computed!.exact).toBe(true);
  });
});
