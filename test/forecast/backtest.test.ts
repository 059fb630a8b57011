/**
 * Weather bases, corrected bills, months of history and the rolling-origin backtests on the
 * synthetic portfolios (real NOAA Seattle temperatures 2012–2015 and NOAA 1981–2010 hourly
 * normals from the vega-datasets npm package; invented buildings and prices, seeded noise).
 */
import { beforeAll, describe, expect, it } from "vitest";
import { accuracyOf, basisYears, correctBills, monthsOfBills, rollingBacktest, typicalForBasis, weatherBasisCandidates, type RollingBacktest } from "../../src/forecast/index.ts";
import type { WeatherYear } from "../../src/forecast/weatherYears.ts";
import type { CorrectedBill } from "../../src/audit/types.ts";
import { SYNTHETIC_AS_OF, syntheticForecastPortfolio } from "../../bench/lib/forecastPortfolio.ts";
import { bill, calendarBills } from "./helpers.ts";

/** Invented years: January temperature = year − 2000, other months 10. */
const years: WeatherYear[] = Array.from({ length: 20 }, (_, i) => ({ year: 2001 + i, monthlyTemp: [i + 1, ...new Array<number>(11).fill(10)] }));

describe("weather bases (hand-computed)", () => {
  it("recent-10 averages the last 10 complete years, recent-15 the last 15, all-years every one", () => {
    expect(basisYears("recent-10", years)).toEqual([2011, 2012, 2013, 2014, 2015, 2016, 2017, 2018, 2019, 2020]);
    // January: mean of 11…20 = 15.5; of 6…20 = 13; of 1…20 = 10.5.
    expect(typicalForBasis("recent-10", years, null)![0]).toBeCloseTo(15.5, 12);
    expect(typicalForBasis("recent-15", years, null)![0]).toBeCloseTo(13, 12);
    expect(typicalForBasis("all-years", years, null)![0]).toBeCloseTo(10.5, 12);
    expect(typicalForBasis("normals", years, null)).toBeNull();
    expect(typicalForBasis("normals", years, new Array(12).fill(3))![5]).toBe(3);
  });

  it("an incomplete year is not averaged", () => {
    const withGap = [...years, { year: 2021, monthlyTemp: [99, NaN, ...new Array<number>(10).fill(10)] }];
    expect(basisYears("recent-10", withGap).at(-1)).toBe(2020);
  });

  it("with fewer years than the window, identical candidates are reported once", () => {
    const three = years.slice(-3);
    const c = weatherBasisCandidates(three, true);
    expect(c.map((x) => x.basis)).toEqual(["normals", "recent-10"]);
    expect(c[1]!.sameAs).toEqual(["recent-15", "all-years"]);
  });
});

describe("bills as they should have been (hand-computed)", () => {
  const bills = calendarBills(2024, () => 100, () => 50).map((b, i) => ({ ...b, billId: `b${i + 1}` }));
  const correction = (billId: string | null, billedTotal: number, correctedTotal: number, extra: Partial<CorrectedBill> = {}): CorrectedBill => ({
    billId, periodStart: "2024-03-01", periodEnd: "2024-04-01", billedTotal, correctedTotal, corrected: null, usage: null, demandKw: null, correctedOn: "test", ...extra,
  });

  it("replaces a corrected total, drops a voided duplicate, adds an unbilled period, ignores info findings", () => {
    const dup = { ...bills[4]!, billId: "dup" };
    const r = correctBills([...bills, dup], [
      { meterId: "M1", severity: "warning", amountAtStake: 10, corrections: [correction("b3", 50, 40, { corrected: {} as never, usage: 80 })] },
      { meterId: "M1", severity: "error", amountAtStake: 50, corrections: [correction("dup", 50, 0)] },
      { meterId: "M1", severity: "warning", amountAtStake: -30, corrections: [correction(null, 0, 30, { periodStart: "2025-01-01", periodEnd: "2025-02-01" })] },
      { meterId: "M1", severity: "info", amountAtStake: 5, corrections: [correction("b4", 50, 45)] },
    ]);
    expect(r.bills.find((b) => b.billId === "b3")).toMatchObject({ total: 40, usage: 80 });
    expect(r.bills.find((b) => b.billId === "dup")).toBeUndefined();
    expect(r.bills.find((b) => b.billId === "b4")!.total).toBe(50);
    expect(r.bills.find((b) => b.periodStart === "2025-01-01")).toMatchObject({ total: 30, readType: "estimated" });
    expect(r.deltaByBill.size).toBe(3);
  });

  it("of two findings on one bill, the larger correction is used", () => {
    const r = correctBills(bills, [
      { meterId: "M1", severity: "warning", amountAtStake: 5, corrections: [correction("b3", 50, 45)] },
      { meterId: "M1", severity: "warning", amountAtStake: 20, corrections: [correction("b3", 50, 30)] },
    ]);
    expect(r.bills.find((b) => b.billId === "b3")!.total).toBe(30);
  });
});

describe("months of bills and accuracy (hand-computed)", () => {
  it("a year of calendar-month bills is 12 months; a re-issued statement counts once", () => {
    const bills = calendarBills(2024, () => 1, () => 1);
    expect(monthsOfBills(bills, "2024-12-31")).toBe(12);
    expect(monthsOfBills([...bills, { ...bills[0]!, billId: "again" }], "2024-12-31")).toBe(12);
    expect(monthsOfBills([bill("2024-01-01", "2024-02-15", 1, 1)], "2024-12-31")).toBe(1); // 45 days / 30.44 = 1.48 → 1
  });

  it("accuracy over meter-months: annual error on totals, CV(RMSE) with divisor n, mean absolute meter error", () => {
    // meter A: actual 100, 100, forecast 110, 90 → 0 %; meter B: actual 200, forecast 220 → +10 %.
    const a = accuracyOf([{ actual: [100, 100], forecast: [110, 90] }, { actual: [200], forecast: [220] }])!;
    expect(a.annualErrorPct).toBeCloseTo((100 * 20) / 400, 12);
    expect(a.meanAbsMeterAnnualErrorPct).toBeCloseTo(5, 12);
    // errors 10, 10, 20 → sqrt(600/3) / (400/3)
    expect(a.cvRmsePct).toBeCloseTo((100 * Math.sqrt(600 / 3)) / (400 / 3), 10);
  });
});

