/** Building-page forecast view: budget table, drivers in words, escalation, track-record verdict, index ranking (hand-computed from the fixture). */
import { describe, expect, it } from "vitest";
import { buildSiteModel } from "../../src/report/buildSiteModel.ts";
import { budgetTable, driverSentences, escalationSentences, trackRecordVerdict } from "../../src/report/forecastSection.ts";
import { fullFixtureInput } from "./fixture.ts";

describe("building forecast section", () => {
  const input = fullFixtureInput();
  const model = buildSiteModel(input);
  const f = model.buildings[0].forecast!;

  it("monthly table comes from the building's own bands, not sums of per-meter percentiles", () => {
    // Fixture: per-meter P10s sum to 4,200 in April; the building's own P10 is 4,250.
    expect(f.chart!.table.rows[0].map((c) => c.text)).toEqual(["Apr 2025", "$4,250.00", "$4,460.00", "$4,750.00", "$4,300.00"]);
    expect(f.chart!.table.rows[2][4].text).toBe("—");
    expect(f.monthlyTable!.caption).not.toContain("sums of per-meter");
  });

  it("budget: commodity P50 by month, whole-building column, 3-month totals with low and high", () => {
    const t = f.budgetTable!;
    expect(t.columns.map((c) => c.label)).toEqual(["Month", "Electricity", "Gas", "Whole building"]);
    expect(t.rows.map((r) => r.map((c) => c.text))).toEqual([
      ["Apr 2025", "$3,700.00", "$760.00", "$4,460.00"],
      ["May 2025", "$3,710.00", "$760.00", "$4,470.00"],
      ["Jun 2025", "$3,720.00", "$760.00", "$4,480.00"],
      ["Total, 3 months (P50)", "$11,130.00", "$2,280.00", "$13,410.00"],
      ["Low total (P10)", "$10,800.00", "$2,150.00", "$13,100.00"],
      ["High total (P90)", "$11,500.00", "$2,420.00", "$13,800.00"],
    ]);
  });

  it("a single commodity has no whole-building column", () => {
    const detail = { ...input.buildingForecasts![0], byCommodity: input.buildingForecasts![0].byCommodity.slice(0, 1) };
    expect(budgetTable(detail, "USD")!.columns.map((c) => c.label)).toEqual(["Month", "Electricity"]);
  });

  it("drivers in currency and words; they add up to the change (−120 + 300 + 70 = 250)", () => {
    expect(f.drivers[0]).toBe("Over the same 2 calendar months (Apr 2024 to May 2024 last year), next year's likely cost is $8,930.00 against $8,680.00 billed: +\u2060$250.00 (+2.9 %).");
    expect(f.drivers[1]).toMatch(/^Weather: −\u2060\$120\.00\. Last year's weather was harsher than a typical year/);
    expect(f.drivers[2]).toMatch(/^Rates: \+\u2060\$300\.00\. .*costs more/);
    expect(f.drivers[3]).toMatch(/^Usage trend: \+\u2060\$70\.00\./);
    // Columns: months, billed, as it should have been (no correction here), forecast, change, billing errors corrected, weather, rates, usage trend.
    expect(f.driversTable!.rows[0].map((c) => c.text)).toEqual(["Apr 2024 – May 2024", "$8,680.00", "$8,680.00", "$8,930.00", "+\u2060$250.00 (+2.9 %)", "$0.00", "−\u2060$120.00", "+\u2060$300.00", "+\u2060$70.00"]);
    const warm = driverSentences({ months: ["2024-01"], lastYearCost: 0, forecastCost: 10, change: 10, weather: 10, rates: 0, usageTrend: 0 }, "USD");
    expect(warm[0]).toContain("+\u2060$10.00.");
    expect(warm[1]).toContain("kinder than a typical year");
    expect(warm[2]).toBe("Rates: no effect (the same prices apply next year).");
  });

  it("escalation: '0 % assumed (not set)' when not stated; stated rates per commodity; forecasts are estimates", () => {
    expect(input.portfolio.settings.escalationStated).toBe(false);
    expect(f.assumptions[0]).toContain("0 % a year assumed (escalation not set in portfolio.yaml)");
    expect(f.assumptions.join(" ")).toContain("Forecasts are estimates");
    const stated = escalationSentences({ escalationStated: true, escalation: { electricity: 0.03, gas: 0.025, water: 0 } }, ["electricity", "gas"]);
    expect(stated[0]).toContain("electricity 3 %, gas 2.5 % a year, compounded");
  });

  it("track record verdict against the naive forecast", () => {
    expect(f.trackRecordVerdict).toBe("Better than repeating last year's bills: forecasting the past year, the method missed the year's cost by 2.4 %, against 6.1 % for the same month last year. 83 % of the months compared fell inside the 80 % range.");
    const acc = (e: number) => ({ months: 12, annualErrorPct: e, cvRmsePct: 5, coverage: null });
    expect(trackRecordVerdict({ model: acc(5), naive: acc(-2) })).toMatch(/^Worse than/);
    expect(trackRecordVerdict({ model: acc(3), naive: acc(-3.4) })).toMatch(/^About as good as/);
    expect(trackRecordVerdict({ model: acc(3), naive: null })).toContain("no earlier year");
    expect(trackRecordVerdict(null)).toBeNull();
  });
});

describe("index forecast ranking", () => {
  it("one row per building with drivers, largest increase first, linking the building", () => {
    const input = fullFixtureInput();
    input.buildingForecasts!.push({ ...input.buildingForecasts![0], buildingId: "B2", drivers: { months: ["2024-04"], lastYearCost: 1000, forecastCost: 1500, change: 500, weather: 0, rates: 100, usageTrend: 400 } });
    const t = buildSiteModel(input).index.forecastChangeTable!;
    expect(t.rows.map((r) => [r[0].href, r[3].text, r[4].text])).toEqual([
      ["buildings/B2.html", "+\u2060$500.00", "+50 %"],
      ["buildings/B1.html", "+\u2060$250.00", "+2.9 %"],
    ]);
    // Columns from the sixth: billing errors corrected (none here), weather, rates, usage trend.
    expect(t.rows[1].slice(5).map((c) => c.text)).toEqual(["$0.00", "−\u2060$120.00", "+\u2060$300.00", "+\u2060$70.00"]);
    expect(buildSiteModel(input).index.forecastTrackRecord).toMatch(/^Better than/);
  });
});
