import { describe, expect, it } from "vitest";
import { loadTariff } from "../../src/tariff/load.ts";

/** Loads and returns the errors as "line:column message" strings. */
function errorsOf(yaml: string): string[] {
  const { tariff, issues } = loadTariff(yaml, "t.yaml");
  const errors = issues.filter((i) => i.severity === "error");
  if (errors.length > 0) expect(tariff).toBeNull();
  return errors.map((i) => `${i.line}:${i.column} ${i.message}${i.hint ? ` | ${i.hint}` : ""}`);
}

const HEAD = "id: lvp-test\ncommodity: electricity\nusage_unit: kWh\nversions:\n"; // lines 1-4

describe("loadTariff: a complete valid file", () => {
  it("loads every key of the format and resolves inherit + charges_override", () => {
    const yaml = `id: lvp-gs-tou
name: Larkspur Valley Power general service TOU
commodity: electricity
usage_unit: kWh
currency: USD
versions:
  - from: 2024-01-01
    seasons: { summer: Jun-Sep, winter: Oct-May }
    holidays: us-federal
    periods:
      peak: { season: summer, days: weekdays, hours: "14:00-19:00" }
      shoulder: { days: weekdays, hours: ["08:00-14:00", "19:00-22:00"] }
      off-peak: {}
    charges:
      - { label: Customer charge, fixed: 24.5 }
      - label: Delivery
        blocks: [{ up_to: 500, rate: 0.061 }, { up_to: 1500, rate: 0.052 }, { rate: 0.044 }]
        scale_blocks_by_days: true
      - { label: Energy, energy: { peak: 0.238, shoulder: 0.161, off-peak: 0.097 } }
      - { label: Facility demand, demand: 13.8, window_minutes: 30, ratchet: { percent: 80, months: 11 }, minimum_kw: 10 }
      - { label: Peak demand, demand: { peak: 8.25 } }
      - { label: Power factor adjustment, power_factor: { target: 0.9 } }
      - { label: Sales tax, percent: 7.25, of: all }
    minimum_bill: 40
  - from: 2025-07-01
    inherit: true
    charges_override:
      - { label: Energy, energy: { peak: 0.251, shoulder: 0.168, off-peak: 0.101 } }
      - { label: Storm recovery, fixed: 3.1 }
`;
    const { tariff, issues } = loadTariff(yaml, "t.yaml");
    expect(issues).toEqual([]);
    expect(tariff).not.toBeNull();
    const [v1, v2] = tariff!.versions;
    expect(v1.until).toBe("2025-07-01");
    expect(v2.until).toBeNull();
    expect(v1.seasons).toEqual([
      { name: "summer", months: [6, 7, 8, 9] },
      { name: "winter", months: [1, 2, 3, 4, 5, 10, 11, 12] },
    ]);
    expect(v1.periods.map((p) => p.name)).toEqual(["peak", "shoulder", "off-peak"]);
    expect(v1.periods[1].hours).toEqual([{ startMin: 480, endMin: 840 }, { startMin: 1140, endMin: 1320 }]);
    // The override replaces Energy in place and appends the new label; the rest is inherited.
    expect(v2.charges.map((c) => c.label)).toEqual([
      "Customer charge", "Delivery", "Energy", "Facility demand", "Peak demand", "Power factor adjustment", "Sales tax", "Storm recovery",
    ]);
    expect(v2.charges[2]).toEqual({ kind: "energy", label: "Energy", rate: { byPeriod: { peak: 0.251, shoulder: 0.168, "off-peak": 0.101 } } });
    expect(v2.minimumBill).toBe(40);
    expect(v2.holidays).toEqual({ kind: "us-federal" });
    expect(v1.charges[3]).toEqual({ kind: "demand", label: "Facility demand", rate: { flat: 13.8 }, windowMinutes: 30, ratchet: { percent: 80, months: 11 }, minimumKw: 10 });
  });
});

