/** The annotated example in docs/tariffs.md ("A complete example") must stay a valid, priceable file. */
import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { priceBill } from "../../src/tariff/price.ts";
import { tariffOf } from "./helpers.ts";

const doc = readFileSync(new URL("../../docs/tariffs.md", import.meta.url), "utf8");
const guide = doc.slice(doc.indexOf("## A complete example"));
const yaml = /```yaml\n([\s\S]*?)```/.exec(guide)?.[1] ?? "";

describe("docs/tariffs.md tariff example", () => {
  it("loads without issues and prices a bill across its rate change", () => {
    const t = tariffOf(yaml);
    expect(t.versions.map((v) => v.from)).toEqual(["2024-01-01", "2025-07-01"]);
    const bill = priceBill(t, {
      periodStart: "2025-06-12",
      periodEnd: "2025-07-14",
      timezone: "America/Denver",
      usage: 18400,
      usageUnit: "kWh",
      demandKw: 92,
      powerFactor: 0.88,
    });
    expect(bill.versions.map((v) => v.days)).toEqual([19, 13]);
    // Hand-computed: Basic service charge 35.00 in both versions; Fuel rider 18,400 × 0.0093 = 171.12;
    // Maximum demand 92 kW (above minimum 20) × 11.40 = 1,048.80.
    expect(bill.lines.find((l) => l.label === "Basic service charge")?.amount).toBe(35);
    expect(bill.lines.find((l) => l.label === "Fuel adjustment rider")?.amount).toBe(171.12);
    expect(bill.lines.find((l) => l.label === "Maximum demand")?.amount).toBe(1048.8);
    // Storm recovery exists only from 2025-07-01: 18,400 × 0.0021 = 38.64 × 13/32 = 15.6975 -> 15.70
    expect(bill.lines.find((l) => l.label === "Storm recovery")?.amount).toBe(15.7);
    expect(bill.exact).toBe(false); // time-of-use lines without interval data
  });
});
