/**
 * Invariants of the committed demo portfolio, read back from the files with an independent
 * parser (hand checks of the generator's own promises; the source of truth is the input
 * contract in the project README and the files themselves).
 */
import { readFileSync, readdirSync } from "node:fs";
import { join } from "node:path";
import { parse } from "csv-parse/sync";
import { DateTime } from "luxon";
import { beforeAll, describe, expect, it } from "vitest";
import { loadTariff } from "../../src/tariff/load.ts";
import { priceBill } from "../../src/tariff/price.ts";
import type { IntervalUsage } from "../../src/tariff/types.ts";

const DIR = join(import.meta.dirname, "../../data/demo");
type Row = Record<string, string>;

function readCsv(rel: string): Row[] {
  return parse(readFileSync(join(DIR, rel), "utf8"), { columns: true, skip_empty_lines: true }) as Row[];
}

/** Decimal text → integer thousandths (values in the demo have at most 3 decimals). */
function milli(s: string): number {
  const m = Math.round(Number(s) * 1000);
  expect(Math.abs(Number(s) * 1000 - m)).toBeLessThan(1e-6);
  return m;
}

interface IntervalRow {
  date: string;
  ts: string;
  valueMilli: number;
}

let bills: Row[] = [];
let meters: Map<string, Row>;
let buildings: Map<string, Row>;
const intervals = new Map<string, IntervalRow[]>();
let planted = new Set<string>();

beforeAll(() => {
  bills = readCsv("bills.csv");
  meters = new Map(readCsv("meters.csv").map((r) => [r.meter_id, r]));
  buildings = new Map(readCsv("buildings.csv").map((r) => [r.building_id, r]));
  for (const f of readdirSync(join(DIR, "intervals")).sort()) {
    for (const r of readCsv(`intervals/${f}`)) {
      const list = intervals.get(r.meter_id) ?? [];
      list.push({ date: r.timestamp.slice(0, 10), ts: r.timestamp, valueMilli: milli(r.value) });
      intervals.set(r.meter_id, list);
    }
  }
  // Planted bill ids from the README table (4th column).
  const readme = readFileSync(join(DIR, "README.md"), "utf8");
  planted = new Set(
    readme
      .split("\n")
      .filter((l) => /^\| \d+ \|/.test(l))
      .flatMap((l) => l.split("|")[4].split(",").map((s) => s.trim())),
  );
});

function periodRows(meterId: string, start: string, end: string): IntervalRow[] {
  return (intervals.get(meterId) ?? []).filter((r) => r.date >= start && r.date < end);
}

function coveredBills(meterId: string): Row[] {
  const rows = intervals.get(meterId) ?? [];
  const first = rows[0].date;
  const last = rows[rows.length - 1].date;
  return bills.filter((b) => b.meter_id === meterId && b.period_start >= first && b.period_end <= DateTime.fromISO(last).plus({ days: 1 }).toISODate()!);
}

