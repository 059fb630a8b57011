/**
 * A small invented portfolio for report and site tests (fictional company and buildings).
 * Two buildings: one ordinary, one whose name is an HTML injection attempt.
 */
import type { Bill, Building, Meter, Portfolio, PortfolioSettings } from "../../src/domain/types.ts";
import type { ComputedBill } from "../../src/tariff/types.ts";
import { DEFAULT_SETTINGS } from "../../src/ingest/portfolioYaml.ts";
import type { MonthlyMetered, ReportInput } from "../../src/report/input.ts";
import type { PricedBill } from "../../src/tariff/priceMeterBills.ts";

export const EVIL_NAME = `<script>alert(1)</script> & "Annex"`;

// The defaults of portfolio.yaml, with a name and a sub-path to host under.
const settings: PortfolioSettings = { ...structuredClone(DEFAULT_SETTINGS), name: "Tern Lake Holdings", basePath: "/reports/" };

function building(id: string, name: string, areaFt2: number, useType: string | null): Building {
  return {
    buildingId: id,
    name,
    floorArea: areaFt2,
    areaUnit: "ft2",
    floorAreaM2: areaFt2 * 0.09290304,
    timezone: "America/Chicago",
    weatherStation: "WX1",
    useType,
    tenantPage: false,
    source: { file: "buildings.csv", line: 2 },
  };
}

function meter(id: string, buildingId: string, commodity: Meter["commodity"], unit: string): Meter {
  return { meterId: id, buildingId, commodity, unit, tariffId: `T-${commodity}`, multiplier: 1, account: null, source: { file: "meters.csv", line: 2 } };
}

/** Monthly read dates on the 5th, 2024-01-05 … 2025-03-05 (14 bills per meter). */
function bills(meterId: string, base: number, perKwDemand: boolean): Bill[] {
  const out: Bill[] = [];
  for (let i = 0; i < 14; i++) {
    const start = new Date(Date.UTC(2024, i, 5)).toISOString().slice(0, 10);
    const end = new Date(Date.UTC(2024, i + 1, 5)).toISOString().slice(0, 10);
    const usage = base * (1 + 0.3 * Math.cos((i / 12) * 2 * Math.PI));
    out.push({
      billId: `${meterId}-${String(i + 1).padStart(2, "0")}`,
      meterId,
      periodStart: start,
      periodEnd: end,
      usage: Math.round(usage),
      readType: i === 3 ? "estimated" : "actual",
      demandKw: perKwDemand ? 40 + i : null,
      powerFactor: null,
      total: Math.round(usage * 0.12 * 100) / 100 + 25,
      statementDate: null,
      source: { file: "bills.csv", line: 2 + i },
    });
  }
  return out;
}

function computed(bill: Bill, delta: number): ComputedBill {
  const energy = Math.round((bill.total - 25 - delta) * 100) / 100;
  return {
    lines: [
      { label: "Customer charge", kind: "fixed", quantity: 1, unit: "bill", rate: 25, amount: 25, note: null, status: "exact" },
      { label: "Energy", kind: "energy", quantity: bill.usage, unit: "kWh", rate: energy / bill.usage, amount: energy, note: "flat rate", status: "exact" },
      { label: "Peak demand", kind: "demand", quantity: null, unit: "kW", rate: 9.5, amount: 0, note: null, status: "needs-interval-data" },
    ],
    total: 25 + energy,
    billingDemandKw: bill.demandKw,
    versions: [{ from: "2023-01-01", days: 31, weight: 1 }],
    exact: false,
    notes: ["Demand needs interval data."],
  };
}

