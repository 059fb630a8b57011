/**
 * A small invented portfolio for report and site tests (fictional company and buildings).
 * Two buildings: one ordinary, one whose name is an HTML injection attempt.
 */
import type { Bill, Building, Meter, Portfolio, PortfolioSettings } from "../../src/domain/types.ts";
import type { ComputedBill } from "../../src/tariff/types.ts";
import type { MonthlyMetered, PricedBill, ReportInput } from "../../src/report/input.ts";

export const EVIL_NAME = `<script>alert(1)</script> & "Annex"`;

const settings: PortfolioSettings = {
  name: "Tern Lake Holdings",
  currency: "USD",
  asOf: null,
  forecastMonths: 12,
  escalation: { electricity: 0, gas: 0, water: 0 },
  escalationStated: false,
  tolerances: { usagePct: 2, demandPct: 3, costAbs: 1, costPct: 0.5 },
  degreeDayBase: { heating: 18, cooling: 18, unit: "C" },
  basePath: "/reports/",
  intervalTimestamp: "start",
  weatherMaxGapHours: 6,
  cleaning: {},
  alignment: { offsetsHours: {}, auto: false },
};

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
