/**
 * Limits of the tariff loader (issue 16, items 3 and 6), from src/tariff/yaml-check.ts and
 * load-charges.ts: numbers beyond ±1e9, percent outside ±100, demand windows a meter cannot
 * measure, and YAML that would exhaust the parser (nesting, aliases) are errors with a position.
 */
import { describe, expect, it } from "vitest";
import { loadTariff } from "../../src/tariff/load.ts";
import { MAX_YAML_ALIASES, MAX_YAML_FLOW_DEPTH, yamlLimitProblem } from "../../src/tariff/yaml-check.ts";

const BASE = ["id: t", "commodity: electricity", "usage_unit: kWh", "versions:", "  - from: 2024-01-01", "    charges:", "      - label: Customer charge", "        fixed: 10"];
const load = (...extra: string[]) => loadTariff([...BASE, ...extra].join("\n") + "\n", "tariffs/t.yaml");

describe("tariff number limits", () => {
  it("accepts the base", () => {
    expect(load().issues).toEqual([]);
  });
  it.each([
    ["energy rate 1e308", ["      - label: Energy", "        energy: 1e308"], 10],
    ["fixed -2e9", ["      - label: Other", "        fixed: -2e9"], 10],
    ["percent 1e308", ["      - label: Tax", "        percent: 1e308"], 10],
    ["percent -150", ["      - label: Tax", "        percent: -150"], 10],
    ["window_minutes 7", ["      - label: Demand", "        demand: 10", "        window_minutes: 7"], 11],
    ["ratchet months 120", ["      - label: Demand", "        demand: 10", "        ratchet: { percent: 80, months: 120 }"], 11],
  ])("%s is an error at its line", (_name, extra, line) => {
    const r = load(...extra);
    expect(r.tariff).toBeNull();
    expect(r.issues.filter((i) => i.severity === "error").map((i) => i.line)).toContain(line);
  });
  it("percent 100 and window_minutes 5 are allowed", () => {
    expect(load("      - label: Demand", "        demand: 10", "        window_minutes: 5", "      - label: Tax", "        percent: 100").issues).toEqual([]);
  });
});

describe("YAML shape limits", () => {
  it("flow nesting beyond the limit is reported at the bracket", () => {
    const p = yamlLimitProblem(`a: ${"[".repeat(MAX_YAML_FLOW_DEPTH + 1)}`);
    expect(p).toMatchObject({ line: 1, column: 4 + MAX_YAML_FLOW_DEPTH });
  });
  it("brackets and apostrophes inside quoted or plain text do not count", () => {
    expect(yamlLimitProblem(`label: Customer's charge\nname: "${"[".repeat(100)}"\nx: '${"{".repeat(100)}'\n`)).toBeNull();
  });
  it("more aliases than the limit are refused before parsing; a billion-laughs file loads fast", () => {
    const many = `a: &a 1\nb: [${Array(MAX_YAML_ALIASES + 1).fill("*a").join(", ")}]\n`;
    expect(yamlLimitProblem(many)).toMatchObject({ line: 2 });
    const bomb = ['l0: &l0 ["x","x","x","x","x","x","x","x","x","x"]'];
    for (let i = 1; i <= 9; i++) bomb.push(`l${i}: &l${i} [${Array(10).fill(`*l${i - 1}`).join(",")}]`);
    // Refused by counting aliases before parsing, so nothing is expanded (a hang would hit the test timeout).
    const r = loadTariff(`${BASE.join("\n")}\n${bomb.join("\n")}\n`, "tariffs/t.yaml");
    expect(r.issues.some((i) => i.severity === "error" && i.line === 9)).toBe(true);
  });
  it("deep block indentation is refused", () => {
    const text = Array.from({ length: 300 }, (_, i) => `${" ".repeat(i)}k${i}:`).join("\n");
    expect(loadTariff(text, "tariffs/t.yaml").issues[0]).toMatchObject({ line: 258, message: "indentation deeper than 256 spaces" });
  });
});