/** Builds a fresh fixture each call, so tests may not share mutations. */
export function fixtureInput(): ReportInput {
  const buildings = [building("B1", "Heron Street Office", 52_000, "office"), building("B2", EVIL_NAME, 18_000, null)];
  const meters = [meter("E1", "B1", "electricity", "kWh"), meter("G1", "B1", "gas", "therm"), meter("E2", "B2", "electricity", "kWh")];
  const allBills = [...bills("E1", 30_000, true), ...bills("G1", 900, false), ...bills("E2", 8_000, false)];
  const priced = new Map<string, PricedBill>();
  for (const b of allBills) {
    if (b.meterId === "G1") priced.set(b.billId, { computed: null, error: "tariff T-gas has no version before 2024-03-01" });
    else priced.set(b.billId, { computed: computed(b, b.billId === "E1-05" ? 12.34 : 0), error: null });
  }
  const monthlyMetered = new Map<string, MonthlyMetered[]>([
    ["E1", [
      { month: "2024-11", total: 28_500.5, intervals: 2880, expectedIntervals: 2884 },
      { month: "2024-12", total: 31_002.25, intervals: 2976, expectedIntervals: 2976 },
    ]],
  ]);
  const portfolio: Portfolio = {
    root: "/tmp/fixture",
    settings,
    buildings,
    meters,
    bills: allBills,
    billLines: [],
    intervals: new Map(),
    weather: new Map(),
    normals: new Map(),
    tariffs: new Map(),
    report: {
      files: [
        { file: "bills.csv", rowsRead: 44, rowsUsed: 42, rowsRejected: 2, rejections: [{ line: 9, reason: "bad date" }, { line: 12, reason: "unknown meter" }], warnings: [] },
        { file: "buildings.csv", rowsRead: 2, rowsUsed: 2, rowsRejected: 0, rejections: [], warnings: ["unknown column 'colour'"] },
      ],
    },
  };
  return {
    portfolio,
    priced,
    monthlyMetered,
    issues: [
      { file: "bills.csv", line: 9, column: 3, severity: "error", message: "period_start '2024-13-01' is not a date", hint: "use YYYY-MM-DD" },
      { file: "buildings.csv", line: 1, column: 8, severity: "warning", message: "unknown column 'colour' ignored" },
    ],
    buildDate: "2025-03-10",
    findings: [
      { buildingId: "B1", meterId: "E1", billId: "E1-05", periodStart: "2024-05-05", periodEnd: "2024-06-05", check: "total-mismatch", severity: "error", amountAtStake: 12.34, message: "billed $12.34 more than the tariff gives" },
      { buildingId: "B1", meterId: "E1", billId: "E1-04", periodStart: "2024-04-05", periodEnd: "2024-05-05", check: "estimated-read", severity: "info", amountAtStake: null, message: "estimated read" },
    ],
  };
}

/** 15-minute interval data of E1: a weekday office shape, 2023-12-01 … 2025-03-05 UTC. */
function officeIntervals(): { startMs: Float64Array; values: Float64Array } {
  const start = Date.UTC(2023, 11, 1);
  const end = Date.UTC(2025, 2, 5);
  const n = (end - start) / 900_000;
  const startMs = new Float64Array(n);
  const values = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const t = start + i * 900_000;
    startMs[i] = t;
    const localHour = (new Date(t).getUTCHours() + 18) % 24; // about Central time
    values[i] = localHour >= 7 && localHour < 19 ? 12 + (i % 7) * 0.1 : 4;
  }
  return { startMs, values };
}

/** Local 2025-01-10 02:00–08:00 CST (= 08:00–14:00 UTC): the planted zero run. */
export const ZERO_RUN = { startMs: Date.UTC(2025, 0, 10, 8), endMs: Date.UTC(2025, 0, 10, 14) };

/**
 * The fixture with every optional block filled (invented numbers): quality and alignment for
 * E1, baselines for E1 (with perBill expectations chosen for a hand-computed tenant check) and
 * G1, forecast with totals and track record, and B1 with a tenant page.
 */
