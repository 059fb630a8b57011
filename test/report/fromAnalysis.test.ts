/**
 * The pipeline → report mapping of the forecast: building monthly bands, last year's billed
 * months, per-commodity budget (scenario sums per commodity), drivers and track record, on a
 * hand-built forecast of three meters with three scenarios (all expected values hand-computed;
 * quantiles are type 7 as in src/forecast/quantiles.ts: index (n − 1)·p, linear between).
 */
import { describe, expect, it } from "vitest";
import type { Bill } from "../../src/domain/types.ts";
import type { BuildingForecast, ForecastBundle, MeterForecast, TrackRecord } from "../../src/forecast/index.ts";
import { buildingMonthlyCostBands, buildingCostBand } from "../../src/forecast/index.ts";
import { buildingForecastDetail, toReportInput } from "../../src/report/fromAnalysis.ts";
import { fixtureInput } from "./fixture.ts";
import { fromRows } from "../../src/forecast/scenarioMatrix.ts";

const MONTHS = ["2025-01", "2025-02"];

/** Only the fields the mapping reads; the rest of MeterForecast is irrelevant here. */
function meter(meterId: string, commodity: "electricity" | "gas", rows: number[][], error: string | null = null): MeterForecast {
  return {
    meterId,
    buildingId: "B1",
    commodity,
    error,
    months: MONTHS.map((month) => ({ month })),
    scenarioCosts: fromRows(rows),
  } as unknown as MeterForecast;
}

const E1 = meter("E1", "electricity", [[100, 110], [120, 100], [90, 130]]);
const E2 = meter("E2", "electricity", [[10, 20], [30, 10], [20, 40]]);
const G1 = meter("G1", "gas", [[50, 60], [40, 80], [70, 50]]);
const BROKEN = meter("E3", "electricity", [], "no tariff");

const drivers = { buildingId: "B1", months: ["2024-01"], lastYearCost: 400, lastYearBilledCost: 400, billingErrors: 0, forecastCost: 420, change: 20, weather: -5, rates: 15, usageTrend: 10, meters: [] };
const building: BuildingForecast = {
  buildingId: "B1",
  meters: [E1, E2, G1, BROKEN],
  costNext12m: buildingCostBand([E1, E2, G1], 12),
  monthly: buildingMonthlyCostBands([E1, E2, G1]),
  drivers,
};

function bill(meterId: string, periodStart: string, periodEnd: string, total: number): Bill {
  return { billId: `${meterId}-${periodStart}`, meterId, periodStart, periodEnd, usage: 1, readType: "actual", demandKw: null, powerFactor: null, total, statementDate: null, source: { file: "bills.csv", line: 2 } } as Bill;
}

// January 2024 billed completely for all three meters; February only for E1 and E2 (G1's bill ends mid-month).
const bills = [
  bill("E1", "2024-01-01", "2024-02-01", 310),
  bill("E2", "2024-01-01", "2024-02-01", 31),
  bill("G1", "2024-01-01", "2024-02-01", 62),
  bill("E1", "2024-02-01", "2024-03-01", 290),
  bill("E2", "2024-02-01", "2024-03-01", 29),
  bill("G1", "2024-02-01", "2024-02-15", 28),
];

const record = {
  buildings: [
    {
      buildingId: "B1",
      model: { months: 12, forecastTotal: 98, actualTotal: 100, annualErrorPct: -2, cvRmsePct: 8, coverage: 0.75 },
      naive: { months: 11, forecastTotal: 106, actualTotal: 100, annualErrorPct: 6, cvRmsePct: 12, coverage: null },
    },
  ],
  overall: {
    model: { months: 12, forecastTotal: 98, actualTotal: 100, annualErrorPct: -2, cvRmsePct: 8, coverage: 0.75 },
    naive: null,
    meanAbsAnnualErrorPct: { model: 2, naive: null },
  },
  meters: [],
} as unknown as TrackRecord;

