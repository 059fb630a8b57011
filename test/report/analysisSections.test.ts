import { describe, expect, it } from "vitest";
import type { Bill, Building, Meter } from "../../src/domain/types.ts";
import type { ReportBaseline } from "../../src/report/input.ts";
import { buildSiteModel } from "../../src/report/buildSiteModel.ts";
import { euiKwhPerM2, kwhPerM2ToKbtuPerFt2, siteKwh } from "../../src/report/energy.ts";
import { compareCommodity, signedPct, tenantMonths, tenantSentences } from "../../src/report/tenantPage.ts";
import { meetsMonthlyGuideline14, verdictFor } from "../../src/report/baselineSection.ts";
import { alignmentSentences, colorScaleMax, heatmapDays, localDayHour, qualitySections, weatherActionLabel } from "../../src/report/qualitySection.ts";
import { describeDataFile } from "../../src/report/dataPage.ts";
import { intensityChart, normalizedChangePct, RANKING_MAX_BARS } from "../../src/report/portfolioCharts.ts";
import type { BuildingContext } from "../../src/report/buildingPage.ts";
import { ZERO_RUN, fullFixtureInput } from "./fixture.ts";
import { FT2_PER_M2, KBTU_PER_KWH, KWH_PER_THERM } from "../../src/core/units.ts";

describe("energy conversions", () => {
  it("kBtu per kWh follows from the International Table Btu (NIST SP 811: 1 Btu_IT = 1,055.05585262 J)", () => {
    // 1 kWh = 3.6e6 J exactly (SI definition of the watt-hour).
    expect(KBTU_PER_KWH).toBeCloseTo(3.6e6 / 1055.05585262 / 1000, 6);
  });
  it("ft² per m² follows from the international foot (0.3048 m exactly)", () => {
    expect(FT2_PER_M2).toBeCloseTo(1 / 0.3048 ** 2, 4);
  });
  it("kWh per therm follows from 1 therm = 100,000 Btu_IT (U.S. EIA) and NIST SP 811", () => {
    expect(KWH_PER_THERM).toBeCloseTo((100_000 * 1055.05585262) / 3.6e6, 4);
  });
  it("converts EUI and site energy (hand-computed)", () => {
    // 100 kWh/m² × 3.4121416 kBtu/kWh ÷ 10.7639104 ft²/m² = 31.699832 kBtu/ft² (NIST SP 811 Btu, exact foot)
    expect(kwhPerM2ToKbtuPerFt2(100)).toBeCloseTo(31.699832, 5);
    // 1 therm = 100,000 Btu (EIA) = 29.3071070 kWh; ccf at the EIA average 1.037 therm/ccf
    expect(siteKwh("gas", "therm", 10)).toBeCloseTo(293.071070, 5);
    expect(siteKwh("gas", "ccf", 10)).toBeCloseTo(10 * 1.037 * 29.3071070, 5);
    expect(siteKwh("electricity", "MWh", 2)).toBe(2000);
    expect(siteKwh("water", "gal", 10)).toBeNull();
    expect(siteKwh("gas", "m3", 10)).toBeNull();
    expect(euiKwhPerM2(250_000, 1000)).toBe(250);
    expect(euiKwhPerM2(250_000, 0)).toBeNull();
  });
});

