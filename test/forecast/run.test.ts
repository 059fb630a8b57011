/**
 * The build's forecast call on a synthetic portfolio (real NOAA Seattle temperatures, invented
 * meters and prices): a meter without 24 months of bills gets no track record and the model's own
 * band; a billing error the audit corrected is a driver of its own, never part of the usage trend.
 */
import { beforeAll, describe, expect, it } from "vitest";
import { forecastWithTrackRecord, type ForecastBundle } from "../../src/forecast/index.ts";
import { SYNTHETIC_AS_OF, syntheticForecastPortfolio } from "../../bench/lib/forecastPortfolio.ts";
import type { Portfolio } from "../../src/domain/types.ts";
import type { Tariff } from "../../src/tariff/index.ts";

let portfolio: Portfolio<Tariff>;
let plain: ForecastBundle;
let corrected: ForecastBundle;
const OVERCHARGE = 1_000;

beforeAll(() => {
  portfolio = syntheticForecastPortfolio("seattle-short");
  plain = forecastWithTrackRecord(portfolio, { asOf: SYNTHETIC_AS_OF, months: 12, scenarios: 120 });
  // An invented finding: the office's March 2015 electricity bill was 1,000 too high.
  const bill = portfolio.bills.find((b) => b.meterId === "BENCH-OFFICE-E" && b.periodStart === "2015-03-01")!;
  const inflated = portfolio.bills.map((b) => (b === bill ? { ...b, total: b.total + OVERCHARGE } : b));
  corrected = forecastWithTrackRecord({ ...portfolio, bills: inflated }, {
    asOf: SYNTHETIC_AS_OF, months: 12, scenarios: 120,
    findings: [{
      meterId: bill.meterId, severity: "warning", amountAtStake: OVERCHARGE,
      corrections: [{ billId: bill.billId, periodStart: bill.periodStart, periodEnd: bill.periodEnd, billedTotal: bill.total + OVERCHARGE, correctedTotal: bill.total, corrected: null, usage: bill.usage, demandKw: null, correctedOn: "test" }],
    }],
  });
}, 180_000);

describe("track record only where it means something", () => {
  it("a meter with 14 months of bills: 'not enough history for a track record (14 months)', model's own band", () => {
    const tr = plain.trackRecord.meters.find((m) => m.meterId === "BENCH-ANNEX-E")!;
    expect(tr.note).toBe("not enough history for a track record (14 months)");
    expect(tr.model).toBeNull();
    const annex = plain.forecast.buildings.flatMap((b) => b.meters).find((m) => m.meterId === "BENCH-ANNEX-E")!;
    expect(annex.error).toBeNull();
    expect(annex.notes.join(" ")).toContain("calibration 1");
    const office = plain.forecast.buildings.flatMap((b) => b.meters).find((m) => m.meterId === "BENCH-OFFICE-E")!;
    expect(office.notes.join(" ")).toContain(`calibration ${plain.calibration.factor}`);
  });

  it("meters with four years compare the same months for the model and the naive forecast", () => {
    for (const m of plain.trackRecord.meters.filter((x) => x.meterId !== "BENCH-ANNEX-E")) {
      expect(m.model!.months).toBe(12);
      expect(m.naive!.months).toBe(12);
    }
  });
});

describe("the base is the corrected bills", () => {
  const office = (b: ForecastBundle) => b.forecast.buildings.find((x) => x.buildingId === "BENCH-OFFICE")!.drivers;

  it("the overcharge is a driver of its own, 'billing errors corrected', of −1,000", () => {
    expect(office(corrected).billingErrors).toBeCloseTo(-OVERCHARGE, 6);
    expect(office(corrected).lastYearBilledCost - office(corrected).lastYearCost).toBeCloseTo(OVERCHARGE, 6);
    expect(office(plain).billingErrors).toBe(0);
  });

  it("the usage trend, weather and rates are those of the portfolio without the error; the drivers add up to the change against what was billed", () => {
    const a = office(plain);
    const b = office(corrected);
    expect(b.usageTrend).toBeCloseTo(a.usageTrend, 6);
    expect(b.weather).toBeCloseTo(a.weather, 6);
    expect(b.rates).toBeCloseTo(a.rates, 6);
    expect(b.change).toBeCloseTo(a.change + OVERCHARGE * -1, 6);
    expect(b.billingErrors + b.weather + b.rates + b.usageTrend).toBeCloseTo(b.change, 6);
    expect(corrected.corrections.size).toBe(1);
  });
});