export function fullFixtureInput(): ReportInput {
  const input = fixtureInput();
  const { portfolio } = input;
  portfolio.buildings[0].tenantPage = true;
  const e1 = officeIntervals();
  portfolio.intervals = new Map([...portfolio.intervals, ["E1", { meterId: "E1", intervalMinutes: 15, startMs: e1.startMs, values: e1.values }]]);
  const mask = new Uint8Array(e1.startMs.length);
  for (let i = 0; i < e1.startMs.length; i++) {
    if (e1.startMs[i] >= ZERO_RUN.startMs && e1.startMs[i] < ZERO_RUN.endMs) {
      e1.values[i] = 0;
      mask[i] = 1;
    }
  }
  const spikeAt = e1.startMs.indexOf(Date.UTC(2025, 1, 3, 20));
  e1.values[spikeAt] = 400;
  mask[spikeAt] = 1;
  input.quality = [
    {
      meterId: "E1",
      buildingId: "B1",
      intervalMinutes: 15,
      mask,
      detections: [
        { kind: "zero-run", startMs: ZERO_RUN.startMs, endMs: ZERO_RUN.endMs, intervals: 24, action: "excluded", detail: "6 h of zeros; the same hours of other weeks average 4 kWh per interval" },
        { kind: "spike", startMs: Date.UTC(2025, 1, 3, 20), endMs: Date.UTC(2025, 1, 3, 20, 15), intervals: 1, action: "excluded", detail: "400 kWh, 31 robust σ above the rolling median" },
      ],
      alignment: {
        suggestedOffsetHours: 3,
        appliedOffsetHours: 0,
        strong: true,
        note: "Automatic correction is off; set the offset in portfolio.yaml to apply it.",
        scores: Array.from({ length: 29 }, (_, k) => ({ offsetHours: k - 14, score: Math.round((0.62 - Math.abs(k - 17) * 0.03) * 1000) / 1000 })),
      },
    },
  ];
  input.weatherDetections = [
    { stationId: "WX1", startMs: Date.UTC(2024, 6, 1, 5), endMs: Date.UTC(2024, 6, 1, 9), hours: 4, action: "interpolated" },
    { stationId: "WX1", startMs: Date.UTC(2024, 7, 2, 0), endMs: Date.UTC(2024, 7, 2, 10), hours: 10, action: "kept" },
  ];
  const e1Bills = portfolio.bills.filter((b) => b.meterId === "E1");
  const g1Bills = portfolio.bills.filter((b) => b.meterId === "G1");
  const tempOf = (i: number) => Math.round((8 - 10 * Math.cos((i / 12) * 2 * Math.PI)) * 10) / 10;
  const days = (b: Bill) => (Date.parse(b.periodEnd) - Date.parse(b.periodStart)) / 86_400_000;
  input.baselines = [
    {
      meterId: "E1",
      kind: "3PH",
      tempUnit: "C",
      unit: "kWh",
      points: e1Bills.map((b, i) => ({ billId: b.billId, temp: tempOf(i), usePerDay: b.usage / days(b), ...(b.readType === "estimated" ? { excluded: "estimated read" } : {}) })),
      curve: [
        { temp: -2, usePerDay: 1290 },
        { temp: 15, usePerDay: 700 },
        { temp: 18, usePerDay: 700 },
      ],
      stats: { cvRmsePct: 8.2, nmbePct: 0.4, r2: 0.91, n: 13, p: 3 },
      meetsGuideline14: true,
      normalizedAnnual: 360_500,
      typicalSource: "normals",
      tried: [
        { kind: "2P", accepted: true, reasons: ["higher CV(RMSE) than 3PH"], cvRmsePct: 11.3, nmbePct: 0, r2: 0.84 },
        { kind: "3PH", accepted: true, reasons: ["lowest CV(RMSE) among acceptable forms"], cvRmsePct: 8.2, nmbePct: 0.4, r2: 0.91 },
        { kind: "3PC", accepted: false, reasons: ["cooling slope negative"], cvRmsePct: 25.1, nmbePct: 0, r2: 0.1 },
      ],
      // E1-14 (latest) and E1-02 (a year earlier) carry round ratios for the hand-computed tenant check.
      perBill: e1Bills.map((b) => ({
        billId: b.billId,
        expectedAtActualWeather: b.billId === "E1-14" ? 0.9 * b.usage : b.billId === "E1-02" ? b.usage : 0.98 * b.usage,
        expectedAtTypicalWeather: b.billId === "E1-02" ? 1.05 * b.usage : b.usage,
        bandLow: 0.9 * b.usage,
        bandHigh: 1.08 * b.usage,
      })),
    },
    {
      meterId: "G1",
      kind: "none",
      tempUnit: "C",
      unit: "therm",
      points: g1Bills.map((b, i) => ({ billId: b.billId, temp: tempOf(i), usePerDay: b.usage / days(b) })),
      curve: [],
      stats: null,
      meetsGuideline14: false,
      normalizedAnnual: null,
      typicalSource: null,
      tried: [{ kind: "3PH", accepted: false, reasons: ["CV(RMSE) 31 % above the 15 % limit"], cvRmsePct: 31, nmbePct: 2, r2: 0.4 }],
      perBill: [],
    },
  ];
  input.forecast = ["2025-04", "2025-05", "2025-06"].flatMap((month, k) => [
    { buildingId: "B1", meterId: "E1", month, usageP50: 30_000, costP10: 3500 + k * 10, costP50: 3700 + k * 10, costP90: 3950 + k * 10 },
    { buildingId: "B1", meterId: "G1", month, usageP50: 800, costP10: 700, costP50: 760, costP90: 840 },
  ]);
  input.forecastTotals = [{ buildingId: "B1", p10: 13_100, p50: 13_410, p90: 13_800 }];
  input.portfolioForecast = { p10: 13_100, p50: 13_410, p90: 13_800 };
  input.trackRecord = [{ meterId: "E1", annualCostErrorPct: -2.4, monthlyCvRmsePct: 7.9, coverage: 0.83, naiveAnnualCostErrorPct: 6.1 }];
  // The building's own monthly bands are narrower than the sums of per-meter percentiles above;
  // the commodity medians add up to the building's (invented round numbers).
  input.buildingForecasts = [
    {
      buildingId: "B1",
      monthly: ["2025-04", "2025-05", "2025-06"].map((month, k) => ({
        month,
        p10: 4250 + k * 10,
        p50: 4460 + k * 10,
        p90: 4750 + k * 10,
        lastYearMonth: `2024-0${4 + k}`,
        lastYearCost: k === 2 ? null : 4300 + k * 80,
      })),
      totalMonths: 3,
      byCommodity: [
        { commodity: "electricity", monthly: ["2025-04", "2025-05", "2025-06"].map((month, k) => ({ month, p50: 3700 + k * 10 })), total: { p10: 10_800, p50: 11_130, p90: 11_500 } },
        { commodity: "gas", monthly: ["2025-04", "2025-05", "2025-06"].map((month) => ({ month, p50: 760 })), total: { p10: 2150, p50: 2280, p90: 2420 } },
      ],
      drivers: { months: ["2024-04", "2024-05"], lastYearCost: 8680, forecastCost: 8930, change: 250, weather: -120, rates: 300, usageTrend: 70 },
      trackRecord: { model: { months: 12, annualErrorPct: -2.4, cvRmsePct: 7.9, coverage: 10 / 12 }, naive: { months: 12, annualErrorPct: 6.1, cvRmsePct: 12, coverage: null } },
    },
  ];
  input.portfolioTrackRecord = { model: { months: 12, annualErrorPct: -2.4, cvRmsePct: 7.9, coverage: 10 / 12 }, naive: { months: 12, annualErrorPct: 6.1, cvRmsePct: 12, coverage: null } };
  return input;
}