describe("tenant page comparison (fixture E1: latest bill E1-14 vs E1-02)", () => {
  const input = fullFixtureInput();
  const { portfolio } = input;
  const billsByMeter = new Map<string, Bill[]>();
  for (const b of portfolio.bills) billsByMeter.set(b.meterId, [...(billsByMeter.get(b.meterId) ?? []), b]);
  const b1 = portfolio.buildings[0];
  const meters = portfolio.meters.filter((m) => m.buildingId === "B1");

  it("compares use per day with the weather expectation and a year earlier, and per floor area (hand-computed)", () => {
    const c = compareCommodity("electricity", meters, billsByMeter, input.baselines, b1.floorAreaM2)!;
    // Both bills bill 37,794 kWh (30,000 × (1 + 0.3·cos 30°), rounded); E1-14 has 28 days
    // (Feb 5 – Mar 5, 2025), E1-02 29 days (Feb 5 – Mar 5, 2024, a leap year).
    expect(c.current.use).toBe(37_794);
    expect(c.lastYear!.use).toBe(37_794);
    expect(c.current.usePerDay).toBeCloseTo(37_794 / 28, 6);
    expect(c.changePct).toBeCloseTo((29 / 28 - 1) * 100, 6); // 3.5714 %
    // The fixture's expectation at actual weather: E1-14 0.9 × billed, E1-02 1.0 × billed.
    expect(c.current.expectedPerDay).toBeCloseTo((0.9 * 37_794) / 28, 6); // 1214.8
    expect(c.lastYear!.expectedPerDay).toBeCloseTo(37_794 / 29, 6);
    expect(c.vsExpectedPct).toBeCloseTo((1 / 0.9 - 1) * 100, 6); // 11.11 %
    expect([c.current.estimated, c.lastYear!.estimated]).toEqual([false, false]);
    // 52,000 ft² × 0.09290304 = 4,830.958 m²; 37,794 / 4,830.958 = 7.82330 kWh/m² → 2.47998 kBtu/ft².
    expect(c.perM2).toBeCloseTo(7.8233, 4);
    expect(c.perFt2).toBeCloseTo(2.47998, 4);
  });

  it("gas is site energy in kWh (therm × 29.3071) and has no expectation without a model", () => {
    const g = compareCommodity("gas", meters, billsByMeter, input.baselines, b1.floorAreaM2)!;
    expect(g.unit).toBe("kWh");
    expect(g.current.use).toBeCloseTo(1134 * 29.3071070, 4);
    expect(g.vsExpectedPct).toBeNull();
    expect(tenantSentences(g).join(" ")).toContain("no reliable weather expectation");
  });

  it("a baseline that misses Guideline 14 gives no expectation to occupants", () => {
    const weak = input.baselines!.map((b) => ({ ...b, meetsGuideline14: false }));
    expect(compareCommodity("electricity", meters, billsByMeter, weak, b1.floorAreaM2)!.vsExpectedPct).toBeNull();
  });

  it("an estimated bill a year earlier is marked, and never the only comparison", () => {
    const marked = new Map([...billsByMeter].map(([k, v]) => [k, v.map((b) => (b.billId === "E1-02" ? { ...b, readType: "estimated" as const } : b))]));
    const withModel = compareCommodity("electricity", meters, marked, input.baselines, b1.floorAreaM2)!;
    expect(withModel.lastYear!.estimated).toBe(true);
    const text = tenantSentences(withModel).join(" ");
    expect(text).toContain("11.1 % higher than that estimate");
    expect(text).toContain("The earlier figure is an estimate by the utility, not a meter reading.");
    // Without the weather expectation the estimated bill would be the only comparison: it is not used.
    const alone = tenantSentences(compareCommodity("electricity", meters, marked, [], b1.floorAreaM2)!).join(" ");
    expect(alone).toContain("is an estimate by the utility, not a meter reading, so it is not used as a comparison on its own");
    expect(alone).not.toMatch(/higher than|lower than|level with/);
  });

  it("an estimated latest bill says so", () => {
    const marked = new Map([...billsByMeter].map(([k, v]) => [k, v.map((b) => (b.billId === "E1-14" ? { ...b, readType: "estimated" as const } : b))]));
    const text = tenantSentences(compareCommodity("electricity", meters, marked, input.baselines, b1.floorAreaM2)!).join(" ");
    expect(text).toContain("This figure is an estimate by the utility, not a meter reading");
  });

  it("signed changes never show −0 %", () => {
    expect(signedPct(-0.04)).toBe("0 %");
    expect(signedPct(0.04)).toBe("0 %");
    expect(signedPct(3.5714)).toBe("+3.6 %");
    expect(signedPct(-12.25)).toBe("−12.3 %");
    expect(signedPct(null)).toBe("—");
  });

  it("chart months: the latest completely billed month and up to 13 before it, bills shared out by days (hand-computed)", () => {
    const months = tenantMonths("electricity", meters, billsByMeter, input.baselines);
    // E1 bills run Jan 5, 2024 – Mar 5, 2025: Jan 2024 and Mar 2025 are partly billed, so Feb 2024 … Feb 2025.
    expect(months.map((m) => m.month)).toEqual(["2024-02", "2024-03", "2024-04", "2024-05", "2024-06", "2024-07", "2024-08", "2024-09", "2024-10", "2024-11", "2024-12", "2025-01", "2025-02"]);
    const e1 = billsByMeter.get("E1")!;
    const u13 = e1.find((b) => b.billId === "E1-13")!.usage; // Jan 5 – Feb 5, 2025: 31 days, 4 in February
    const u14 = e1.find((b) => b.billId === "E1-14")!.usage; // Feb 5 – Mar 5, 2025: 28 days, 24 in February
    const feb = months[months.length - 1];
    expect(feb.perDay).toBeCloseTo(((u13 * 4) / 31 + (u14 * 24) / 28) / 28, 6);
    expect(feb.expectedPerDay).toBeCloseTo(((0.98 * u13 * 4) / 31 + (0.9 * u14 * 24) / 28) / 28, 6);
    // E1-04 (Apr 5 – May 5, 2024) is the fixture's estimated read.
    expect(months.filter((m) => m.estimated).map((m) => m.month)).toEqual(["2024-04", "2024-05"]);
  });

  it("a month the bills leave partly uncovered keeps its place on the chart with no value", () => {
    // Without E1-07 (Jul 5 – Aug 5, 2024) July and August 2024 are only partly billed.
    const holed = new Map([...billsByMeter].map(([k, v]) => [k, v.filter((b) => b.billId !== "E1-07")]));
    const months = tenantMonths("electricity", meters, holed, input.baselines);
    expect(months).toHaveLength(13);
    expect(months.filter((m) => m.perDay == null).map((m) => m.month)).toEqual(["2024-07", "2024-08"]);
    const page = buildSiteModel({ ...input, portfolio: { ...portfolio, bills: portfolio.bills.filter((b) => b.billId !== "E1-07") } }).tenants[0];
    const chart = page.commodities[0].chart!;
    expect(chart.description).toContain("No bar for Jul 2024, Aug 2024: the bills for those months leave days out or cover some twice.");
    expect(chart.table.rows.find((r) => r[0].text === "Jul 2024")!.map((c) => c.text)).toEqual(["Jul 2024", "—", "—", "not shown: the bills leave days out or cover some twice"]);
  });

  it("the tenant page names no findings, money or bill math, and only the commodities the building has", () => {
    const model = buildSiteModel(input);
    expect(model.tenants.map((t) => t.path)).toEqual(["buildings/B1/tenant.html"]);
    const page = model.tenants[0];
    const text = JSON.stringify(page);
    for (const word of ["finding", "audit", "$", "USD", "cost", "tariff", "recomputed", "at stake", "charge", "model", "CV(RMSE)"]) {
      expect(text.toLowerCase(), word).not.toContain(word.toLowerCase());
    }
    // B1 has electricity and gas meters, no water meter.
    expect(page.commodities.map((c) => c.commodity)).toEqual(["electricity", "gas"]);
    expect(page.title).toBe("Heron Street Office: electricity and gas use");
    expect(text).not.toMatch(/water/i);
    const sentences = page.commodities[0].sentences.join(" ");
    expect(sentences).toContain("Actual use was 11.1 % higher than that estimate.");
    expect(sentences).toContain("the latest bill is 3.6 % higher than that.");
    expect(sentences).not.toMatch(/more per day than|allowing for the weather/);
    expect(page.caution).toMatch(/meter readings and local weather.*Expected figures are estimates/);
    expect(page.commodities[0].chart!.months).toHaveLength(13);
    expect(page.contact).toBeNull();
  });

  it("shows the building's contact line from portfolio.yaml", () => {
    const withContact = fullFixtureInput();
    withContact.portfolio.settings.contacts = { B1: "Site office: Mon–Fri 8–5, 555-0142" };
    expect(buildSiteModel(withContact).tenants[0].contact).toBe("Site office: Mon–Fri 8–5, 555-0142");
  });
});

