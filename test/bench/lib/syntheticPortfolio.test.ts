import { describe, expect, it } from "vitest";
import { DateTime } from "luxon";
import type { IntervalSeries, WeatherSeries } from "../../../src/domain/types.ts";
import {
  BENCH_PROFILES,
  bandCoverage,
  expectedEnergy,
  generateMeter,
  heldOutScore,
  hourOfWeekMean,
  inSchoolTerm,
  localHours,
  monthlyBills,
  officeOccupancy,
  sameHourLastYear,
  type MeterProfile,
} from "../../../bench/lib/syntheticPortfolio.ts";

const ZONE = "America/Los_Angeles";
const H = 3_600_000;

/** A sine-wave year of invented temperatures covering 2013 in Los Angeles time. */
function inventedWeather(): WeatherSeries {
  const startMs = DateTime.fromISO("2012-12-31T00:00", { zone: ZONE }).toMillis();
  const n = 368 * 24;
  return {
    stationId: "T",
    startMs,
    tempC: Float64Array.from({ length: n }, (_, i) => 11 + 8 * Math.sin((2 * Math.PI * i) / (365 * 24)) + 4 * Math.sin((2 * Math.PI * i) / 24)),
    filled: new Uint8Array(n),
  };
}

describe("local calendar", () => {
  it("2013 in America/Los_Angeles has 8760 hours; 10 March 2013 has 23 and 3 November 2013 has 25", () => {
    // U.S. DST rule (Energy Policy Act of 2005): second Sunday of March to first Sunday of November.
    const hours = localHours("2013-01-01", 365, ZONE);
    expect(hours).toHaveLength(8760);
    expect(hours.filter((h) => h.isoDate === "2013-03-10")).toHaveLength(23);
    expect(hours.filter((h) => h.isoDate === "2013-11-03")).toHaveLength(25);
    expect(hours[0]).toMatchObject({ isoDate: "2013-01-01", weekday: 2, hour: 0, holiday: true }); // 1 Jan 2013 was a Tuesday, New Year's Day
  });
});

describe("schedules and physics", () => {
  it("expectedEnergy follows base + occupied load + degree terms (hand-computed)", () => {
    const p = {
      base: 10,
      occupiedLoad: 20,
      hvac: [
        { mode: "heating" as const, slopePerK: 2, balanceOccupiedC: 15, balanceUnoccupiedC: 10 },
        { mode: "cooling" as const, slopePerK: 3, balanceOccupiedC: 20, balanceUnoccupiedC: 99 },
      ],
    };
    expect(expectedEnergy(p, 1, 5)).toBe(10 + 20 + 2 * 10); // occupied heating below 15 °C
    expect(expectedEnergy(p, 0, 5)).toBe(10 + 2 * 5); // setback balance 10 °C
    expect(expectedEnergy(p, 1, 25)).toBe(10 + 20 + 3 * 5); // occupied cooling above 20 °C
    expect(expectedEnergy(p, 0, 25)).toBe(10); // cooling off when empty
    expect(expectedEnergy(p, 0.5, 17)).toBe(20); // dead band between 15 and 20 °C
  });

  it("school term calendar and office hours (as defined in the module)", () => {
    expect(inSchoolTerm(1, 3)).toBe(false);
    expect(inSchoolTerm(1, 4)).toBe(true);
    expect(inSchoolTerm(3, 27)).toBe(false);
    expect(inSchoolTerm(6, 14)).toBe(true);
    expect(inSchoolTerm(7, 15)).toBe(false);
    expect(inSchoolTerm(9, 1)).toBe(true);
    expect(inSchoolTerm(12, 21)).toBe(false);
    const base = { hourStartMs: 0, isoDate: "2013-01-08", month: 1, day: 8, holiday: false };
    expect(officeOccupancy({ ...base, weekday: 2, hour: 10 })).toBe(1);
    expect(officeOccupancy({ ...base, weekday: 2, hour: 7 })).toBe(0.5);
    expect(officeOccupancy({ ...base, weekday: 6, hour: 10 })).toBe(0);
    expect(officeOccupancy({ ...base, weekday: 2, hour: 10, holiday: true })).toBe(0);
  });
});

