import { describe, expect, it } from "vitest";
import { buildSiteModel } from "../../src/report/buildSiteModel.ts";
import { EVIL_NAME, fixtureInput } from "./fixture.ts";
import type { MonthlyChartModel } from "../../src/report/siteModel.ts";

describe("buildSiteModel on the fixture portfolio", () => {
  const input = fixtureInput();
  const model = buildSiteModel(input);
  const b1 = model.buildings.find((b) => b.buildingId === "B1")!;
  const e1 = model.meterBills.find((m) => m.meterId === "E1")!;

  it("has one page per building, slugged by building id, with relative links", () => {
    expect(model.buildings.map((b) => b.path)).toEqual(["buildings/B1.html", "buildings/B2.html"]);
    expect(model.index.buildingsTable.rows.map((r) => r[0].href)).toEqual(["buildings/B1.html", "buildings/B2.html"]);
    expect(b1.root).toBe("../");
    expect(b1.nav.map((n) => n.href)).toEqual(["../index.html", "../disputes.html", "../buildings.html", "../forecast.html", "../methods.html", "../data.html"]);
    expect(model.index.nav.every((n) => !n.href.startsWith("/"))).toBe(true);
  });

  it("uses base_path only for canonical links", () => {
    expect(b1.canonical).toBe("/reports/buildings/B1.html");
    expect(model.index.canonical).toBe("/reports/index.html");
  });

  it("passes user text through unchanged, for the template to escape", () => {
    expect(model.buildings[1].title).toBe(EVIL_NAME);
    expect(model.index.buildingsTable.rows[1][0].text).toBe(EVIL_NAME);
  });

  it("never puts NaN, Infinity or undefined text into the model", () => {
    const json = JSON.stringify(model);
    expect(json).not.toMatch(/NaN|Infinity|undefined|Invalid Date/);
  });

  it("puts each meter's bills on its own page, two folders down, linked from the building page", () => {
    expect(model.meterBills.map((m) => m.path)).toEqual(["bills/B1/E1.html", "bills/B1/G1.html", "bills/B2/E2.html"]);
    expect(e1.root).toBe("../../");
    expect(e1.canonical).toBe("/reports/bills/B1/E1.html");
    expect(e1.nav[0].href).toBe("../../index.html");
    expect(b1.metersTable.rows.map((r) => r[0].href)).toEqual(["bills/B1/E1.html", "bills/B1/G1.html"]);
    expect(b1.meters.map((m) => m.billsHref)).toEqual(["bills/B1/E1.html", "bills/B1/G1.html"]);
  });

  it("shows a bill that needs interval data in words, with no difference (the fixture prices E1-05 $12.34 below its total, but not exactly)", () => {
    const cols = e1.billsTable.columns.map((c) => c.label);
    const row = e1.billsTable.rows[4];
    expect(row[cols.indexOf("Service period")]).toMatchObject({ text: "May 5 – Jun 4, 2024", note: "31 days" });
    expect(row[0]).toMatchObject({ text: "E1-05", href: "bills/B1/E1.html#bill-E1-05" });
    expect(row[cols.indexOf("Difference (billed quantities)")]).toMatchObject({ text: "needs interval data", tone: "muted" });
    expect(JSON.stringify(e1.billsTable)).not.toContain("12.34");
    expect(b1.metersTable.rows[0].map((c) => c.text)).toContain("14 need interval data");
  });

  it("says why a bill was not priced", () => {
    const g1 = model.meterBills.find((m) => m.meterId === "G1")!;
    const cols = g1.billsTable.columns.map((c) => c.label);
    expect(g1.billsTable.rows[0][cols.indexOf("Difference (billed quantities)")].text).toBe("not re-priced: tariff T-gas has no version before 2024-03-01");
    expect(g1.bills[0]).toMatchObject({ notPricedReason: "tariff T-gas has no version before 2024-03-01", bases: [] });
  });

  it("shows each computed line as quantity × rate = amount with its status", () => {
    const math = e1.bills[0].bases[0];
    expect(math.basis).toBe("billed");
    expect(math.lines[0]).toMatchObject({ label: "Customer charge", quantity: "1 bill", rate: "$25.00 per bill", amount: "$25.00", status: "exact" });
    expect(math.lines[2]).toMatchObject({ quantity: "—", status: "needs interval data" });
    expect(math.total).toBe(math.billed);
    // Not exact: the state in words, no difference.
    expect(math.difference).toBeNull();
    expect(math.stateText).toContain("need interval data");
  });

  it("sums the last 12 months of billed cost (window aligned with read dates, so whole bills)", () => {
    // Latest bill end 2025-03-05 → as-of 2025-03-04; E1's and G1's last reads are 2025-03-05, so
    // each meter's window is the 365 days 2024-03-05 … 2025-03-04: bills 03..14 of E1 and G1.
    expect(model.index.windowText).toBe("the 12 months up to each meter's last read, ending no later than Mar 4, 2025");
    const inWindow = input.portfolio.bills.filter((b) => b.meterId !== "E2" && b.periodStart >= "2024-03-05");
    expect(inWindow).toHaveLength(24);
    const expected = inWindow.reduce((s, b) => s + b.total, 0);
    const shown = b1.summary.find((f) => f.label === "Billed cost, the 12 months up to each meter's last read")!.value;
    expect(shown).toBe(new Intl.NumberFormat("en-US", { style: "currency", currency: "USD" }).format(expected));
  });

  it("uses each meter's own window: a later as_of does not cut unbilled days off the cost (hand-computed)", () => {
    // as_of 2025-04-20 is after every last read (2025-03-05): each meter's window still ends at
    // its last read, so the same 24 whole bills count. A calendar window ending on as_of
    // (2024-04-21 … 2025-04-20) would have dropped most of bill 03 and added no bill for the
    // unbilled 46 days, showing less than the bills.
    const later = fixtureInput();
    later.portfolio.settings = { ...later.portfolio.settings, asOf: "2025-04-20" };
    const m = buildSiteModel(later);
    const inWindow = later.portfolio.bills.filter((b) => b.meterId !== "E2" && b.periodStart >= "2024-03-05");
    const expected = inWindow.reduce((s, b) => s + b.total, 0);
    const shown = m.buildings.find((b) => b.buildingId === "B1")!.summary.find((f) => f.label === "Billed cost, the 12 months up to each meter's last read")!.value;
    expect(shown).toBe(new Intl.NumberFormat("en-US", { style: "currency", currency: "USD" }).format(expected));
  });

  it("counts findings by building on the index, linking to the building's audit section (money: the dispute list, test/report/disputesPage.test.ts)", () => {
    const cols = model.index.buildingsTable.columns.map((c) => c.label);
    const iF = cols.indexOf("Findings");
    expect(iF).toBeGreaterThan(0);
    // The fixture has no disputes: no money column.
    expect(cols).not.toContain("To dispute");
    const [r1, r2] = model.index.buildingsTable.rows;
    // Fixture: B1 has a $12.34 total mismatch and an estimated read (no money); B2 has none.
    expect(r1[iF]).toMatchObject({ text: "2", href: "buildings/B1.html#audit-h" });
    expect(r2[iF].text).toBe("0");
  });

  it("charts monthly use per commodity, conserving each meter's billed usage", () => {
    const elec = b1.commodities.find((c) => c.commodity === "electricity")!;
    expect(elec.charts).toHaveLength(1);
    const sum = elec.charts[0].data.filter((d) => d.series === "E1").reduce((s, d) => s + d.value, 0);
    const billed = input.portfolio.bills.filter((b) => b.meterId === "E1").reduce((s, b) => s + b.usage, 0);
    expect(sum).toBeCloseTo(billed, 1); // values rounded to 0.001 per month
    expect(elec.charts[0].table.rows.length).toBe(new Set(elec.charts[0].data.map((d) => d.month)).size);
  });

  it("charts the portfolio's monthly billed cost by commodity, conserving the billed totals", () => {
    const chart = model.index.charts[0] as MonthlyChartModel;
    expect(chart.kind).toBe("monthly-cost");
    expect([...new Set(chart.data.map((d) => d.series))]).toEqual(["Electricity", "Gas"]);
    const billed = input.portfolio.bills.reduce((s, b) => s + b.total, 0);
    const charted = chart.data.reduce((s, d) => s + d.value, 0);
    // Each month-and-commodity value is rounded to the cent: at most 0.005 off per datum.
    expect(Math.abs(charted - billed)).toBeLessThanOrEqual(0.005 * chart.data.length);
    expect(model.index.lede).toBe("Utility bills for 2 buildings, each re-priced from its tariff and checked. “Last 12 months” means the 12 months up to each meter's last read, ending no later than Mar 4, 2025, so a bill not yet received does not read as a drop.");
  });

  it("lists interval data coverage by month", () => {
    expect(e1.meteredTable!.rows[0].map((c) => c.text)).toEqual(["Nov 2024", "28,501 kWh", "2,880 of 2,884", "99.9%"]);
  });

  it("puts findings on the building page, largest money first", () => {
    expect(b1.findingsTable!.rows[0][0].text).toBe("Total does not add up under the tariff");
    expect(model.buildings[1].findingsTable!.rows).toEqual([]);
  });

  it("reports ingest issues on the data page", () => {
    expect(model.data.issueSummary).toBe("1 error and 1 warning were found in the input files.");
    expect(model.data.issuesTable.rows[0][0].text).toBe("bills.csv:9:3");
  });

  it("does not mutate its input", () => {
    const fresh = fixtureInput();
    buildSiteModel(fresh);
    expect(fresh.portfolio.bills).toEqual(fixtureInput().portfolio.bills);
    expect([...fresh.priced.entries()]).toEqual([...fixtureInput().priced.entries()]);
  });

  it("handles a portfolio with no bills without NaN", () => {
    const empty = fixtureInput();
    empty.portfolio.bills = [];
    empty.priced = new Map();
    const m = buildSiteModel(empty);
    expect(JSON.stringify(m)).not.toMatch(/NaN|undefined/);
    expect(m.index.windowText).toBe("no bills");
  });
});

describe("rows rejected", () => {
  it("shows a per-building column only when ingest attributed rejections, and always the portfolio total", () => {
    const plain = buildSiteModel(fixtureInput());
    expect(plain.index.buildingsTable.columns.map((c) => c.label)).not.toContain("Rows rejected");
    expect(plain.index.headline.find((h) => h.label.startsWith("Input rows rejected"))!.value).toBe("2");
    const input = fixtureInput();
    input.rejectedRowsByBuilding = new Map([["B2", 3]]);
    const m = buildSiteModel(input);
    const col = m.index.buildingsTable.columns.findIndex((c) => c.label === "Rows rejected");
    expect(m.index.buildingsTable.rows.map((r) => r[col].text)).toEqual(["0", "3"]);
    expect(m.index.buildingsTable.rows.every((r) => r.length === m.index.buildingsTable.columns.length)).toBe(true);
  });
});