describe("Guideline 14 verdict", () => {
  it("limits are inclusive: CV(RMSE) 15 % and |NMBE| 5 % pass, a hair over fails (ASHRAE Guideline 14, monthly)", () => {
    expect(meetsMonthlyGuideline14({ cvRmsePct: 15, nmbePct: 5 })).toBe(true);
    expect(meetsMonthlyGuideline14({ cvRmsePct: 15, nmbePct: -5 })).toBe(true);
    expect(meetsMonthlyGuideline14({ cvRmsePct: 15.001, nmbePct: 0 })).toBe(false);
    expect(meetsMonthlyGuideline14({ cvRmsePct: 3, nmbePct: -5.001 })).toBe(false);
  });
  it("says what failed in plain words", () => {
    const v = verdictFor({ cvRmsePct: 18.2, nmbePct: 0.5, r2: 0.8, n: 12, p: 3 });
    expect(v.tone).toBe("warn");
    expect(v.text).toContain("CV(RMSE) 18.2 % is above 15 %");
    expect(v.text).not.toContain("NMBE 0.5");
    expect(verdictFor({ cvRmsePct: 8, nmbePct: 0.4, r2: 0.9, n: 12, p: 3 })).toEqual({
      tone: "ok",
      text: "Close fit: CV(RMSE) 8 % and NMBE 0.4 % are inside the monthly limits of ASHRAE Guideline 14 (15 % and ±5 %), so this meter's weather-normalized figures are fit for comparing one year with another.",
    });
    expect(v.text).toMatch(/^Loose fit: /);
    expect(v.text).not.toMatch(/Meets|can be relied on/);
    expect(verdictFor(null).tone).toBe("none");
  });
});

