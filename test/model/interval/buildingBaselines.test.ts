/**
 * A meter with only a few weeks of interval data gets the portfolio-pooled model (other meters'
 * hourly tables with per-meter scaling); meters with a long history get their own.
 * Data: the demo portfolio (fictional), one meter cut to its last 4 weeks.
 */
import { describe, expect, it } from "vitest";
import { loadPortfolio } from "../../../src/ingest/index.ts";
import { fitBuildingIntervalBaselines, SHORT_HISTORY_WEEKS } from "../../../src/model/interval/buildingBaselines.ts";

describe("interval baselines in the build", () => {
  it("pools short-history meters across similar meters", async () => {
    const { portfolio } = await loadPortfolio("data/demo");
    const p = portfolio!;
    const meter = p.meters.find((m) => m.commodity === "electricity" && p.intervals.has(m.meterId))!;
    const series = p.intervals.get(meter.meterId)!;
    const cut = series.startMs.length - 4 * 7 * 96; // last 4 weeks of 15-minute data
    p.intervals = new Map([...p.intervals, [meter.meterId, { ...series, startMs: series.startMs.slice(cut), values: series.values.slice(cut) }]]);
    expect(4).toBeLessThan(SHORT_HISTORY_WEEKS);
    const building = p.buildings.find((b) => b.buildingId === meter.buildingId)!;
    const [outcome] = fitBuildingIntervalBaselines(p, building, new Map()).filter((o) => o.meterId === meter.meterId);
    expect(outcome!.problem).toBeNull();
    expect(outcome!.baseline!.shortHistory).toBe(true);
    expect(outcome!.baseline!.chosen.kind).toBe("pooled-gbdt");
    expect(outcome!.baseline!.chosen.reason).toMatch(/pooled model across \d+ meters/);
  }, 120_000);
});
