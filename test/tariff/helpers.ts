/** Small builders shared by the tariff tests. All tariffs here are fictional. */
import { expect } from "vitest";
import { loadTariff } from "../../src/tariff/load.ts";
import type { Tariff } from "../../src/tariff/model.ts";
import type { IntervalUsage } from "../../src/tariff/types.ts";

/** Loads a tariff that must be valid; fails the test with the issues otherwise. */
export function tariffOf(yaml: string): Tariff {
  const { tariff, issues } = loadTariff(yaml, "test.yaml");
  expect(issues.filter((i) => i.severity === "error")).toEqual([]);
  expect(tariff).not.toBeNull();
  return tariff as Tariff;
}

/** Regular intervals starting at a UTC instant, one value each. */
export function intervalsFrom(startUtcIso: string, minutes: number, values: number[]): IntervalUsage {
  const t0 = Date.parse(startUtcIso);
  return {
    startMs: Float64Array.from(values, (_, i) => t0 + i * minutes * 60_000),
    values: Float64Array.from(values),
    intervalMinutes: minutes,
  };
}

/** The line with this label (fails when missing). */
export function lineOf<T extends { label: string }>(lines: T[], label: string): T {
  const l = lines.find((x) => x.label === label);
  expect(l, `line '${label}'`).toBeDefined();
  return l as T;
}

/**
 * A tariff with every kind of charge (fixed, blocks, time-of-use energy, ratcheted and per-period
 * demand, power factor, percent, minimum bill) and a mid-year version change that overrides the
 * energy rates; `rider` adds a flat per-kWh rider. Invented rates, for invariant and equivalence tests.
 */
export function richTariff(options: { id: string; changeFrom: string; rider?: boolean }): Tariff {
  return tariffOf(`
id: ${options.id}
commodity: electricity
usage_unit: kWh
versions:
  - from: 2024-01-01
    seasons: { summer: Jun-Sep, winter: Oct-May }
    holidays: us-federal
    periods:
      peak: { season: summer, days: weekdays, hours: "14:00-19:00" }
      shoulder: { days: weekdays, hours: ["08:00-14:00", "19:00-22:00"] }
      off-peak: {}
    charges:
      - { label: Customer charge, fixed: 24.50 }
      - label: Delivery
        blocks: [{ up_to: 500, rate: 0.061 }, { up_to: 1500, rate: 0.052 }, { rate: 0.044 }]
      - { label: Energy, energy: { peak: 0.238, shoulder: 0.161, off-peak: 0.097 } }
${options.rider ? "      - { label: Rider, energy: 0.0125 }\n" : ""}      - { label: Facility demand, demand: 13.80, ratchet: { percent: 80, months: 11 }, minimum_kw: 10 }
      - { label: Peak demand, demand: { peak: 8.25 } }
      - { label: Power factor adjustment, power_factor: { target: 0.90 } }
      - { label: Sales tax, percent: 7.25 }
    minimum_bill: 40.00
  - from: ${options.changeFrom}
    inherit: true
    charges_override:
      - { label: Energy, energy: { peak: 0.251, shoulder: 0.168, off-peak: 0.101 } }
`);
}
