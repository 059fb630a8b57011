/** Bill-level baselines: period mean temperature, typical months, a constructed 3PH meter. */
import { describe, expect, it } from "vitest";
import type { Bill, Building, Meter, WeatherSeries } from "../../src/domain/types.ts";
import { fitMeterBaseline, meanTemperature, typicalMonthlyTempC } from "../../src/model/billBaselines.ts";

const src = { file: "t.csv", line: 1 };
const HOUR = 3_600_000;
const start = Date.UTC(2023, 0, 1);
const hours = 3 * 365 * 24;

/** Each calendar month has one constant temperature: 0 °C in January rising 2 °C a month. */
function steppedWeather(): WeatherSeries {
  const tempC = new Float64Array(hours);
  for (let h = 0; h < hours; h++) tempC[h] = 2 * new Date(start + h * HOUR).getUTCMonth();
  return { stationId: "W", startMs: start, tempC, filled: new Uint8Array(hours) };
}

describe("meanTemperature", () => {
  it("averages the hours of the period and reports coverage (hand-computed)", () => {
    const w: WeatherSeries = { stationId: "W", startMs: 0, tempC: Float64Array.from([10, 20, NaN, 30]), filled: new Uint8Array(4) };
    const r = meanTemperature(w, 0, 4 * HOUR);
    expect(r.meanC).toBeCloseTo(20, 12);
    expect(r.coverage).toBeCloseTo(0.75, 12);
  });
});

describe("typicalMonthlyTempC", () => {
  it("pools every year's hours by calendar month", () => {
    const t = typicalMonthlyTempC(steppedWeather(), "UTC")!;
    expect(t).toEqual([0, 2, 4, 6, 8, 10, 12, 14, 16, 18, 20, 22]);
  });
});

describe("fitMeterBaseline", () => {
  const building: Building = {
    buildingId: "B", name: "B", floorArea: 1, areaUnit: "m2", floorAreaM2: 1, timezone: "UTC",
    weatherStation: "W", useType: null, tenantPage: false, source: src,
  };
  const meter: Meter = { meterId: "G", buildingId: "B", commodity: "gas", unit: "therm", tariffId: "T", multiplier: 1, account: null, source: src };
  // Calendar-month bills; use/day = 50 + 4·(12 − T)⁺ with T the month's constant temperature:
  // a 3P heating model with balance point 12 °C (constructed, as in the references' 3PH check).
  const bills: Bill[] = [];
  for (let y = 2023; y <= 2025; y++) {
    for (let m = 0; m < 12; m++) {
      const s = new Date(Date.UTC(y, m, 1)).toISOString().slice(0, 10);
      const e = new Date(Date.UTC(y, m + 1, 1)).toISOString().slice(0, 10);
      const days = (Date.UTC(y, m + 1, 1) - Date.UTC(y, m, 1)) / 86_400_000;
      const usePerDay = 50 + 4 * Math.max(0, 12 - 2 * m);
      bills.push({ billId: s, meterId: "G", periodStart: s, periodEnd: e, usage: usePerDay * days, readType: m === 5 && y === 2024 ? "estimated" : "actual", demandKw: null, powerFactor: null, total: 0, statementDate: null, source: src });
    }
  }
  const baseline = fitMeterBaseline({ meter, building, bills, weather: steppedWeather(), normals: undefined, tempUnit: "C" });

  it("recovers the heating slope and balance point", () => {
    expect(baseline.fit?.kind).toBe("3PH");
    expect(baseline.fit!.breakpoints[0]).toBeCloseTo(12, 6);
    expect(baseline.fit!.slopes[0]!.value).toBeCloseTo(-4, 6);
  });

  it("leaves estimated reads out of the fit, saying why", () => {
    expect(baseline.excluded).toEqual([{ billId: "2024-06-01", reason: "estimated read" }]);
    expect(baseline.points).toHaveLength(35);
  });

  it("normalizes to the typical year: Σ predicted use/day × days of a 365-day year (hand-computed)", () => {
    // Months 0…6 at T = 0…12 add 48, 40, 32, 24, 16, 8, 0 therm/day above the 50 base.
    const days = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];
    const expected = days.reduce((s, d, m) => s + d * (50 + 4 * Math.max(0, 12 - 2 * m)), 0);
    expect(baseline.normalizedAnnual).toBeCloseTo(expected, 4);
    expect(baseline.typicalSource).toBe("history");
  });
});

describe("per-bill weather adjustment", () => {
  it("is 1:1 when the bill's months are the typical months (constructed: each month's weather is the same every year)", async () => {
    const { fitMeterBaseline } = await import("../../src/model/billBaselines.ts");
    const building: Building = {
      buildingId: "B", name: "B", floorArea: 1, areaUnit: "m2", floorAreaM2: 1, timezone: "UTC",
      weatherStation: "W", useType: null, tenantPage: false, source: src,
    };
    const meter: Meter = { meterId: "G", buildingId: "B", commodity: "gas", unit: "therm", tariffId: "T", multiplier: 1, account: null, source: src };
    const bills: Bill[] = [];
    for (let y = 2023; y <= 2025; y++) for (let m = 0; m < 12; m++) {
      const s = new Date(Date.UTC(y, m, 1)).toISOString().slice(0, 10);
      const e = new Date(Date.UTC(y, m + 1, 1)).toISOString().slice(0, 10);
      const days = (Date.UTC(y, m + 1, 1) - Date.UTC(y, m, 1)) / 86_400_000;
      bills.push({ billId: s, meterId: "G", periodStart: s, periodEnd: e, usage: (50 + 4 * Math.max(0, 12 - 2 * m)) * days, readType: "actual", demandKw: null, powerFactor: null, total: 0, statementDate: null, source: src });
    }
    const b = fitMeterBaseline({ meter, building, bills, weather: steppedWeather(), normals: undefined, tempUnit: "C" });
    expect(b.perBill).toHaveLength(36);
    for (const p of b.perBill) expect(p.expectedAtTypicalWeather).toBeCloseTo(p.expectedAtActualWeather, 6);
    // January 2024: 31 days × (50 + 4·12) = 3,038 therm (hand-computed).
    expect(b.perBill.find((p) => p.billId === "2024-01-01")!.expectedAtActualWeather).toBeCloseTo(3038, 6);
  });
});
