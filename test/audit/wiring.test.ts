// makeRepricer: the caller's price function receives the right request (a fake engine records it).
import { PricingError } from "../../src/tariff/errors.ts";
import { describe, expect, it } from "vitest";
import { makeRepricer, pinVersion } from "../../src/audit/wiring.ts";
import type { Tariff, TariffVersion } from "../../src/tariff/model.ts";
import type { ComputedBill, PriceRequest } from "../../src/tariff/types.ts";
import { bill, computed, portfolio, series } from "./fixtures.ts";

function version(from: string, until: string | null): TariffVersion {
  return { from, until, seasons: [], holidays: { kind: "none" } as unknown as TariffVersion["holidays"], periods: [], charges: [], minimumBill: null, line: 1 };
}
function tariff(id: string, commodity: Tariff["commodity"], versions: TariffVersion[]): Tariff {
  return { id, name: id, commodity, usageUnit: "kWh", currency: "USD", heatContentThermPerCcf: 1.037, heatContentStated: false, versions, file: `${id}.yaml` };
}

describe("makeRepricer", () => {
  const t1 = tariff("T1", "electricity", [version("2024-01-01", "2024-07-01"), version("2024-07-01", null)]);
  const t2 = tariff("T2", "electricity", [version("2024-01-01", null)]);
  const g = tariff("G1", "gas", [version("2024-01-01", null)]);
  const bills = [bill("2024-01-01", "2024-02-01", { demandKw: 50 }), bill("2024-02-01", "2024-03-01", { demandKw: 60 }), bill("2024-03-01", "2024-04-01", { demandKw: 40 })];
  const p = portfolio({ bills, intervals: [series("2024-03-01", "2024-04-01", () => 2)] });
  p.meters = [{ ...p.meters[0], multiplier: 10 }];
  (p as unknown as { tariffs: Map<string, Tariff> }).tariffs = new Map([["T1", t1], ["T2", t2], ["G1", g]]);
  const priced = new Map<string, ComputedBill | null>(bills.map((b) => [b.billId, { ...computed([["Demand", 1]]), billingDemandKw: b.demandKw }]));
  const calls: { tariff: Tariff; req: PriceRequest }[] = [];
  const { reprice, rateAlternatives } = makeRepricer({
    portfolio: p as never, priced,
    price: (tariff, req) => { calls.push({ tariff, req }); return computed([["Energy", req.usage * 0.1]]); },
  });

  it("re-prices corrected quantities with the ratchet history and the bill's intervals (multiplier applied)", () => {
    const out = reprice(bills[2], { kind: "quantities", usage: 500, demandKw: 35 });
    expect(out?.total).toBe(50);
    const { req } = calls.at(-1)!;
    expect(req).toMatchObject({ usage: 500, demandKw: 35, periodStart: "2024-03-01", periodEnd: "2024-04-01", timezone: "America/New_York", previousBillingDemandsKw: [50, 60] });
    // March 2024 in New York: 31 × 96 − 4 = 2,972 intervals (15 U.S.C. 260a), each 2 × 10
    expect(req.intervals?.values.length).toBe(2972);
    expect(req.intervals?.values[0]).toBe(20);
  });
  it("pins one version for the whole period", () => {
    reprice(bills[0], { kind: "rate", tariffId: "T1", versionFrom: "2024-07-01", label: "x" });
    expect(calls.at(-1)!.tariff.versions).toEqual([{ ...version("2024-07-01", null), from: "0001-01-01" }]);
    expect(pinVersion(t1, "1999-01-01")).toBeNull();
  });
  it("offers every own version and every other tariff of the same commodity", () => {
    expect(rateAlternatives(bills[0], p.meters[0]).map((a) => `${a.tariffId}@${a.versionFrom}`)).toEqual(["T1@2024-01-01", "T1@2024-07-01", "T2@null"]);
  });
  it("a pricing problem (PricingError) gives null, not a throw; a bug is not hidden", () => {
    const { reprice: r } = makeRepricer({ portfolio: p as never, priced, price: () => { throw new PricingError("no version in force"); } });
    expect(r(bills[0], { kind: "quantities", usage: 1, demandKw: null })).toBeNull();
    const { reprice: buggy } = makeRepricer({ portfolio: p as never, priced, price: () => { throw new TypeError("x is undefined"); } });
    expect(() => buggy(bills[0], { kind: "quantities", usage: 1, demandKw: null })).toThrow(TypeError);
  });
});