describe("data-quality heatmap", () => {
  const input = fullFixtureInput();
  const series = input.portfolio.intervals.get("E1")!;
  const days = heatmapDays(series, input.quality![0].mask, "America/Chicago", 1);
  const byDay = new Map(days.map((d) => [d.day, d]));

  it("keeps the last 366 local days, 24 hours each (≤ 8,784 cells)", () => {
    expect(days.length).toBe(366);
    expect(days[days.length - 1].day).toBe("2025-03-04");
    expect(days.every((d) => d.values.length === 24 && d.flagged.length === 24)).toBe(true);
  });

  it("flags the planted zero run at local 02:00–07:59 CST (IANA: America/Chicago is UTC−6 in January)", () => {
    expect(localDayHour(ZERO_RUN.startMs, "America/Chicago")).toEqual({ day: "2025-01-10", hour: 2 });
    const d = byDay.get("2025-01-10")!;
    expect(d.flagged.map((f, h) => (f ? h : -1)).filter((h) => h >= 0)).toEqual([2, 3, 4, 5, 6, 7]);
    expect(d.values[3]).toBe(0);
  });

  it("leaves the skipped spring-forward hour empty and holds both repeated autumn hours (IANA rules, 2024)", () => {
    // 2024-03-10 02:00 does not exist in America/Chicago; 2024-11-03 01:00 happens twice.
    expect(byDay.get("2024-03-10")!.values[2]).toBeNull();
    const night = byDay.get("2024-11-04")!.values[1]!; // an ordinary night hour: 4 × 4 kWh
    expect(byDay.get("2024-11-03")!.values[1]).toBeCloseTo(2 * night, 6);
  });

  it("colour scale stops at the 99th percentile of unflagged hours (the 400 kWh spike does not set it)", () => {
    expect(colorScaleMax(days)).toBeLessThan(60);
    expect(colorScaleMax([{ values: [1, 2, 3], flagged: [0, 0, 1] }])).toBe(2);
  });
});

