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

describe("demand-vs-meter", () => {
  it("planted: billed 120 kW vs metered peak 100 kW (+20 % > 5 × 3 %) → error, 10 × 20 = +200.00", () => {
    const b = bill("2024-01-01", "2024-02-01", { usage: 1000, demandKw: 120, total: price(1000, 120) });
    const f = checkDemandVsMeter(ctxFor([b], () => metered(1000, { peakKw: 100 })));
    expect(f).toHaveLength(1);
    expect(f[0]).toMatchObject({ check: "demand-vs-meter", severity: "error", amountAtStake: 200 });
  });
  it("clean twin: 102 kW vs 100 kW (2 % ≤ 3 %) → nothing", () => {
    const b = bill("2024-01-01", "2024-02-01", { demandKw: 102 });
    expect(checkDemandVsMeter(ctxFor([b], () => metered(1000, { peakKw: 100 })))).toEqual([]);
  });
});
