/**
 * Clock alignment in the pipeline: applied when configured, or automatically only when allowed
 * and the evidence is strong; the data-quality mask follows the corrected series.
 * (Synthetic office load from the cleaning tests: invented data, seeded.)
 */
import { describe, expect, it } from "vitest";
import type { Portfolio } from "../../src/domain/types.ts";
import { assessIntervalMeters, shiftSeries } from "../../src/clean/assessMeters.ts";
import type { Memo } from "../../src/core/memo.ts";
import { contentHash } from "../../src/core/contentHash.ts";
import { makeOffice, shiftStamps, ZONE } from "./detect/syntheticOffice.ts";
import { DEFAULT_SETTINGS } from "../../src/ingest/portfolioYaml.ts";
import { parsePortfolioYaml } from "../../src/ingest/portfolioYaml.ts";

const src = { file: "x.csv", line: 2 };

function portfolioWith(alignment: { offsetsHours: Record<string, number>; auto: boolean }): Portfolio {
  const { series, weather } = makeOffice({ seed: 42 });
  const late = shiftStamps(series, 3); // the meter's clock runs 3 h ahead
  return {
    root: "/tmp/x",
    settings: { name: "T", ...structuredClone(DEFAULT_SETTINGS), alignment },
    buildings: [{ buildingId: "B1", name: "B1", floorArea: 1, areaUnit: "m2", floorAreaM2: 1, timezone: ZONE, weatherStation: weather.stationId, useType: null, tenantPage: false, source: src }],
    meters: [{ meterId: late.meterId, buildingId: "B1", commodity: "electricity", unit: "kWh", tariffId: "T", multiplier: 1, account: null, source: src }],
    bills: [],
    billLines: [],
    intervals: new Map([[late.meterId, late]]),
    weather: new Map([[weather.stationId, weather]]),
    normals: new Map(),
    tariffs: new Map(),
    report: { files: [] },
  };
}

describe("clock alignment in the pipeline", () => {
  it("suggests but does not apply an offset by default", () => {
    const p = portfolioWith({ offsetsHours: {}, auto: false });
    const { meters, portfolio } = assessIntervalMeters(p);
    expect(meters[0]!.alignment?.suggestedOffsetHours).toBe(3);
    expect(meters[0]!.appliedOffsetHours).toBe(0);
    expect(portfolio.intervals.get(meters[0]!.meterId)).toBe(p.intervals.get(meters[0]!.meterId));
  });

  it("applies a strong suggestion when alignment.auto is on", () => {
    const p = portfolioWith({ offsetsHours: {}, auto: true });
    const { meters, portfolio } = assessIntervalMeters(p);
    const id = meters[0]!.meterId;
    expect(meters[0]!.alignment?.strong).toBe(true);
    expect(meters[0]!.appliedOffsetHours).toBe(3);
    expect(portfolio.intervals.get(id)!.startMs[0]).toBe(p.intervals.get(id)!.startMs[0]! - 3 * 3_600_000);
    expect(meters[0]!.mask.length).toBe(portfolio.intervals.get(id)!.startMs.length);
  });

  it("a memo of earlier results gives the same screening, and a changed setting is computed again", () => {
    const kept = new Map<string, unknown>();
    let computed = 0;
    const memo: Memo = (kind, inputs, compute) => {
      const key = kind + contentHash(inputs);
      if (!kept.has(key)) {
        computed++;
        kept.set(key, structuredClone(compute()));
      }
      return structuredClone(kept.get(key)) as ReturnType<typeof compute>;
    };
    const p = portfolioWith({ offsetsHours: {}, auto: true });
    const first = assessIntervalMeters(p, memo);
    expect(computed).toBe(2); // the clock scan and the screening of the one meter
    const again = assessIntervalMeters(p, memo);
    expect(computed).toBe(2);
    expect(again.meters).toEqual(first.meters);
    expect(again.meters).toEqual(assessIntervalMeters(p).meters);
    const stricter = portfolioWith({ offsetsHours: {}, auto: true });
    stricter.settings.cleaning = { ...stricter.settings.cleaning, spikes: { ...(stricter.settings.cleaning as { spikes?: object }).spikes, zThreshold: 99 } } as typeof stricter.settings.cleaning;
    assessIntervalMeters(stricter, memo);
    expect(computed).toBe(4);
  });

  it("a configured offset wins over the suggestion", () => {
    const p = portfolioWith({ offsetsHours: { M1: 2 }, auto: true });
    const id = [...p.intervals.keys()][0]!;
    p.settings.alignment.offsetsHours = { [id]: 2 };
    const { meters } = assessIntervalMeters(p);
    expect(meters[0]!.appliedOffsetHours).toBe(2);
    expect(meters[0]!.appliedBecause).toMatch(/configured/);
  });

  it("shiftSeries moves every timestamp back and leaves the values alone", () => {
    const s = { meterId: "M", intervalMinutes: 60, startMs: Float64Array.from([7_200_000, 10_800_000]), values: Float64Array.from([1, 2]) };
    const shifted = shiftSeries(s, 2);
    expect([...shifted.startMs]).toEqual([0, 3_600_000]);
    expect(shifted.values).toBe(s.values);
  });
});

describe("portfolio.yaml alignment and cleaning settings", () => {
  it("reads offsets, auto and detector settings, and places errors at their line", () => {
    const text = "name: X\nalignment:\n  auto: true\n  offsets: { TWR-E: 3 }\ncleaning:\n  zero_run: { min_run_hours: 6 }\n  spike: { bogus: 1 }\n";
    const r = parsePortfolioYaml(text, "portfolio.yaml");
    expect(r.settings!.alignment).toEqual({ offsetsHours: { "TWR-E": 3 }, auto: true });
    expect(r.settings!.cleaning).toEqual({ zeroRun: { minRunHours: 6 } });
    expect(r.issues).toHaveLength(1);
    expect(r.issues[0]).toMatchObject({ line: 7, severity: "error" });
    expect(r.issues[0]!.message).toMatch(/cleaning\.spike\.bogus/);
  });
});