describe("clock-offset sentences", () => {
  it("reads +3 as stamped 3 hours late, corrected by moving readings earlier (cleaning-stage convention)", () => {
    const lines = alignmentSentences({ suggestedOffsetHours: 3, appliedOffsetHours: 0, strong: true, note: "", scores: [{ offsetHours: 0, score: 0.1 }, { offsetHours: 3, score: 0.62 }] });
    expect(lines[0]).toContain("stamped 3 hours late");
    expect(lines[0]).toContain("moved 3 hours earlier");
    expect(lines[0]).toContain("62%");
    expect(lines[1]).toBe("No correction was applied to the data.");
    expect(alignmentSentences(null)).toEqual([]);
  });

  it("folds the cleaning stage's raw note in: no repeat of 'timestamps agree', hints kept as a sentence", () => {
    const scores = [{ offsetHours: 0, score: 0.4 }, { offsetHours: 1, score: 0.3 }];
    const agree = alignmentSentences({ suggestedOffsetHours: 0, appliedOffsetHours: 0, strong: false, note: "timestamps agree with the weather", scores });
    expect(agree).toEqual(["The meter's clock agrees with the weather station's: the load follows outdoor temperature best with no shift.", "No correction was applied to the data."]);
    const late = alignmentSentences({
      suggestedOffsetHours: 1,
      appliedOffsetHours: 0,
      strong: true,
      note: "meter timestamps look 1 h late; subtract 1 h to correct; consistent with interval-end timestamps",
      scores: [{ offsetHours: 0, score: 0.3 }, { offsetHours: 1, score: 0.5 }],
    });
    expect(late.join(" ")).not.toContain("subtract");
    expect(late[2]).toBe("The shift is consistent with interval-end timestamps.");
    const none = alignmentSentences({ suggestedOffsetHours: 0, appliedOffsetHours: 0, strong: false, note: "no load–temperature relationship found; timestamps left as they are", scores: [{ offsetHours: 0, score: 0 }] });
    expect(none[0]).toContain("could not be checked");
    expect(none).toHaveLength(2);
  });
});