describe("loadTariff: errors point at the right line and column", () => {
  it("a rate for an undefined period names the defined ones", () => {
    const yaml = `${HEAD}  - from: 2025-01-01
    periods:
      peak: { days: weekdays, hours: "14:00-19:00" }
      shoulder: { days: weekdays, hours: "08:00-14:00" }
      off-peak: {}
    charges:
      - label: Energy
        energy:
          peek: 0.25
          shoulder: 0.15
          off-peak: 0.09
`;
    const errors = errorsOf(yaml);
    expect(errors).toContainEqual(
      "13:11 period 'peek' is not defined; defined periods: peak, shoulder, off-peak | did you mean 'peak'? rates may name only periods of this version",
    );
  });

  it("versions out of order", () => {
    const yaml = `${HEAD}  - from: 2025-07-01
    charges: [{ label: Energy, energy: 0.1 }]
  - from: 2025-01-01
    charges: [{ label: Energy, energy: 0.2 }]
`;
    expect(errorsOf(yaml)).toEqual([
      "7:11 version from 2025-01-01 comes after the version from 2025-07-01: versions are out of order | list versions oldest first, each with a later from date",
    ]);
  });

  it("two versions on the same day overlap", () => {
    const yaml = `${HEAD}  - from: 2025-01-01
    charges: [{ label: Energy, energy: 0.1 }]
  - from: 2025-01-01
    charges: [{ label: Energy, energy: 0.2 }]
`;
    expect(errorsOf(yaml)[0]).toMatch(/^7:11 two versions start on 2025-01-01: they overlap/);
  });

  it("blocks out of order point at the offending up_to", () => {
    const yaml = `${HEAD}  - from: 2025-01-01
    charges:
      - label: Delivery
        blocks:
          - { up_to: 1000, rate: 0.05 }
          - { up_to: 500, rate: 0.04 }
          - { rate: 0.03 }
`;
    expect(errorsOf(yaml)).toEqual([
      "10:22 blocks of 'Delivery' are out of order: up_to 500 is not above the previous block's 1000 | list blocks from smallest to largest up_to",
    ]);
  });

  it("a last block with up_to, and an open block in the middle", () => {
    const yaml = `${HEAD}  - from: 2025-01-01
    charges:
      - label: Delivery
        blocks:
          - { rate: 0.05 }
          - { up_to: 500, rate: 0.04 }
`;
    const errors = errorsOf(yaml);
    expect(errors[0]).toMatch(/^9:13 block 1 of 'Delivery' has no up_to but is not the last block/);
    expect(errors[1]).toMatch(/^10:15 the last block of 'Delivery' must not have up_to/);
  });

  it("periods without a catch-all", () => {
    const yaml = `${HEAD}  - from: 2025-01-01
    periods:
      peak: { days: weekdays, hours: "14:00-19:00" }
    charges: [{ label: Energy, energy: { peak: 0.2 } }]
`;
    expect(errorsOf(yaml)).toEqual([
      "6:5 periods need a catch-all period for all remaining hours (the version from 2025-01-01 has none) | add a last period with an empty mapping, e.g. off-peak: {}",
    ]);
  });

  it("a period after the catch-all can never match", () => {
    const yaml = `${HEAD}  - from: 2025-01-01
    periods:
      off-peak: {}
      peak: { hours: "14:00-19:00" }
    charges: [{ label: Energy, energy: { peak: 0.2, off-peak: 0.1 } }]
`;
    expect(errorsOf(yaml)[0]).toMatch(/^8:7 period 'peak' can never match: catch-all period 'off-peak' comes before it/);
  });

  it("an unknown key, with the keys valid for that charge kind", () => {
    const yaml = `${HEAD}  - from: 2025-01-01
    charges:
      - label: Demand
        demand: 12.5
        window_minute: 30
`;
    expect(errorsOf(yaml)).toEqual([
      "9:9 unknown key 'window_minute' in a demand charge | did you mean 'window_minutes'? valid keys: label, demand, window_minutes, ratchet, minimum_kw",
    ]);
  });

  it("an unknown top-level key", () => {
    expect(errorsOf(`${HEAD}  - from: 2025-01-01\n    charges: [{ label: A, fixed: 1 }]\nheat_contnet: 1.02\n`)[0]).toMatch(
      /^7:1 unknown key 'heat_contnet' in the tariff \| did you mean 'heat_content'\?/,
    );
  });

  it("bad hours and bad season months", () => {
    const yaml = `${HEAD}  - from: 2025-01-01
    seasons:
      summer: Jun-Sepr
    periods:
      peak:
        hours: ["08:00-12:00", "25:00-26:00"]
      rest: {}
    charges:
      - { label: Energy, energy: { peak: 0.2, rest: 0.1 } }
`;
    const errors = errorsOf(yaml);
    expect(errors[0]).toMatch(/^7:15 season 'summer': 'Jun-Sepr' is not a month or month range/);
    expect(errors[1]).toMatch(/^10:32 period 'peak': '25:00-26:00' has an impossible time/);
  });

  it("overlapping seasons", () => {
    const yaml = `${HEAD}  - from: 2025-01-01
    seasons: { summer: May-Sep, winter: Sep-May }
    charges: [{ label: A, fixed: 1 }]
`;
    expect(errorsOf(yaml)[0]).toMatch(/^6:41 season 'winter' includes Sep, which is already in season 'summer'/);
  });

  it("a period naming an undefined season", () => {
    const yaml = `${HEAD}  - from: 2025-01-01
    seasons: { summer: Jun-Sep }
    periods:
      peak: { season: sumer }
      rest: {}
    charges: [{ label: Energy, energy: { peak: 0.2, rest: 0.1 } }]
`;
    expect(errorsOf(yaml)[0]).toBe("8:23 season 'sumer' is not defined; defined seasons: summer | did you mean 'summer'? define it under seasons:");
  });

  it("inherit on the first version", () => {
    const yaml = `${HEAD}  - from: 2025-01-01
    inherit: true
    charges_override:
      - { label: Energy, energy: 0.1 }
`;
    expect(errorsOf(yaml)[0]).toMatch(/^6:5 the first version cannot inherit/);
  });

  it("percent `of` naming a line that is not above it", () => {
    const yaml = `${HEAD}  - from: 2025-01-01
    charges:
      - { label: Energy, energy: 0.1 }
      - { label: Tax, percent: 5, of: [Energy, Demand] }
`;
    expect(errorsOf(yaml)).toEqual(["8:48 'Demand' is not a line above 'Tax'; lines above: Energy | a percent line applies to lines listed before it, or use of: all"]);
  });

  it("a number written as text, and demand on a gas tariff", () => {
    const yaml = `id: lvp-gas
commodity: gas
usage_unit: ccf
versions:
  - from: 2025-01-01
    charges:
      - label: Customer charge
        fixed: "$12.00"
      - label: Peak demand
        demand: 3
`;
    const errors = errorsOf(yaml);
    expect(errors[0]).toMatch(/^8:16 fixed charge 'Customer charge' must be a number, got '\$12.00'/);
    expect(errors[1]).toMatch(/^9:16 demand charge 'Peak demand' needs an electricity tariff/);
  });

  it("an inherited charge whose period the new version removed", () => {
    const yaml = `${HEAD}  - from: 2025-01-01
    periods: { peak: { hours: "14:00-19:00" }, rest: {} }
    charges: [{ label: Energy, energy: { peak: 0.2, rest: 0.1 } }]
  - from: 2025-06-01
    inherit: true
    periods: { on: { hours: "14:00-19:00" }, rest: {} }
`;
    const errors = errorsOf(yaml);
    expect(errors.find((e) => e.includes("'peak' is not defined"))).toMatch(
      /^7:42 period 'peak' is not defined; defined periods: on, rest \(charge inherited by the version from 2025-06-01\)/,
    );
    expect(errors.find((e) => e.includes("no rate for"))).toMatch(/^7:40 energy charge 'Energy' has no rate for period\(s\) on \(charge inherited/);
  });

  it("YAML syntax errors carry a position", () => {
    const yaml = `${HEAD}  - from: 2025-01-01
    charges:
      - label: Energy
        energy: 0.1
       bad: indent
`;
    expect(errorsOf(yaml)[0]).toMatch(/^9:1 YAML syntax:/);
  });

  it("a duplicated key names the key", () => {
    expect(errorsOf(`${HEAD}  - from: 2025-01-01\n    charges:\n      - label: A\n        fixed: 1\n        fixed: 2\n`)).toEqual([
      "9:9 key 'fixed' appears twice in the same mapping | keep one of them",
    ]);
  });

  it("a usage unit of another commodity, and an unknown commodity", () => {
    expect(errorsOf("id: x\ncommodity: electricity\nusage_unit: therm\nversions:\n  - from: 2025-01-01\n    charges: [{ label: A, fixed: 1 }]\n")[0]).toBe(
      "3:13 usage_unit 'therm' is not a unit for electricity | use one of kWh, MWh",
    );
    expect(errorsOf("id: x\ncommodity: electrcity\nusage_unit: kWh\nversions: []\n")[0]).toMatch(/^2:12 commodity 'electrcity' is not known \| did you mean 'electricity'\?/);
  });

  it("a missing required key points at the file start", () => {
    expect(errorsOf("id: x\ncommodity: water\nversions:\n  - from: 2025-01-01\n    charges: [{ label: A, fixed: 1 }]\n")[0]).toMatch(/^1:1 missing required key 'usage_unit'/);
  });
});

describe("loadTariff never throws", () => {
  const VALID = `id: lvp-fuzz
commodity: electricity
usage_unit: kWh
versions:
  - from: 2024-01-01
    seasons: { summer: Jun-Sep, winter: Oct-May }
    holidays: us-federal
    periods:
      peak: { season: summer, days: weekdays, hours: "14:00-19:00" }
      off-peak: {}
    charges:
      - { label: Customer charge, fixed: 24.50 }
      - label: Delivery
        blocks: [{ up_to: 500, rate: 0.061 }, { rate: 0.044 }]
      - { label: Energy, energy: { peak: 0.238, off-peak: 0.097 } }
      - { label: Demand, demand: 13.8, ratchet: { percent: 80, months: 11 } }
      - { label: PF, power_factor: { target: 0.9 } }
      - { label: Tax, percent: 7.25, of: [Energy] }
    minimum_bill: 40
  - from: 2025-01-01
    inherit: true
    charges_override:
      - { label: Energy, energy: { peak: 0.25, off-peak: 0.1 } }
`;

  it("on a file with lines deleted, duplicated or cut: issues with positions, no exception", async () => {
    const fc = (await import("fast-check")).default;
    const lines = VALID.split("\n");
    fc.assert(
      fc.property(fc.integer({ min: 0, max: lines.length - 1 }), fc.integer({ min: 0, max: 2 }), fc.integer({ min: 0, max: 60 }), (i, op, cut) => {
        const copy = [...lines];
        if (op === 0) copy.splice(i, 1);
        else if (op === 1) copy.splice(i, 0, copy[i]);
        else copy[i] = copy[i].slice(0, cut);
        const { tariff, issues } = loadTariff(copy.join("\n"), "f.yaml");
        if (tariff === null) {
          const errors = issues.filter((x) => x.severity === "error");
          expect(errors.length).toBeGreaterThan(0);
          for (const e of errors) expect(e.line).toBeGreaterThan(0);
        }
      }),
      { numRuns: 400 },
    );
  });

  it("on arbitrary text", async () => {
    const fc = (await import("fast-check")).default;
    fc.assert(
      fc.property(fc.string({ maxLength: 200 }), (text) => {
        const { tariff, issues } = loadTariff(text, "f.yaml");
        expect(tariff === null ? issues.length > 0 : true).toBe(true);
      }),
      { numRuns: 300 },
    );
  });
});
