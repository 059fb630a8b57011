/**
 * Small hand-built fixtures for the audit tests: one building in America/New_York, one
 * electricity meter, bills and computed bills written out by hand. All data invented.
 */
import type { Bill, BillLine, IntervalSeries, Meter, Portfolio } from "../../src/domain/types.ts";
import type { ComputedBill, ComputedLine, LineStatus } from "../../src/tariff/types.ts";
import { localMidnightMs } from "../../src/audit/reconcile.ts";
import type { AuditInput, MeteredPeriod } from "../../src/audit/types.ts";

export const ZONE = "America/New_York";

let line = 2;

export function bill(start: string, end: string, over: Partial<Bill> = {}): Bill {
  const meterId = over.meterId ?? "E1";
  return {
    billId: `${meterId}:${start}`, meterId, periodStart: start, periodEnd: end, usage: 1000,
    readType: "actual", demandKw: null, powerFactor: null, total: 150, statementDate: null,
    source: { file: "bills.csv", line: line++ }, ...over,
  };
}

export function printed(billId: string, label: string, amount: number): BillLine {
  return { billId, label, amount, source: { file: "bill_lines.csv", line: line++ } };
}

export function computed(lines: [string, number, LineStatus?][]): ComputedBill {
  const ls: ComputedLine[] = lines.map(([label, amount, status]) => ({
    label, kind: "fixed", quantity: null, unit: "", rate: null, amount, note: null, status: status ?? "exact",
  }));
  const total = Math.round(ls.reduce((s, l) => s + l.amount * 100, 0)) / 100;
  return { lines: ls, total, billingDemandKw: null, versions: [], exact: ls.every((l) => l.status === "exact"), notes: [] };
}

export function meter(over: Partial<Meter> = {}): Meter {
  return { meterId: "E1", buildingId: "B1", commodity: "electricity", unit: "kWh", tariffId: "T1", multiplier: 1, account: null, source: { file: "meters.csv", line: 2 }, ...over };
}

export function portfolio(parts: { bills: Bill[]; billLines?: BillLine[]; meters?: Meter[]; intervals?: IntervalSeries[]; tariffs?: string[]; asOf?: string | null }): Portfolio {
  return {
    root: "/tmp/fixture",
    settings: {
      name: "Fixture Property Trust", currency: "USD", asOf: parts.asOf ?? null, forecastMonths: 12,
      escalation: { electricity: 0, gas: 0, water: 0 }, escalationStated: false,
      tolerances: { usagePct: 2, demandPct: 3, costAbs: 1, costPct: 0.5 },
      degreeDayBase: { heating: 18, cooling: 18, unit: "C" }, basePath: "/", intervalTimestamp: "start", weatherMaxGapHours: 6,
      cleaning: {}, alignment: { offsetsHours: {}, auto: false },
    },
    buildings: [{ buildingId: "B1", name: "Fixture House", floorArea: 1000, areaUnit: "m2", floorAreaM2: 1000, timezone: ZONE, weatherStation: "W1", useType: null, tenantPage: false, source: { file: "buildings.csv", line: 2 } }],
    meters: parts.meters ?? [meter()],
    bills: parts.bills,
    billLines: parts.billLines ?? [],
    intervals: new Map((parts.intervals ?? []).map((s) => [s.meterId, s])),
    weather: new Map(), normals: new Map(),
    tariffs: new Map((parts.tariffs ?? ["T1"]).map((id) => [id, { id }])),
    report: { files: [] },
  };
}

/** Interval series with `valueFn(i)` per interval from local midnight `start` to local midnight `end`. */
export function series(start: string, end: string, valueFn: (i: number, ms: number) => number, intervalMinutes = 15, meterId = "E1"): IntervalSeries {
  const a = localMidnightMs(start, ZONE);
  const b = localMidnightMs(end, ZONE);
  const n = Math.round((b - a) / (intervalMinutes * 60_000));
  const startMs = new Float64Array(n);
  const values = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    startMs[i] = a + i * intervalMinutes * 60_000;
    values[i] = valueFn(i, startMs[i]);
  }
  return { meterId, intervalMinutes, startMs, values };
}

export function metered(usage: number, over: Partial<MeteredPeriod> = {}): MeteredPeriod {
  return { usage, peakKw: null, coverage: 1, intervals: 2880, expectedIntervals: 2880, ...over };
}

export function input(p: Portfolio, over: Partial<AuditInput> = {}): AuditInput {
  return { portfolio: p, priced: new Map(), metered: new Map(), ...over };
}

/** Twelve abutting monthly bills of 2024 for meter E1 with the given usage per bill. */
export function year(usages: number[], over: (i: number) => Partial<Bill> = () => ({})): Bill[] {
  return usages.map((u, i) => {
    const start = `2024-${String(i + 1).padStart(2, "0")}-01`;
    const end = i === 11 ? "2025-01-01" : `2024-${String(i + 2).padStart(2, "0")}-01`;
    return bill(start, end, { usage: u, ...over(i) });
  });
}