/**
 * The full fixture grown to `count` buildings: B1 and B2 as there, then B3 … with one electricity
 * meter each whose bills are E2's scaled by the building's number (so billed cost grows with it),
 * and forecast drivers for every building whose change alternates in sign and grows in size
 * (building k: (−1)^k × 100 k), so the largest changes either way are the last buildings.
 */
export function manyBuildingsInput(count: number): ReportInput {
  const input = fullFixtureInput();
  const { portfolio } = input;
  const e2Bills = portfolio.bills.filter((b) => b.meterId === "E2");
  for (let k = 3; k <= count; k++) {
    const id = `B${k}`;
    portfolio.buildings.push(building(id, `Building ${String(k).padStart(3, "0")}`, 10_000 + k * 100, "office"));
    portfolio.meters.push(meter(`E${k}`, id, "electricity", "kWh"));
    for (const b of e2Bills) portfolio.bills.push({ ...b, billId: b.billId.replace("E2", `E${k}`), meterId: `E${k}`, total: Math.round(b.total * k * 100) / 100 });
  }
  const template = input.buildingForecasts![0];
  input.buildingForecasts = portfolio.buildings.map((b, i) => {
    const k = i + 1;
    const change = (k % 2 === 0 ? 1 : -1) * 100 * k;
    return { ...template, buildingId: b.buildingId, drivers: { months: ["2024-04"], lastYearCost: 1000 * k, forecastCost: 1000 * k + change, change, weather: 0, rates: change, usageTrend: 0 } };
  });
  return input;
}

/** The input with a forecast method (as the forecast stage reports it), one meter of each building uncalibrated. */
export function withForecastMethod(input: ReportInput): ReportInput {
  const meters = input.portfolio.buildings.map((b) => input.portfolio.meters.find((m) => m.buildingId === b.buildingId)!);
  return {
    ...input,
    forecastMethod: {
      basisLabel: "the mean of the most recent 10 years",
      basisReason: "smallest mean absolute meter annual cost error over 2 rolling origin(s)",
      adjustmentLabel: "none",
      adjustments: [{ label: "none", meanAbsAnnualErrorPct: 4.21, cvRmsePct: 9.87, chosen: true }, { label: "last year's departure", meanAbsAnnualErrorPct: 5.5, cvRmsePct: 11.2, chosen: false }],
      bases: [{ label: "recent 10 years", meanAbsAnnualErrorPct: 4.21, cvRmsePct: 9.87, chosen: true }, { label: "normals", meanAbsAnnualErrorPct: 6.02, cvRmsePct: 10.4, chosen: false }],
      origins: [{ cut: "2024-03-31", meters: 3, historyMonths: { min: 12, max: 14 }, modelAnnualErrorPct: -2.4, naiveAnnualErrorPct: 6.1, modelCvRmsePct: 7.9, naiveCvRmsePct: 12, coverage: 0.83, factor: 1.25, calibrated: true }],
      factor: 1.25,
      calibrated: true,
      coverage: 0.81,
      uncalibratedMeters: meters.map((m) => ({ meterId: m.meterId, buildingId: m.buildingId, months: 14 })),
      correctedBills: 2,
    },
  };
}

