/**
 * One "last 12 months": the index and building pages show the same figures as
 * OUT/data/portfolio.json (`actual_last_12m`, `site_eui_kwh_m2`), built by the real pipeline
 * mapping (toReportInput) and the real JSON writer (buildDataFiles) from one fixture portfolio
 * whose meters end on different days and whose gas is billed in ccf with its own heat content.
 */
import { describe, expect, it } from "vitest";
import type { Portfolio } from "../../src/domain/types.ts";
import type { Tariff } from "../../src/tariff/index.ts";
import { buildDataFiles } from "../../src/report/dataFiles.ts";
import { toReportInput } from "../../src/report/fromAnalysis.ts";
import type { BuildingResults } from "../../src/report/fromAnalysis.ts";
import { buildSiteModel } from "../../src/report/buildSiteModel.ts";
import { fixtureInput } from "./fixture.ts";

describe("pages and portfolio.json agree on the last 12 months", () => {
  const base = fixtureInput();
  // G1 billed in ccf on a tariff of 1.05 therm/ccf; E2's last bill dropped so its last read is a
  // month earlier than the others'; as_of after every last read.
  const portfolio = {
    ...base.portfolio,
    settings: { ...base.portfolio.settings, asOf: "2025-04-30" },
    meters: base.portfolio.meters.map((m) => (m.meterId === "G1" ? { ...m, unit: "ccf" } : m)),
    bills: base.portfolio.bills.filter((b) => !(b.meterId === "E2" && b.periodEnd === "2025-03-05")),
    tariffs: new Map<string, unknown>([["T-gas", { heatContentThermPerCcf: 1.05 }]]),
  };
  expect(portfolio.bills.length).toBe(base.portfolio.bills.length - 1);
  const results: BuildingResults[] = portfolio.buildings.map((building) => ({ building, priced: new Map(), findings: [], baselines: [], intervalBaselines: [], failure: null }));
  const files = buildDataFiles({
    portfolio: portfolio as unknown as Portfolio<Tariff>,
    results,
    findings: [], disputes: [],
    priced: new Map(),
    monthlyMetered: new Map(),
    weatherGaps: [],
    quality: [],
    meteredViews: new Map(),
    forecast: null,
  });
  const json = JSON.parse(files["portfolio.json"]!) as { buildings: Record<string, unknown>[] };
  const input = toReportInput({ portfolio, priced: base.priced, monthlyMetered: new Map(), issues: [], buildDate: "2025-05-01", findings: [], disputes: [], results, quality: [], weatherGaps: [], forecast: null });
  const model = buildSiteModel(input);
  const table = model.index.buildingsTable;
  const col = (label: string) => table.columns.findIndex((c) => c.label === label);

  it("usage per commodity equals actual_last_12m (same unit: kWh, therm)", () => {
    let compared = 0;
    table.rows.forEach((row, i) => {
      const b = json.buildings[i]!;
      for (const [commodity, label] of [["electricity", "Electricity use"], ["gas", "Gas use"]] as const) {
        const summary = b[commodity] as { actual_last_12m: number; unit: string } | undefined;
        if (!summary) continue;
        expect(Math.abs(Number(row[col(label)].sort) - summary.actual_last_12m), `${b.building_id} ${commodity}`).toBeLessThanOrEqual(0.0005 + 1e-9);
        expect(row[col(label)].text.endsWith(summary.unit)).toBe(true);
        compared++;
      }
    });
    expect(compared).toBe(3);
    // Hand-computed for the gas meter: 12 bills of 900 ccf inside its window × 1.05 therm/ccf.
    expect((json.buildings[0]!.gas as { actual_last_12m: number }).actual_last_12m).toBeCloseTo(12 * 900 * 1.05, 3);
  });

  it("energy use intensity equals site_eui_kwh_m2", () => {
    const eui = model.index.intensityChart!.table;
    for (const b of json.buildings) {
      const row = eui.rows.find((r) => r[0].text === b.name);
      if (b.site_eui_kwh_m2 === null) {
        expect(row).toBeUndefined();
        continue;
      }
      expect(Math.abs(Number(row![3].sort) - (b.site_eui_kwh_m2 as number)), String(b.building_id)).toBeLessThanOrEqual(0.0005 + 1e-9);
    }
  });
});