describe("demo portfolio files", () => {
  it("plants 8–12 documented problems", () => {
    const lines = readFileSync(join(DIR, "README.md"), "utf8").split("\n").filter((l) => /^\| \d+ \|/.test(l));
    expect(lines.length).toBeGreaterThanOrEqual(8);
    expect(lines.length).toBeLessThanOrEqual(12);
  });

  it("has three interval meters, one with multiplier 40", () => {
    expect([...intervals.keys()].sort()).toEqual(["LAB-E", "TWR-E", "WHS-E"]);
    expect(meters.get("TWR-E")?.multiplier).toBe("40");
  });

  it("bills of interval meters equal the interval sum x multiplier over the local half-open period (clean bills)", () => {
    let checked = 0;
    for (const meterId of intervals.keys()) {
      const mult = Number(meters.get(meterId)?.multiplier);
      for (const b of coveredBills(meterId)) {
        const rows = periodRows(meterId, b.period_start, b.period_end);
        const sumMilli = rows.reduce((s, r) => s + r.valueMilli, 0) * mult;
        const maxKwMilli = Math.max(...rows.map((r) => r.valueMilli)) * mult * 4;
        if (planted.has(b.bill_id)) continue;
        expect(milli(b.usage), b.bill_id).toBe(sumMilli);
        expect(milli(b.demand), b.bill_id).toBe(maxKwMilli);
        checked++;
      }
    }
    expect(checked).toBeGreaterThan(35);
  });

  it("the planted usage and demand problems really differ from the interval data", () => {
    const differs = (billId: string, field: "usage" | "demand") => {
      const b = bills.find((x) => x.bill_id === billId) as Row;
      const mult = Number(meters.get(b.meter_id)?.multiplier);
      const rows = periodRows(b.meter_id, b.period_start, b.period_end);
      const metered = field === "usage" ? rows.reduce((s, r) => s + r.valueMilli, 0) * mult : Math.max(...rows.map((r) => r.valueMilli)) * mult * 4;
      return milli(b[field]) / metered;
    };
    expect(differs("TWR-E-2025-05", "usage")).toBeCloseTo(1.045, 3);
    expect(differs("WHS-E-2025-02", "usage")).toBe(2);
    expect(differs("WHS-E-2025-03", "demand")).toBe(2);
    const lab = [...planted].find((id) => id.startsWith("LAB-E-")) as string;
    expect(differs(lab, "demand")).toBeGreaterThan(1.03);
  });

  it("records the DST days with 92 and 100 intervals, the repeated hour twice in the local-time file", () => {
    for (const meterId of intervals.keys()) {
      const count = (d: string) => (intervals.get(meterId) ?? []).filter((r) => r.date === d).length;
      expect(count("2024-11-03"), meterId).toBe(100);
      expect(count("2025-03-09"), meterId).toBe(92);
      expect(count("2025-11-02"), meterId).toBe(100);
      expect(count("2025-06-10"), meterId).toBe(96);
    }
    const whs = intervals.get("WHS-E") ?? [];
    expect(whs.every((r) => /^\d{4}-\d\d-\d\dT\d\d:\d\d:\d\d$/.test(r.ts))).toBe(true);
    expect(whs.filter((r) => r.ts === "2024-11-03T01:15:00").length).toBe(2);
    expect(whs.some((r) => r.ts.startsWith("2025-03-09T02:"))).toBe(false);
    expect((intervals.get("TWR-E") ?? []).every((r) => /[+-]\d\d:\d\d$/.test(r.ts))).toBe(true);
  });

  it("keeps periods contiguous and 28–33 days long except where a problem is planted", () => {
    const byMeter = new Map<string, Row[]>();
    for (const b of bills) byMeter.set(b.meter_id, [...(byMeter.get(b.meter_id) ?? []), b]);
    const gaps: string[] = [];
    for (const [meterId, list] of byMeter) {
      for (let i = 1; i < list.length; i++) {
        const prev = list[i - 1];
        const cur = list[i];
        if (planted.has(cur.bill_id) || planted.has(prev.bill_id)) continue;
        if (cur.period_start !== prev.period_end) {
          gaps.push(`${meterId} ${prev.period_end}..${cur.period_start}`);
          continue;
        }
        const days = DateTime.fromISO(cur.period_end).diff(DateTime.fromISO(cur.period_start), "days").days;
        expect(days).toBeGreaterThanOrEqual(28);
        expect(days).toBeLessThanOrEqual(33);
      }
    }
    // The only gap is the planted missing LIB-E bill (its id is listed in the README, its row is gone).
    expect(gaps).toEqual(["LIB-E 2024-08-02..2024-09-04"]);
    expect(planted.has("LIB-E-2024-09")).toBe(true);
    expect(bills.some((b) => b.bill_id === "LIB-E-2024-09")).toBe(false);
  });

  it("prints lines that add up to the total on clean bills", () => {
    const lines = readCsv("bill_lines.csv");
    const byBill = new Map<string, number>();
    for (const l of lines) byBill.set(l.bill_id, (byBill.get(l.bill_id) ?? 0) + milli(l.amount));
    let checked = 0;
    for (const b of bills) {
      const sum = byBill.get(b.bill_id);
      if (sum === undefined || planted.has(b.bill_id)) continue;
      expect(sum, b.bill_id).toBe(milli(b.total));
      checked++;
    }
    expect(checked).toBeGreaterThan(100);
  });

  it("re-prices every clean bill exactly with the project's tariff engine", () => {
    const tariffs = new Map<string, NonNullable<ReturnType<typeof loadTariff>["tariff"]>>();
    for (const f of readdirSync(join(DIR, "tariffs"))) {
      const { tariff, issues } = loadTariff(readFileSync(join(DIR, "tariffs", f), "utf8"), f);
      expect(issues).toEqual([]);
      if (tariff) tariffs.set(tariff.id, tariff);
    }
    let checked = 0;
    for (const [meterId, meter] of meters) {
      const building = buildings.get(meter.building_id) as Row;
      const zone = building.timezone;
      const tariff = tariffs.get(meter.tariff);
      expect(tariff, meter.tariff).toBeDefined();
      const covered = intervals.has(meterId) ? new Set(coveredBills(meterId).map((b) => b.bill_id)) : new Set<string>();
      const history: number[] = [];
      for (const b of bills.filter((x) => x.meter_id === meterId)) {
        let iv: IntervalUsage | null = null;
        if (covered.has(b.bill_id)) {
          const rows = periodRows(meterId, b.period_start, b.period_end);
          const startMs = new Float64Array(rows.length);
          rows.forEach((r, i) => {
            let ms = r.ts.length > 19 ? Date.parse(r.ts) : DateTime.fromISO(r.ts, { zone }).toMillis();
            // A local time without offset in the repeated autumn hour: the second one is an hour later.
            if (i > 0 && ms <= startMs[i - 1]) ms += 3_600_000;
            startMs[i] = ms;
          });
          const mult = Number(meter.multiplier);
          iv = { startMs, values: Float64Array.from(rows, (r) => (r.valueMilli / 1000) * mult), intervalMinutes: 15 };
        }
        const computed = priceBill(tariff!, {
          periodStart: b.period_start,
          periodEnd: b.period_end,
          timezone: zone,
          usage: Number(b.usage),
          usageUnit: meter.unit,
          demandKw: b.demand === "" ? null : Number(b.demand),
          powerFactor: b.power_factor === "" ? null : Number(b.power_factor),
          intervals: iv,
          previousBillingDemandsKw: [...history],
        });
        if (computed.billingDemandKw !== null) history.push(computed.billingDemandKw);
        if (planted.has(b.bill_id)) continue;
        expect(computed.exact, b.bill_id).toBe(true);
        expect(Math.abs(computed.total - Number(b.total)), b.bill_id).toBeLessThan(0.005);
        checked++;
      }
    }
    expect(checked).toBeGreaterThan(700);
  }, 60_000);

  it("has tenant pages and a building name that needs HTML escaping", () => {
    const list = [...buildings.values()];
    expect(list.length).toBe(8);
    expect(list.filter((b) => b.tenant_page === "yes").length).toBeGreaterThanOrEqual(2);
    expect(list.some((b) => /[&"<>]/.test(b.name))).toBe(true);
    expect(new Set(list.map((b) => b.timezone)).size).toBe(2);
    expect(list.some((b) => b.area_unit === "m2")).toBe(true);
  });
});
