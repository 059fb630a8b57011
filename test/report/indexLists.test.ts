/**
 * The index's per-building lists on a long portfolio: which rows it shows, in what order, the
 * sentence and the link to the whole list only when cut, and totals over every building.
 * Expected figures are hand-computed from the fixtures (test/report/fixture.ts).
 */
import { describe, expect, it } from "vitest";
import { INDEX_LIST_SHOWN, INDEX_LIST_WHOLE_MAX, indexSubset } from "../../src/report/indexSubset.ts";
import { indexBuildingsList, indexForecastList } from "../../src/report/indexLists.ts";
import type { BuildingsTable } from "../../src/report/buildingsTable.ts";
import type { ForecastChangeTable } from "../../src/report/forecastIndex.ts";
import type { TableModel } from "../../src/report/siteModel.ts";
import { buildSiteModel } from "../../src/report/buildSiteModel.ts";
import { fixtureInput, manyBuildingsInput } from "./fixture.ts";

/** A one-column table of `names` (the lists only read the first cell). */
function table(names: readonly string[]): TableModel {
  return { caption: "Test list", sortable: true, columns: [{ label: "Building", numeric: false }], rows: names.map((n) => [{ text: n }]) };
}

const names = (n: number) => Array.from({ length: n }, (_, i) => `Site ${String(i + 1).padStart(2, "0")}`);

describe("indexSubset", () => {
  it("keeps a list of up to INDEX_LIST_WHOLE_MAX rows whole, and shows the first INDEX_LIST_SHOWN by rank of a longer one", () => {
    expect(INDEX_LIST_WHOLE_MAX).toBe(20);
    expect(INDEX_LIST_SHOWN).toBe(10);
    const twenty = Array.from({ length: 20 }, (_, i) => i);
    expect(indexSubset(twenty, (a, b) => b - a)).toBeNull();
    const rows = Array.from({ length: 21 }, (_, i) => i);
    expect(indexSubset(rows, (a, b) => b - a)).toEqual([20, 19, 18, 17, 16, 15, 14, 13, 12, 11]);
    // the input is not reordered
    expect(rows[0]).toBe(0);
  });
});

describe("indexBuildingsList", () => {
  it("a short portfolio: the whole table, unchanged, and no link", () => {
    const list: BuildingsTable = { table: table(names(20)), lastYearCosts: names(20).map((_, i) => i) };
    const shown = indexBuildingsList(list, "USD");
    expect(shown.table).toBe(list.table);
    expect(shown.cut).toBeNull();
  });

  it("a long portfolio: the 10 largest billed costs, largest first, ties by name, no cost last; totals over every building", () => {
    // 25 buildings: Site 01 … Site 25 cost 100 × k, except Site 25 (no bill) and Site 24 = Site 23 = 2,300.
    const costs: (number | null)[] = names(25).map((_, i) => 100 * (i + 1));
    costs[23] = 2300;
    costs[24] = null;
    const list: BuildingsTable = { table: table(names(25)), lastYearCosts: costs };
    const { table: t, cut } = indexBuildingsList(list, "USD");
    expect(t.rows.map((r) => r[0].text)).toEqual(["Site 23", "Site 24", "Site 22", "Site 21", "Site 20", "Site 19", "Site 18", "Site 17", "Site 16", "Site 15"]);
    expect(t.columns).toBe(list.table.columns);
    expect(t.caption).toBe("Test list: the 10 of 25 buildings with the largest billed cost, largest first");
    // Σ shown = 2,300 × 2 + 2,200 + … + 1,500 = 4,600 + 14,800 = 19,400; Σ all = 100 × (1 + … + 23) + 2,300 = 27,600 + 2,300 = 29,900.
    expect(cut).toEqual({
      shown: "Showing the 10 of 25 buildings with the largest billed cost over the last 12 months, largest first.",
      totals: "Together they were billed $19,400.00, 64.9 % of the $29,900.00 billed to all 25 buildings.",
      href: "buildings.html",
      linkText: "All 25 buildings",
      linkNote: ": the same columns, in the portfolio's order, on a page of their own.",
    });
    // the complete list is left as it was, for its own page
    expect(list.table.rows).toHaveLength(25);
  });
});