describe("rolling-origin backtests on the synthetic Seattle portfolios", () => {
  let plain: RollingBacktest;
  let drift: RollingBacktest;
  let short: RollingBacktest;
  beforeAll(() => {
    plain = rollingBacktest(syntheticForecastPortfolio("seattle"), { asOf: SYNTHETIC_AS_OF });
    drift = rollingBacktest(syntheticForecastPortfolio("seattle-drift"), { asOf: SYNTHETIC_AS_OF });
    short = rollingBacktest(syntheticForecastPortfolio("seattle-short"), { asOf: SYNTHETIC_AS_OF });
  }, 180_000);

  it("cuts at every year the four years of bills allow (3, 2 and 1 years before the cut)", () => {
    expect(plain.origins).toEqual(["2014-12-31", "2013-12-31", "2012-12-31"]);
    expect(plain.summaries.map((s) => s.historyMonths.min)).toEqual([36, 24, 12]);
  });

  it("scores the NOAA 1981–2010 normals against the recent history and says which won", () => {
    expect(plain.bases.map((b) => b.basis)).toContain("normals");
    expect(plain.basis).toBe(plain.bases[0]!.basis);
    expect(plain.basisReason).toMatch(/3 rolling origin/);
  });

  it("a meter with 14 months of bills takes no part in the backtests", () => {
    expect(short.monthsOfBills.get("BENCH-ANNEX-E")).toBe(14);
    expect(short.meters.flat().some((m) => m.meterId === "BENCH-ANNEX-E")).toBe(false);
  });

  for (const [name, get] of [["seattle", () => plain], ["seattle-drift", () => drift]] as const) {
    it(`${name}: pooled out-of-sample P10–P90 coverage is 70–90 %`, () => {
      const c = get().overall.coverage!;
      expect(c).toBeGreaterThanOrEqual(0.7);
      expect(c).toBeLessThanOrEqual(0.9);
    });

    it(`${name}: averaged over the origins, the annual cost error is below the naive forecast's`, () => {
      const { model, naive } = get().overall;
      expect(Math.abs(model!.annualErrorPct)).toBeLessThan(Math.abs(naive!.annualErrorPct));
    });

    it(`${name}: with one year of history the calibrated band still covers at least 70 %`, () => {
      const one = get().summaries.find((s) => s.historyMonths.min === 12)!;
      expect(one.coverage!).toBeGreaterThanOrEqual(0.7);
    });
  }

  for (const [name, get] of [["seattle", () => plain], ["seattle-drift", () => drift]] as const) {
    it(`${name}: averaged over the origins, monthly CV(RMSE) is below the naive forecast's`, () => {
      expect(get().overall.model!.cvRmsePct).toBeLessThan(get().overall.naive!.cvRmsePct);
    });

    it(`${name}: at the cut with three years of bills, both errors are below the naive forecast's`, () => {
      const s = get().summaries.find((x) => x.historyMonths.min === 36)!;
      expect(Math.abs(s.model!.annualErrorPct)).toBeLessThan(Math.abs(s.naive!.annualErrorPct));
      expect(s.model!.cvRmsePct).toBeLessThan(s.naive!.cvRmsePct);
    });
  }

  it("seattle: at the cut with two years of bills, monthly CV(RMSE) is below the naive forecast's", () => {
    const s = plain.summaries.find((x) => x.historyMonths.min === 24)!;
    expect(s.model!.cvRmsePct).toBeLessThan(s.naive!.cvRmsePct);
  });

  it("the backtests choose a calendar-month adjustment and score every one", () => {
    expect(plain.adjustments.map((a) => a.adjustment).sort()).toEqual(["all-years", "last-year", "none"]);
    expect(plain.adjustment).toBe(plain.adjustments[0]!.adjustment);
  });

  // Known gaps of issue 12, measured and left failing on purpose (it.fails turns red once they are fixed).
  // 2014 was a warm year at Seattle; a forecast made at the end of 2013 from 2012–2013 runs high.
  it.fails("seattle: at the cut with two years of bills, the annual cost error is below the naive forecast's (measured +1.2 % vs −0.8 %)", () => {
    const s = plain.summaries.find((x) => x.historyMonths.min === 24)!;
    expect(Math.abs(s.model!.annualErrorPct)).toBeLessThan(Math.abs(s.naive!.annualErrorPct));
  });

  it.fails("seattle-drift: at the cut with two years of bills (the school's retrofit comes the next year), both errors are below the naive forecast's (measured annual +3.5 % vs +1.3 %, CV 12.4 % vs 12.4 %)", () => {
    const s = drift.summaries.find((x) => x.historyMonths.min === 24)!;
    expect(Math.abs(s.model!.annualErrorPct)).toBeLessThan(Math.abs(s.naive!.annualErrorPct));
    expect(s.model!.cvRmsePct).toBeLessThan(s.naive!.cvRmsePct);
  });

  it.fails("seattle-drift: coverage is 70–90 % at every origin (the cut before the retrofit measured 60 %)", () => {
    for (const s of drift.summaries) expect(s.coverage!).toBeGreaterThanOrEqual(0.7);
  });
});