describe("wording fixes", () => {
  it("a weather gap 'kept' is left missing (longer than weather_max_gap_hours), not 'still used'", () => {
    expect(weatherActionLabel("kept", 6)).toBe("left missing (longer than the 6-hour limit for filling)");
    expect(weatherActionLabel("interpolated", 6)).toBe("filled by straight-line interpolation");
    const model = buildSiteModel(fullFixtureInput());
    const rows = model.buildings[0].weatherQualityTable!.rows;
    expect(rows.map((r) => r[3].text)).toEqual(["filled by straight-line interpolation", `left missing (longer than the ${fullFixtureInput().portfolio.settings.weatherMaxGapHours}-hour limit for filling)`]);
  });

  it("a building's own data file is described by its base name", () => {
    expect(describeDataFile("buildings/B1/forecast.csv")).toBe("This building's rows of forecast.csv: forecast use and cost by meter and calendar month, with a low, likely and high cost.");
    expect(describeDataFile("buildings/B1/models.json")).toMatch(/^This building's entries of models.json: every weather model/);
    expect(describeDataFile("buildings/B1/other.csv")).toBe("This building's rows of other.csv.");
    expect(describeDataFile("findings.csv")).toMatch(/^Every audit finding/);
  });

  it("a meter without detections gets no (empty) detections table", () => {
    const input = fullFixtureInput();
    input.quality![0].detections = [];
    const [section] = qualitySections(input.portfolio.buildings[0], input.portfolio.meters, input.quality, input.portfolio.intervals);
    expect(section.detectionsTable).toBeNull();
    expect(section.summary).toMatch(/^No problems found in [\d,]+ intervals\.$/);
  });
});

describe("portfolio charts", () => {
  it("ranks EUI from last-12-month site energy (electricity kWh + gas therm × 29.3071) over floor area", () => {
    const input = fullFixtureInput();
    const chart = buildSiteModel(input).index.intensityChart!;
    // The window (Mar 5, 2024 – Mar 4, 2025) holds bills 03..14 of each meter exactly.
    const sum = (meterId: string) => input.portfolio.bills.filter((b) => b.meterId === meterId && b.periodStart >= "2024-03-05").reduce((s, b) => s + b.usage, 0);
    const b1 = (sum("E1") + sum("G1") * 29.3071) / (52_000 * 0.09290304);
    const b2 = sum("E2") / (18_000 * 0.09290304);
    expect(chart.items.map((i) => i.value)).toEqual([Math.round(b1 * 10) / 10, Math.round(b2 * 10) / 10]);
  });

  it("draws the highest RANKING_MAX_BARS buildings of a large portfolio and keeps every building in its table", () => {
    const count = RANKING_MAX_BARS + 5;
    const contexts: BuildingContext[] = Array.from({ length: count }, (_, i) => {
      const building = { buildingId: `B${i}`, name: `Building ${i}`, floorAreaM2: 1000 } as Building;
      const meter = { meterId: `M${i}`, buildingId: building.buildingId, commodity: "electricity", unit: "kWh" } as Meter;
      // Twelve calendar-month bills of 1,000·(i + 1) kWh each: EUI rises with i, so the last is highest.
      const bills = Array.from({ length: 12 }, (_, k) => ({
        billId: `b${i}-${k}`, meterId: meter.meterId,
        periodStart: new Date(Date.UTC(2024, k, 1)).toISOString().slice(0, 10),
        periodEnd: new Date(Date.UTC(2024, k + 1, 1)).toISOString().slice(0, 10),
        usage: 1000 * (i + 1),
      }) as Bill);
      return { building, meters: [meter], billsByMeter: new Map([[meter.meterId, bills]]), asOf: "2024-12-31", heatContentOf: () => 1.037, currency: "USD" };
    });
    const chart = intensityChart(contexts)!;
    expect(chart.items).toHaveLength(RANKING_MAX_BARS);
    expect(chart.items[0]!.label).toBe(`Building ${count - 1}`);
    expect(chart.items.at(-1)!.label).toBe(`Building ${count - RANKING_MAX_BARS}`);
    expect(chart.table.rows).toHaveLength(count);
    expect(chart.title).toContain(`the ${RANKING_MAX_BARS} highest of ${count} buildings`);
    expect(chart.description).toContain(`All ${count} buildings are in the table`);
    // A portfolio that fits draws every building, under the plain title.
    const small = intensityChart(contexts.slice(0, 3))!;
    expect(small.items).toHaveLength(3);
    expect(small.title).toBe("Energy use intensity, last 12 months (kWh per m²)");
  });

  it("weather-normalized change: +10 % when adjusted use rises 10 % (hand-computed)", () => {
    const building = { buildingId: "X", floorAreaM2: 1000 } as Building;
    const meter = { meterId: "M", buildingId: "X", commodity: "electricity", unit: "kWh" } as Meter;
    const bills: Bill[] = [];
    // Two non-leap years of calendar-month bills, so each 365-day window is one calendar year.
    for (let i = 0; i < 24; i++) {
      const start = new Date(Date.UTC(2021, i, 1)).toISOString().slice(0, 10);
      const end = new Date(Date.UTC(2021, i + 1, 1)).toISOString().slice(0, 10);
      bills.push({ billId: `b${i}`, meterId: "M", periodStart: start, periodEnd: end, usage: 100 } as Bill);
    }
    // Year 2 actual weather was harsher: expected at actual 100 → typical 110 in year 1, and
    // 100 → 121 in year 2: adjusted 110 per bill, then 121 → +10 %.
    const baseline = { meterId: "M", kind: "3PH", perBill: bills.map((b, i) => ({ billId: b.billId, expectedAtActualWeather: 100, expectedAtTypicalWeather: i < 12 ? 110 : 121 })) } as unknown as ReportBaseline;
    const ctx: BuildingContext = { building, meters: [meter], billsByMeter: new Map([["M", bills]]), asOf: "2022-12-31", heatContentOf: () => 1.037, currency: "USD" };
    expect(normalizedChangePct([ctx], [baseline])).toBeCloseTo(10, 9);
    // The window ends at the meter's last read even when as_of is later: same answer.
    expect(normalizedChangePct([{ ...ctx, asOf: "2023-02-20" }], [baseline])).toBeCloseTo(10, 9);
    // Without a baseline for the meter there is nothing to report.
    expect(normalizedChangePct([ctx], [])).toBeNull();
  });
});

describe("building page wiring (full fixture)", () => {
  const model = buildSiteModel(fullFixtureInput());
  const [b1, b2] = model.buildings;

  it("has baselines, data quality (in full on the meter pages, verdicts on the building page), forecast and a tenant link for B1 only", () => {
    const pagesOfB1 = model.meterBills.filter((m) => m.buildingId === "B1");
    const baselines = pagesOfB1.flatMap((m) => (m.baseline ? [m.baseline] : []));
    expect(baselines.map((s) => [s.meterId, s.verdictTone, s.charts.map((c) => c.kind)])).toEqual([
      ["E1", "ok", ["baseline-scatter", "baseline-time"]],
      ["G1", "none", ["baseline-scatter"]],
    ]);
    expect(b1.baselinesTable!.rows.map((r) => [r[0].href, r[1].text])).toEqual(baselines.map((s) => [`bills/B1/${s.meterId}.html#baseline-h`, s.verdict]));
    const time = baselines[0].charts[1];
    expect(time.kind === "baseline-time" && time.hasBand && time.bills[0].lowPerDay! < time.bills[0].highPerDay!).toBe(true);
    expect(time.table.columns.map((c) => c.label)).toContain("Band (kWh/day)");
    const quality = pagesOfB1.flatMap((m) => (m.quality ? [m.quality] : []));
    expect(quality).toHaveLength(1);
    expect(quality[0].detectionsTable!.rows).toHaveLength(2);
    expect(quality[0].detectionsTable!.rows[0][1].text).toBe("Jan 10, 2025, 02:00");
    expect(quality[0].detectionsTable!.rows[0][4].text).toBe("left out of the models (kept in the data)");
    expect(b1.qualityTable!.rows.map((r) => [r[0].href, r[1].text])).toEqual([[`bills/B1/${quality[0].meterId}.html#quality-h`, quality[0].summary]]);
    expect(b1.weatherQualityTable!.rows).toHaveLength(2);
    expect(b1.forecast!.summary).toContain("$13,410.00");
    expect(b1.forecast!.trackRecordTable!.rows[0][1].text).toBe("−2.4 %");
    expect(b1.tenantHref).toBe("B1/tenant.html");
    expect([b2.baselinesTable, b2.qualityTable, b2.forecast, b2.tenantHref]).toEqual([null, null, null, null]);
    expect(model.meterBills.filter((m) => m.buildingId === "B2").map((m) => [m.baseline, m.quality])).toEqual([[null, null]]);
  });

  it("index: forecast range from the portfolio total, tenant link", () => {
    // Cost first: next year's likely cost leads the index's money cards, and the count list carries no money.
    expect(model.index.costFigures[0]).toEqual({ id: "forecast-total", label: "Forecast cost, next 12 months", value: "$13,410.00", note: "likely (P50); 80 % range $13,100.00 – $13,800.00" });
    expect(model.index.costFigures[1]).toMatchObject({ id: "billed-total", label: "Billed cost, last 12 months" });
    expect(model.index.headline.map((h) => h.value).join(" ")).not.toContain("$");
    expect(model.index.headline.map((h) => h.label).join(" ")).not.toMatch(/weather-normalized|forecast/i);
    expect(model.index.tenantLinks).toEqual([{ name: "Heron Street Office", href: "buildings/B1/tenant.html" }]);
  });
});