describe("indexForecastList", () => {
  it("null without forecast drivers; whole (no link) for a short list", () => {
    expect(indexForecastList(null, "USD")).toBeNull();
    const list: ForecastChangeTable = { table: table(names(3)), changes: [30, 0, -10], lastYearBilled: [100, 100, 100] };
    expect(indexForecastList(list, "USD")).toEqual({ table: list.table, cut: null });
  });

  it("a long list: the 10 largest changes either way, in the ranking's order (largest increase first); totals over every building", () => {
    // Ranked as forecastChangeTable ranks them (largest increase first): +2,200, +2,000, …, +200, 0, −100, …, −1,100 (22 rows).
    const changes = [...Array.from({ length: 11 }, (_, i) => 2200 - 200 * i), 0, ...Array.from({ length: 11 }, (_, i) => -100 * (i + 1))].slice(0, 23);
    const list: ForecastChangeTable = { table: table(names(23)), changes, lastYearBilled: changes.map(() => 10_000) };
    const { table: t, cut } = indexForecastList(list, "USD")!;
    // Largest |change|: +2,200 … +1,000 (Site 01–07), −1,100 and −1,000 (Site 23, 22), then −900 (Site 21) before +800 (Site 08).
    expect(t.rows.map((r) => r[0].text)).toEqual(["Site 01", "Site 02", "Site 03", "Site 04", "Site 05", "Site 06", "Site 07", "Site 21", "Site 22", "Site 23"]);
    // Σ changes = (2,200 + … + 200) − (100 + … + 1,100) = 13,200 − 6,600 = 6,600 over Σ billed 230,000 = +2.9 %;
    // Σ shown = (2,200 + … + 1,000) − (900 + 1,000 + 1,100) = 11,200 − 3,000 = 8,200.
    expect(cut).toEqual({
      shown: "Showing the 10 of 23 buildings whose cost changes most, up or down, from the largest increase to the largest decrease.",
      totals: "Over all 23 buildings the changes add up to +\u2060$6,600.00, +2.9 % of last year's $230,000.00: 11 cost more, 11 less, 1 the same. The 10 shown add up to +\u2060$8,200.00.",
      href: "forecast.html",
      linkText: "Next year's cost of all 23 buildings",
      linkNote: ", ranked by the change, on a page of its own.",
    });
  });
});

describe("the index and the list pages of a 24-building portfolio", () => {
  const model = buildSiteModel(manyBuildingsInput(24));
  const cost = (row: { sort?: string }[]) => Number(row[3].sort);

  it("the index shows 10 buildings of each list, links the whole lists, and the list pages hold all 24", () => {
    expect(model.index.buildingsTable.rows).toHaveLength(10);
    expect(model.index.buildingsCut?.linkText).toBe("All 24 buildings");
    expect(model.buildingList.table.rows).toHaveLength(24);
    // the list page keeps the portfolio's order and the index's columns
    expect(model.buildingList.table.rows.map((r) => r[0].href)).toEqual(Array.from({ length: 24 }, (_, i) => `buildings/B${i + 1}.html`));
    expect(model.buildingList.table.columns).toEqual(model.index.buildingsTable.columns);
    // Buildings 15 … 24 bill the most (E2's bills × k): largest first.
    expect(model.index.buildingsTable.rows.map((r) => r[0].text)).toEqual(Array.from({ length: 10 }, (_, i) => `Building ${String(24 - i).padStart(3, "0")}`));
    const shownCosts = model.index.buildingsTable.rows.map(cost);
    expect(shownCosts).toEqual([...shownCosts].sort((a, b) => b - a));
    // change of building k = (−1)^k × 100 k: the 10 largest either way are 15 … 24, increases first
    expect(model.index.forecastChangeTable!.rows.map((r) => r[3].text)).toEqual(["+\u2060$2,400.00", "+\u2060$2,200.00", "+\u2060$2,000.00", "+\u2060$1,800.00", "+\u2060$1,600.00", "−\u2060$1,500.00", "−\u2060$1,700.00", "−\u2060$1,900.00", "−\u2060$2,100.00", "−\u2060$2,300.00"]);
    expect(model.index.forecastCut?.href).toBe("forecast.html");
    expect(model.forecastList.table!.rows).toHaveLength(24);
    expect(model.forecastList.totals).toBe("Over all 24 buildings the changes add up to +\u2060$1,200.00, +0.4 % of last year's $300,000.00: 12 cost more, 12 less.");
  });

  it("the billed-cost card and the list page sum every building, not the 10 shown", () => {
    let all = 0;
    for (const r of model.buildingList.table.rows) all += cost(r);
    const shown = model.index.buildingsTable.rows.reduce((s, r) => s + cost(r), 0);
    const card = model.index.costFigures.find((f) => f.id === "billed-total")!.value;
    const money = (v: number) => `$${v.toLocaleString("en-US", { minimumFractionDigits: 2, maximumFractionDigits: 2 })}`;
    expect(card).toBe(money(all));
    expect(card).not.toBe(money(shown));
    expect(model.buildingList.lede).toContain(`billed ${money(all)} together`);
    expect(model.index.buildingsCut!.totals).toContain(`of the ${money(all)} billed to all 24 buildings`);
  });

  it("the navigation offers both lists on every page, marked current on its own", () => {
    expect(model.index.nav.map((n) => n.label)).toEqual(["Portfolio", "Bills to dispute", "Buildings", "Next year's cost", "Methods", "Data and downloads"]);
    expect(model.buildingList.nav.find((n) => n.current)?.href).toBe("buildings.html");
    expect(model.forecastList.nav.find((n) => n.current)?.href).toBe("forecast.html");
    expect(model.buildingList.canonical).toBe("/reports/buildings.html");
  });
});

describe("a short portfolio", () => {
  it("the index shows every building with no link; the list pages exist with the same rows", () => {
    const model = buildSiteModel(fixtureInput());
    expect(model.index.buildingsCut).toBeNull();
    expect(model.buildingList.table).toEqual(model.index.buildingsTable);
    // no forecast drivers in the plain fixture: the forecast page says so
    expect(model.index.forecastChangeTable).toBeNull();
    expect(model.index.forecastCut).toBeNull();
    expect(model.forecastList.table).toBeNull();
    expect(model.forecastList.lede).toMatch(/^No building has a forecast/);
  });
});