describe("buildingForecastDetail", () => {
  const detail = buildingForecastDetail(building, bills, "2024-12-31", record);

  it("monthly: the building's own bands (scenario sums), hand-computed", () => {
    // Month 1 scenario sums: 160, 190, 180 → sorted 160, 180, 190: P10 = 160 + 0.2·20 = 164, P50 = 180, P90 = 180 + 0.8·10 = 188.
    expect(detail.monthly[0]).toMatchObject({ month: "2025-01", p10: 164, p50: 180, p90: 188 });
    // Month 2: 190, 190, 220 → P10 190, P50 190, P90 190 + 0.8·30 = 214.
    expect(detail.monthly[1]).toMatchObject({ month: "2025-02", p10: 190, p50: 190 });
    expect(detail.monthly[1]!.p90).toBeCloseTo(214, 9);
  });

  it("last year: same calendar month billed by every priced meter, else null (a partial month is not shown)", () => {
    expect(detail.monthly.map((m) => [m.lastYearMonth, m.lastYearCost])).toEqual([
      ["2024-01", 403],
      ["2024-02", null],
    ]);
  });

  it("budget: P50 per commodity and month from that commodity's scenario sums; totals from buildingCostBand", () => {
    expect(detail.totalMonths).toBe(2);
    const [elec, gas] = detail.byCommodity;
    expect(elec!.commodity).toBe("electricity");
    // Electricity month 1: 110, 150, 110 → median 110; month 2: 130, 110, 170 → median 130.
    expect(elec!.monthly).toEqual([{ month: "2025-01", p50: 110 }, { month: "2025-02", p50: 130 }]);
    // Two-month sums 240, 260, 280 → P10 244, P50 260, P90 276 (not 110 + 130: medians do not add).
    expect(elec!.total!.p10).toBeCloseTo(244, 9);
    expect(elec!.total!.p50).toBe(260);
    expect(elec!.total!.p90).toBeCloseTo(276, 9);
    // Gas: month medians 50 and 60; sums 110, 120, 120 → P10 112, P50 120, P90 120.
    expect(gas!.monthly.map((m) => m.p50)).toEqual([50, 60]);
    expect(gas!.total!.p10).toBeCloseTo(112, 9);
    expect(gas!.total!.p50).toBe(120);
    expect(gas!.total!.p90).toBe(120);
  });

  it("drivers and track record are carried over; an unpriced meter is left out", () => {
    expect(detail.drivers).toEqual({ months: ["2024-01"], lastYearCost: 400, lastYearBilledCost: 400, billingErrors: 0, forecastCost: 420, change: 20, weather: -5, rates: 15, usageTrend: 10 });
    expect(detail.trackRecord).toEqual({ model: { months: 12, annualErrorPct: -2, cvRmsePct: 8, coverage: 0.75 }, naive: { months: 11, annualErrorPct: 6, cvRmsePct: 12, coverage: null } });
    expect(buildingForecastDetail({ ...building, drivers: { ...drivers, months: [] } }, bills, "2024-12-31", null)).toMatchObject({ drivers: null, trackRecord: null });
  });
});

describe("toReportInput", () => {
  it("maps the forecast bundle: rows, building totals, portfolio range and track record", () => {
    const { portfolio } = fixtureInput();
    const bundle = {
      forecast: {
        asOf: "2024-12-31",
        calibration: 1,
        buildings: [building],
        rows: [{ building_id: "B1", meter_id: "E1", month: "2025-01", usage_p50: 5, cost_p10: 95, cost_p50: 100, cost_p90: 118 }],
        costNext12m: { p10: 1, p50: 2, p90: 3 },
      },
      calibration: {},
      trackRecord: record,
    } as unknown as ForecastBundle;
    const input = toReportInput({
      portfolio: { ...portfolio, bills },
      priced: new Map(),
      monthlyMetered: new Map(),
      issues: [],
      buildDate: "2025-01-05",
      findings: [], disputes: [],
      results: [],
      quality: [],
      weatherGaps: [],
      forecast: bundle,
    });
    expect(input.forecast).toEqual([{ buildingId: "B1", meterId: "E1", month: "2025-01", usageP50: 5, costP10: 95, costP50: 100, costP90: 118 }]);
    expect(input.forecastTotals).toEqual([{ buildingId: "B1", ...building.costNext12m }]);
    expect(input.portfolioForecast).toEqual({ p10: 1, p50: 2, p90: 3 });
    expect(input.buildingForecasts!.map((b) => b.byCommodity.map((c) => c.commodity))).toEqual([["electricity", "gas"]]);
    expect(input.portfolioTrackRecord).toEqual({ model: { months: 12, annualErrorPct: -2, cvRmsePct: 8, coverage: 0.75 }, naive: null });
  });

  it("without a forecast the forecast blocks are absent", () => {
    const { portfolio } = fixtureInput();
    const input = toReportInput({ portfolio, priced: new Map(), monthlyMetered: new Map(), issues: [], buildDate: "2025-01-05", findings: [], disputes: [], results: [], quality: [], weatherGaps: [], forecast: null });
    expect([input.forecast, input.buildingForecasts, input.portfolioTrackRecord, input.portfolioForecast]).toEqual([undefined, undefined, undefined, undefined]);
  });

  it("passes each gas meter's heat content from its tariff, so pages convert ccf to therm as portfolio.json does", () => {
    const { portfolio } = fixtureInput();
    const g1 = portfolio.meters.find((m) => m.meterId === "G1")!;
    const tariffs = new Map<string, unknown>([[g1.tariffId, { heatContentThermPerCcf: 1.05 }]]);
    const input = toReportInput({ portfolio: { ...portfolio, tariffs }, priced: new Map(), monthlyMetered: new Map(), issues: [], buildDate: "2025-01-05", findings: [], disputes: [], results: [], quality: [], weatherGaps: [], forecast: null });
    expect(input.heatContentByMeter?.get("G1")).toBe(1.05);
    // Meters whose tariff states none are absent (the page then uses 1.037, as portfolio.json does).
    expect(input.heatContentByMeter?.has("E1")).toBe(false);
  });
});
