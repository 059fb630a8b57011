// usage-vs-meter, demand-vs-meter, multiplier-suspect: planted problem + clean twin each.
// Re-pricing stub: 0.15 per kWh + 10.00 per kW (hand-computed amounts below).
import { describe, expect, it } from "vitest";
import { buildContext } from "../../../src/audit/context.ts";
import { checkDemandVsMeter } from "../../../src/audit/checks/demand-vs-meter.ts";
import { checkMultiplierSuspect, matchCommonRatio } from "../../../src/audit/checks/multiplier-suspect.ts";
import { checkUsageVsMeter } from "../../../src/audit/checks/usage-vs-meter.ts";
import type { Bill } from "../../../src/domain/types.ts";
import type { MeteredPeriod, RepriceFn } from "../../../src/audit/types.ts";
import { bill, computed, input, metered, portfolio, year } from "../fixtures.ts";

const reprice: RepriceFn = (_b, alt) =>
  alt.kind === "quantities" ? computed([["Energy", alt.usage * 0.15], ["Demand", (alt.demandKw ?? 0) * 10]]) : null;
const price = (usage: number, kw: number | null) => Math.round((usage * 0.15 + (kw ?? 0) * 10) * 100) / 100;

function ctxFor(bills: Bill[], m: (b: Bill, i: number) => MeteredPeriod | null, withReprice = true) {
  return buildContext(input(portfolio({ bills }), {
    metered: new Map(bills.map((b, i) => [b.billId, m(b, i)])),
    reprice: withReprice ? reprice : undefined,
  }));
}

describe("usage-vs-meter", () => {
  it("planted: billed 1,100 kWh vs 1,000 metered (+10 %) → warning, 165.00 − 150.00 = +15.00", () => {
    const b = bill("2024-01-01", "2024-02-01", { usage: 1100, total: price(1100, null) });
    const f = checkUsageVsMeter(ctxFor([b], () => metered(1000)));
    expect(f).toHaveLength(1);
    expect(f[0]).toMatchObject({ check: "usage-vs-meter", severity: "warning", amountAtStake: 15 });
  });
  it("beyond 5 × usage_pct (+25 %) is an error; without reprice the amount is null", () => {
    const b = bill("2024-01-01", "2024-02-01", { usage: 1250, total: price(1250, null) });
    const [f] = checkUsageVsMeter(ctxFor([b], () => metered(1000), false));
    expect(f).toMatchObject({ severity: "error", amountAtStake: null });
  });
  it("clean twin: 1,015 vs 1,000 (1.5 % ≤ 2 %) → nothing", () => {
    const b = bill("2024-01-01", "2024-02-01", { usage: 1015 });
    expect(checkUsageVsMeter(ctxFor([b], () => metered(1000)))).toEqual([]);
  });
  it("coverage 95 %: the metered sum is scaled to the full period before comparing (hand-computed)", () => {
    const b = bill("2024-01-01", "2024-02-01", { usage: 1000 });
    // 950 over 95 % of the intervals → 1,000 for the period: consistent, no finding
    expect(checkUsageVsMeter(ctxFor([b], () => metered(950, { coverage: 0.95, intervals: 2736 })))).toEqual([]);
    // 900 over 95 % → 947.37; billed 1,000 is +5.6 % → warning, message names the scaling
    const f = checkUsageVsMeter(ctxFor([b], () => metered(900, { coverage: 0.95, intervals: 2736 })));
    expect(f).toHaveLength(1);
    expect(f[0].message).toContain("947.37");
    expect(f[0].message).toContain("scaled from 95.0 % coverage");
  });
  it("coverage 80 % < 90 %: not compared, info says why", () => {
    const b = bill("2024-01-01", "2024-02-01", { usage: 5000 });
    const f = checkUsageVsMeter(ctxFor([b], () => metered(800, { coverage: 0.8, intervals: 2304 })));
    expect(f).toHaveLength(1);
    expect(f[0]).toMatchObject({ severity: "info", amountAtStake: null });
    expect(f[0].message).toContain("80.0 %");
  });
});
