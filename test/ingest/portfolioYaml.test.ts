import { describe, expect, it } from "vitest";
import { normalizeBasePath, parsePercent, parsePortfolioYaml } from "../../src/ingest/portfolioYaml.ts";

describe("parsePortfolioYaml", () => {
  it("reads every setting of the contract, with percentages as fractions", () => {
    const text = [
      "name: Example Holdings",
      "currency: EUR",
      "as_of: 2025-12-31",
      "forecast_months: 18",
      "escalation: { electricity: 3%, gas: 4.5 % }",
      "tolerances: { usage_pct: 2, demand_pct: 3, cost_abs: 1.00, cost_pct: 0.5 }",
      "degree_day_base: { heating: 65, cooling: 65, unit: F }",
      "base_path: reports/energy",
      "interval_timestamp: end",
      "weather_max_gap_hours: 4",
    ].join("\n");
    const r = parsePortfolioYaml(text, "p/portfolio.yaml");
    expect(r.issues).toEqual([]);
    expect(r.fatal).toBe(false);
    expect(r.settings).toMatchObject({
      name: "Example Holdings", currency: "EUR", asOf: "2025-12-31", forecastMonths: 18,
      escalation: { electricity: 0.03, gas: 0.045, water: 0 }, escalationStated: true,
      tolerances: { usagePct: 2, demandPct: 3, costAbs: 1, costPct: 0.5 },
      degreeDayBase: { heating: 65, cooling: 65, unit: "F" },
      basePath: "/reports/energy/", intervalTimestamp: "end", weatherMaxGapHours: 4,
    });
  });

  it("uses defaults: 6 h weather gaps, start stamps, escalation 0 and not stated", () => {
    const r = parsePortfolioYaml("name: X\n", "portfolio.yaml");
    expect(r.settings).toMatchObject({ weatherMaxGapHours: 6, intervalTimestamp: "start", basePath: "/", escalationStated: false, asOf: null });
  });

  it("reports a bad value at its line:column and keeps the default (not fatal)", () => {
    const r = parsePortfolioYaml("name: X\nforecast_months: twelve\ninterval_timestamp: middle\n", "portfolio.yaml");
    expect(r.fatal).toBe(false);
    expect(r.issues.map((i) => [i.line, i.column, i.severity])).toEqual([[2, 18, "error"], [3, 21, "error"]]);
    expect(r.settings?.forecastMonths).toBe(12);
  });

  it("warns about an unknown key with a suggestion", () => {
    const r = parsePortfolioYaml("name: X\nbasepath: /a/\n", "portfolio.yaml");
    expect(r.issues[0]).toMatchObject({ severity: "warning", line: 2, column: 1 });
    expect(r.issues[0].hint).toMatch(/base_path/);
  });

  it("is fatal without a name or when the YAML does not parse (error with line:col)", () => {
    expect(parsePortfolioYaml("currency: USD\n", "portfolio.yaml").fatal).toBe(true);
    const broken = parsePortfolioYaml("name: X\nescalation: { gas: 3%\n", "portfolio.yaml");
    expect(broken.fatal).toBe(true);
    expect(broken.issues[0].line).toBeGreaterThan(0);
  });

  it("normalizes base_path and reads percents", () => {
    expect(["", "/", "reports", "/a/b", "//x//"].map(normalizeBasePath)).toEqual(["/", "/", "/reports/", "/a/b/", "/x/"]);
    expect([parsePercent("3%"), parsePercent(5), parsePercent("abc")]).toEqual([0.03, 0.05, null]);
  });
});

describe("contacts (optional, one line per building for its tenant page)", () => {
  it("reads one line per building id, whitespace collapsed; files without it stay valid", () => {
    const r = parsePortfolioYaml('name: P\ncontacts:\n  B1: "Site office,\n    555-0142"\n  B2: Facilities desk, ext. 12\n', "portfolio.yaml");
    expect(r.issues).toEqual([]);
    expect(r.settings!.contacts).toEqual({ B1: "Site office, 555-0142", B2: "Facilities desk, ext. 12" });
    expect(r.contactPositions!.B2).toEqual({ line: 5, column: 3 });
    expect(parsePortfolioYaml("name: P\n", "portfolio.yaml").settings!.contacts).toBeUndefined();
  });
  it("rejects a list, an empty line and an over-long line with their position", () => {
    expect(parsePortfolioYaml("name: P\ncontacts: [a, b]\n", "p.yaml").issues[0]).toMatchObject({ line: 2, column: 11, severity: "error", message: "contacts must map building ids to a contact line" });
    const r = parsePortfolioYaml(`name: P\ncontacts:\n  B1:\n  B2: ${"x".repeat(301)}\n`, "p.yaml");
    expect(r.issues.map((i) => [i.line, i.message])).toEqual([
      [3, "contact for B1 must be a line of text"],
      [4, "contact for B2 is 301 characters long"],
    ]);
    expect(r.settings!.contacts).toEqual({});
  });
});
