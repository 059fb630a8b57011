/**
 * expectedUsageForStretch fits each meter's degree-day band once and bands every stretch from it,
 * instead of fitting the band again with the stretch added as one more (estimated, so never
 * trained on) bill. Reference: that former way, through the public buildingDegreeDayBands on the
 * demo portfolio with the stretch added as an estimated bill. Tolerance: none (Object.is).
 */
import { describe, expect, it } from "vitest";
import { loadPortfolio } from "../../src/ingest/index.ts";
import { cutAtAsOf } from "../../src/pipeline/asOf.ts";
import { buildingDegreeDayBands, expectedUsageForStretch } from "../../src/model/billBaselines.ts";
import type { Bill } from "../../src/domain/types.ts";

describe("a stretch's expected usage is the band it would get as one more estimated bill", () => {
  it("on the demo's meters, stretches inside, across and outside their bills (several per meter)", async () => {
    const portfolio = cutAtAsOf((await loadPortfolio("data/demo")).portfolio!).portfolio;
    const stretches: [string, string][] = [
      ["2024-02-03", "2024-03-01"],
      ["2024-07-10", "2024-08-25"],
      ["2025-01-01", "2025-01-31"],
      ["2025-06-15", "2025-06-16"],
      ["2010-01-01", "2010-02-01"], // no weather: no band
    ];
    let banded = 0;
    for (const building of portfolio.buildings) {
      const stretchUsage = expectedUsageForStretch(portfolio, building);
      for (const meter of portfolio.meters.filter((m) => m.buildingId === building.buildingId)) {
        const bills = portfolio.bills.filter((b) => b.meterId === meter.meterId);
        if (bills.length === 0) continue;
        for (const [from, to] of stretches) {
          const got = stretchUsage(meter.meterId, from, to);
          const id = "\u0000stretch";
          const stretch: Bill = { ...bills[0]!, billId: id, periodStart: from, periodEnd: to, usage: 0, readType: "estimated", demandKw: null, total: 0 };
          const former = buildingDegreeDayBands({ ...portfolio, bills: [...portfolio.bills, stretch] }, building).get(meter.meterId)!;
          const e = former.expectedByBill.get(id);
          if (!e) {
            expect(got).toBeNull();
            continue;
          }
          banded++;
          expect(got).not.toBeNull();
          expect([Object.is(got!.p50, e.p50), Object.is(got!.low, e.low), Object.is(got!.high, e.high)]).toEqual([true, true, true]);
          expect(got!.basis).toContain(`(${former.degreeDay!.fit.form})`);
        }
      }
    }
    expect(banded).toBeGreaterThan(10);
  }, 300_000);
});
