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