describe("generator", () => {
  const weather = inventedWeather();
  const hours = localHours("2013-01-01", 365, ZONE);

  it("is deterministic: the same seed gives identical values, another seed different ones", () => {
    const p = BENCH_PROFILES[0]!;
    const a = generateMeter(p, weather, hours);
    const b = generateMeter(p, weather, hours);
    const c = generateMeter({ ...p, seed: p.seed + 1 }, weather, hours);
    expect(a.series.values).toEqual(b.series.values);
    expect(a.series.values).not.toEqual(c.series.values);
    expect(a.expected).toEqual(c.expected); // the physics does not depend on the seed
    expect(a.series.values).toHaveLength(8760);
    expect(a.series.intervalMinutes).toBe(60);
  });

  it("without noise the values are the physics exactly; with noise the year total stays within 1 % of it", () => {
    const p: MeterProfile = { ...BENCH_PROFILES[4]!, dailyNoiseSd: 0, hourlyNoiseSd: 0 };
    const quiet = generateMeter(p, weather, hours);
    expect(quiet.series.values).toEqual(quiet.expected);
    const noisy = generateMeter(BENCH_PROFILES[4]!, weather, hours);
    const sum = (a: Float64Array): number => a.reduce((s, v) => s + v, 0);
    expect(Math.abs(sum(noisy.series.values) / sum(noisy.expected) - 1)).toBeLessThan(0.01); // zero-mean noise, 8760 draws
  });
});

describe("naive baselines and scores (tiny hand examples)", () => {
  it("same hour last year: local wall time 364 days back, else one week further back", () => {
    const day = 24 * H;
    const hist = [0, H, 2 * H];
    const vals = [5, 7, 9];
    // Target 364 days after hour 1 → 7; target 371 days after hour 2 with nothing at 364 → falls back to 9.
    const out = sameHourLastYear(hist, vals, [364 * day + H, 371 * day + 2 * H, 500 * day], "UTC");
    expect(out[0]).toBe(7);
    expect(out[1]).toBe(9);
    expect(out[2]).toBeNaN();
  });

  it("same hour last year matches local clock time across a DST difference", () => {
    // 2014-03-09 (DST starts) 12:00 PDT ← 2013-03-10 12:00 PDT (also a DST start day); 364 days apart on the calendar.
    const lastYear = DateTime.fromISO("2013-03-10T12:00", { zone: ZONE }).toMillis();
    const target = DateTime.fromISO("2014-03-09T12:00", { zone: ZONE }).toMillis();
    expect(sameHourLastYear([lastYear - H, lastYear, lastYear + H], [1, 2, 3], [target], ZONE)[0]).toBe(2);
  });

  it("hour-of-week mean skips non-finite history and gives NaN for unseen hours", () => {
    expect(Array.from(hourOfWeekMean([0, 0, 1, 1], [2, 4, 9, Number.NaN], [0, 1, 2]))).toEqual([3, 9, Number.NaN]);
  });

  it("held-out CV(RMSE) and NMBE with p = 0 (hand-computed)", () => {
    // y = [10, 20], ŷ = [12, 18]: RMSE = 2, ȳ = 15 → 13.33 %; Σ(y − ŷ) = 0 → NMBE 0.
    const a = heldOutScore([10, 20], [12, 18]);
    expect(a.cvRmsePct).toBeCloseTo(40 / 3, 10);
    expect(a.nmbePct).toBe(0);
    // ŷ = [9, 18]: Σ(y − ŷ) = 3 over Σy = 30 → +10 % (model too low); RMSE = sqrt((1 + 4)/2).
    const b = heldOutScore([10, 20], [9, 18]);
    expect(b.nmbePct).toBeCloseTo(10, 10);
    expect(b.cvRmsePct).toBeCloseTo((100 * Math.sqrt(2.5)) / 15, 10);
  });

  it("band coverage counts the edges as inside", () => {
    expect(bandCoverage([1, 2, 5, 0], [0, 2, 0, 0.5], [2, 3, 2, 1])).toBe(0.5);
  });
});

describe("calendar-month bills", () => {
  const hours = localHours("2013-01-01", 365, ZONE);
  const series: IntervalSeries = {
    meterId: "M",
    intervalMinutes: 60,
    startMs: Float64Array.from(hours, (h) => h.hourStartMs),
    values: new Float64Array(hours.length).fill(1),
  };

  it("1 kWh every hour: January 744, March 743 (DST), November 721, year 8760 (hand-computed)", () => {
    const { bills, incompleteMonths } = monthlyBills(series, ZONE, "2013-01", 12);
    expect(incompleteMonths).toEqual([]);
    expect(bills).toHaveLength(12);
    expect(bills[0]).toMatchObject({ periodStart: "2013-01-01", periodEnd: "2013-02-01", usage: 744 });
    expect(bills[2]!.usage).toBe(743);
    expect(bills[10]!.usage).toBe(721);
    expect(bills[11]).toMatchObject({ periodStart: "2013-12-01", periodEnd: "2014-01-01" });
    expect(bills.reduce((s, b) => s + b.usage, 0)).toBe(8760);
  });

  it("a month with a missing value is listed as incomplete, not billed", () => {
    const values = series.values.slice();
    values[800] = Number.NaN; // 2013-02-03
    const { bills, incompleteMonths } = monthlyBills({ ...series, values }, ZONE, "2013-01", 13);
    expect(incompleteMonths).toEqual(["2013-02", "2014-01"]); // January 2014 has no data at all
    expect(bills).toHaveLength(11);
  });
});
