// demand-vs-meter: planted problem + clean twin. Re-pricing stub: 0.15 per kWh + 10.00 per kW (hand-computed amounts in the tests).
import { ctxFor, price } from "./meterFixtures.ts";
import { describe, expect, it } from "vitest";
import { checkDemandVsMeter } from "../../../src/audit/checks/demand-vs-meter.ts";
import { bill, metered } from "../fixtures.ts";

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
